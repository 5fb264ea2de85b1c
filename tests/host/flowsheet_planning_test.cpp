// The solve order and tear-stream choice (flowsheet_graph.hpp), and the recycle solver
// (recycle_solver.hpp) on fixed-point problems whose answers are known in closed form.
#include <cmath>
#include <stdexcept>
#include <vector>

#include <catch2/catch.hpp>

#include "flowsheet_graph.hpp"
#include "recycle_solver.hpp"

using namespace protonflow::host;
using Indices = std::vector<std::size_t>;

TEST_CASE("a chain is solved in flow order, with no tear stream") {
  // 2 → 0 → 1, listed out of order in the file.
  const std::vector<GraphEdge> edges{{10, 2, 0}, {11, 0, 1}};
  const SolveOrder order = plan_solve_order(3, edges, {}, {});
  CHECK(order.tears.empty());
  CHECK(order.sequence == Indices{2, 0, 1});
  CHECK(order.before == Indices{2, 0, 1});
  CHECK(order.loop.empty());
}

TEST_CASE("a single loop gets one tear, and units before and after it are solved once") {
  // 0 (feed prep) → 1 (mixer) → 2 (heater) → 3 (splitter) → 1 (recycle, stream 13), 3 → 4 (after).
  const std::vector<GraphEdge> edges{{10, 0, 1}, {11, 1, 2}, {12, 2, 3}, {13, 3, 1}, {14, 3, 4}};
  const SolveOrder order = plan_solve_order(5, edges, {}, {});
  REQUIRE(order.tears.size() == 1);
  // Every stream of the loop lies on its one cycle; the tie goes to the first stream, 11.
  CHECK(order.tears == Indices{11});
  // The mixer (1) takes the recycle, so it is solved in every iteration too.
  CHECK(order.before == Indices{0});
  CHECK(order.loop == Indices{2, 3, 1});
  CHECK(order.after == Indices{4});
}

TEST_CASE("a stream with a starting estimate is torn by preference") {
  const std::vector<GraphEdge> edges{{10, 0, 1}, {11, 1, 2}, {12, 2, 3}, {13, 3, 1}, {14, 3, 4}};
  const Indices preferred{13};
  const SolveOrder order = plan_solve_order(5, edges, preferred, {});
  CHECK(order.tears == Indices{13});
  CHECK(order.sequence == Indices{0, 1, 2, 3, 4});
  CHECK(order.loop == Indices{1, 2, 3});
  // An estimate off every loop is not a tear.
  const Indices off_loop{10};
  CHECK(plan_solve_order(5, edges, off_loop, {}).tears == Indices{11});
}

TEST_CASE("two loops that share a stream are opened by tearing that one stream") {
  // 0 → 1 → 2 → 0 and 1 → 2 → 3 → 1 share 1 → 2 (stream 21).
  const std::vector<GraphEdge> edges{{20, 0, 1}, {21, 1, 2}, {22, 2, 0}, {23, 2, 3}, {24, 3, 1}};
  const SolveOrder order = plan_solve_order(4, edges, {}, {});
  CHECK(order.tears == Indices{21});
  CHECK(order.sequence.size() == 4);
  CHECK(order.loop.size() == 4);
}

TEST_CASE("a self-loop is a recycle too") {
  const std::vector<GraphEdge> edges{{5, 0, 0}};
  CHECK(plan_solve_order(1, edges, {}, {}).tears == Indices{5});
}

TEST_CASE("tear streams chosen by the user must open every loop") {
  const std::vector<GraphEdge> edges{{20, 0, 1}, {21, 1, 2}, {22, 2, 0}, {23, 2, 3}, {24, 3, 1}};
  const Indices enough{21};
  CHECK(plan_solve_order(4, edges, {}, enough).tears == Indices{21});
  const Indices too_few{22};
  try {
    plan_solve_order(4, edges, {}, too_few);
    FAIL("the loop 1 → 2 → 3 is left closed");
  } catch (const UnbrokenCycleError& error) {
    CHECK(error.cycle() == Indices{1, 2, 3});
  }
}

TEST_CASE("the recycle solver finds the fixed point of a linear loop, faster with Anderson acceleration") {
  // x = A x + b with A = [[0.9, 0.05], [0.02, 0.8]] (spectral radius 0.91): x* = (I − A)⁻¹ b.
  // For b = (1, 2): det(I − A) = 0.1·0.2 − 0.05·0.02 = 0.019; x* = (0.2·1 + 0.05·2, 0.02·1 + 0.1·2)/0.019.
  const RecycleFunction g = [](std::span<const double> x, std::span<double> out) {
    out[0] = 0.9 * x[0] + 0.05 * x[1] + 1.0;
    out[1] = 0.02 * x[0] + 0.8 * x[1] + 2.0;
  };
  const RecycleFloor floor = [](std::span<const double>, std::span<double> out) { std::ranges::fill(out, 0.0); };
  const double x0 = 0.3 / 0.019;
  const double x1 = 0.22 / 0.019;

  RecycleOptions accelerated{1e-12, 100, 5, 1.0};
  const RecycleOutcome fast = converge_recycle({0.0, 0.0}, g, floor, accelerated);
  CHECK(fast.x[0] == Approx(x0).epsilon(1e-10));
  CHECK(fast.x[1] == Approx(x1).epsilon(1e-10));
  CHECK(fast.largest_relative_change <= 1e-12);
  CHECK(fast.history.size() == static_cast<std::size_t>(fast.iterations));

  RecycleOptions plain{1e-12, 1000, 0, 1.0};
  const RecycleOutcome slow = converge_recycle({0.0, 0.0}, g, floor, plain);
  CHECK(slow.x[0] == Approx(x0).epsilon(1e-9));
  // Anderson needs a handful of passes on a linear map of dimension 2; substitution about
  // log(1e-12)/log(0.91) ≈ 290.
  CHECK(fast.iterations < 15);
  CHECK(slow.iterations > 100);
  // The history of substitution shrinks by about the spectral radius per pass.
  CHECK(slow.history[200].largest_relative_change < slow.history[100].largest_relative_change);
  // Both stop at the first pass that meets the tolerance, not passes later.
  for (const RecycleOutcome* outcome : {&fast, &slow}) {
    for (std::size_t i = 0; i + 1 < outcome->history.size(); ++i) CHECK(outcome->history[i].largest_relative_change > 1e-12);
  }
}

TEST_CASE("a recycle that cannot converge in its iterations reports its history") {
  const RecycleFunction g = [](std::span<const double> x, std::span<double> out) { out[0] = 0.99 * x[0] + 1.0; };
  const RecycleFloor floor = [](std::span<const double>, std::span<double> out) { out[0] = 0.0; };
  try {
    converge_recycle({0.0}, g, floor, RecycleOptions{1e-12, 7, 0, 1.0});
    FAIL("seven passes cannot converge a loop that shrinks its error by 1 % a pass");
  } catch (const RecycleNotConverged& error) {
    CHECK(error.history().size() == 7);
    CHECK_THAT(error.what(), Catch::Matchers::Contains("after 7 iterations"));
  }
}

TEST_CASE("an exception in a pass comes out of the recycle solver unchanged") {
  int passes = 0;
  const RecycleFunction g = [&](std::span<const double> x, std::span<double> out) {
    if (++passes == 3) throw std::domain_error("unit refused the inlet");
    out[0] = 0.5 * x[0] + 1.0;
  };
  const RecycleFloor floor = [](std::span<const double>, std::span<double> out) { out[0] = 0.0; };
  CHECK_THROWS_AS(converge_recycle({0.0}, g, floor, RecycleOptions{1e-12, 50, 3, 1.0}), std::domain_error);
}
