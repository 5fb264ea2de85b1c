// The column numerics on a linear-equilibrium stage model against the Kremser equation.
#include <catch2/catch.hpp>

#include <column_solver.hpp>

#include <cmath>

#include "linear_stage_model.hpp"

namespace {

using protonflow::scrubber::ColumnFeeds;
using protonflow::scrubber::ColumnSpecification;
using protonflow::scrubber::solve_column;
using protonflow::scrubber::testing::LinearStageModel;

// Fraction of a dilute solute absorbed in N ideal counter-current stages with y = m x and
// absorption factor A = L / (m G) (Kremser 1930; Souders & Brown 1932):
//   (A^(N+1) − A) / (A^(N+1) − 1),  and N / (N + 1) at A = 1.
double kremser_fraction_absorbed(double absorption_factor, int stages) {
  if (absorption_factor == 1.0) return stages / (stages + 1.0);
  const double power = std::pow(absorption_factor, stages + 1);
  return (power - absorption_factor) / (power - 1.0);
}

}  // namespace

TEST_CASE("scrubber column: a dilute non-reacting solute matches the Kremser equation", "[scrubber]") {
  const double slope = 2.0;     // m
  const double carrier = 1.0;   // G, mol/s
  const double solute_in = 1e-7;  // dilute: flows change by 1e-7 of themselves
  for (const double absorption_factor : {0.5, 0.9, 1.4, 2.5}) {
    for (const int stages : {1, 3, 8, 20}) {
      CAPTURE(absorption_factor, stages);
      LinearStageModel model(slope);
      ColumnSpecification specification;
      specification.stages = static_cast<std::size_t>(stages);
      specification.efficiency = {1.0, 1.0};
      ColumnFeeds feeds;
      feeds.liquid = {absorption_factor * slope * carrier, 0.0};
      feeds.gas = {carrier, solute_in};
      const auto profile = solve_column(model, specification, feeds);
      const double solute_out = profile.gas[1];  // top stage, gas 1
      const double absorbed = 1.0 - solute_out / solute_in;
      // Kremser 1930; Souders & Brown 1932: to 1 %.
      CHECK(absorbed == Approx(kremser_fraction_absorbed(absorption_factor, stages)).epsilon(0.01));
      // The stage temperatures stay at the feeds' (no heat of absorption in the model).
      for (const double t : profile.temperature) CHECK(t == Approx(298.15).margin(1e-9));
    }
  }
}

TEST_CASE("scrubber column: a Murphree efficiency below one absorbs less, as the stage-efficiency recursion says",
          "[scrubber]") {
  // One stage with y_in, fresh solvent: y_out = y_in + E (m x − y_in) and L x = G (y_in − y_out), so
  // y_out (1 + E / A) = y_in (1 − E + E / A) (the balance and the Murphree definition, solved by hand).
  const double slope = 1.0, carrier = 1.0, absorption_factor = 1.5;
  for (const double efficiency : {0.3, 0.6, 1.0}) {
    LinearStageModel model(slope);
    ColumnSpecification specification;
    specification.stages = 1;
    specification.efficiency = {1.0, efficiency};
    ColumnFeeds feeds;
    feeds.liquid = {absorption_factor * slope * carrier, 0.0};
    feeds.gas = {carrier, 1e-8};
    const auto profile = solve_column(model, specification, feeds);
    CHECK(profile.gas[1] / 1e-8 == Approx((1.0 - efficiency + efficiency / absorption_factor) / (1.0 + efficiency / absorption_factor)).epsilon(1e-6));
  }
}

TEST_CASE("scrubber column: a column that runs out of iterations is a typed error carrying its residuals", "[scrubber]") {
  LinearStageModel model(2.0);
  ColumnSpecification specification;
  specification.stages = 10;
  specification.efficiency = {1.0, 1.0};
  specification.max_iterations = 1;
  specification.tolerance = 1e-300;  // unreachable: the solve must report, not return
  ColumnFeeds feeds;
  feeds.liquid = {3.0, 0.0};
  feeds.gas = {1.0, 1e-3};
  try {
    (void)solve_column(model, specification, feeds);
    FAIL("the solve returned");
  } catch (const protonflow::scrubber::ColumnConvergenceError& error) {
    CHECK(error.iterations() >= 1);
    REQUIRE_FALSE(error.residuals().empty());
    CHECK(error.residuals().front().stage >= 1);
    CHECK(error.residuals().front().stage <= 10);
    CHECK_THAT(error.what(), Catch::Matchers::Contains("did not converge"));
  }
}

TEST_CASE("scrubber column: 40 stages of a concentrated solute converge from the cold start", "[scrubber]") {
  // Not dilute (a tenth of the gas), so flows change down the column and Kremser is only a bound;
  // what is checked is convergence and the solute balance over the whole column.
  LinearStageModel model(0.8);
  ColumnSpecification specification;
  specification.stages = 40;
  specification.efficiency = {1.0, 0.7};
  ColumnFeeds feeds;
  feeds.liquid = {1.2, 0.0};
  feeds.gas = {0.9, 0.1};
  const auto profile = solve_column(model, specification, feeds);
  const double absorbed = profile.liquid[39 * 2 + 1];  // bottom stage's liquid, solute
  const double escaped = profile.gas[0 * 2 + 1];       // top stage's gas, solute
  CHECK(absorbed + escaped == Approx(0.1).epsilon(1e-10));
  CHECK(profile.gas[0] == Approx(0.9).epsilon(1e-12));  // the carrier passes unchanged
}

TEST_CASE("scrubber column: a column started from another stage count's answer finds the cold column's answer", "[scrubber]") {
  // The search for the stages an emission limit needs starts each stage count from the nearest
  // column it has solved, cut or extended to its stages (profile_for_stages). From there Newton must
  // find what the cold start finds, to the column's tolerance, shorter and taller alike.
  using protonflow::scrubber::profile_for_stages;
  LinearStageModel model(0.8);
  ColumnSpecification specification;
  specification.efficiency = {1.0, 0.7};
  ColumnFeeds feeds;
  feeds.liquid = {1.2, 0.0};
  feeds.gas = {0.9, 0.1};
  specification.stages = 10;
  const auto solved = solve_column(model, specification, feeds);
  for (const std::size_t stages : {1u, 3u, 9u, 11u, 17u, 30u}) {
    CAPTURE(stages);
    specification.stages = stages;
    const auto start = profile_for_stages(solved, stages);
    REQUIRE(start.stages == stages);
    // Shorter: the solved column's lowest stages as they were.
    if (stages <= 10) CHECK(start.gas[(stages - 1) * 2 + 1] == solved.gas[9 * 2 + 1]);
    const auto warm = solve_column(model, specification, feeds, &start);
    const auto cold = solve_column(model, specification, feeds);
    for (std::size_t i = 0; i < cold.gas.size(); ++i) CHECK(warm.gas[i] == Approx(cold.gas[i]).epsilon(1e-9));
    for (std::size_t i = 0; i < cold.liquid.size(); ++i) CHECK(warm.liquid[i] == Approx(cold.liquid[i]).epsilon(1e-9));
  }
}

TEST_CASE("scrubber column: a taller column's start goes on falling over the solved column's top", "[scrubber]") {
  using protonflow::scrubber::ColumnProfile;
  using protonflow::scrubber::profile_for_stages;
  // Two stages, liquid components and gases two each: the gas solute falls by e^-2 from the second
  // stage to the top, so each stage added over the top takes another e^-2; the carrier, unchanged,
  // stays; temperatures are the top's.
  ColumnProfile solved;
  solved.stages = 2;
  solved.liquid = {1.0, 1e-6, 1.0, 1e-4};
  solved.gas = {0.9, std::exp(-12.0), 0.9, std::exp(-10.0)};
  solved.temperature = {300.0, 305.0};
  const ColumnProfile taller = profile_for_stages(solved, 4);
  CHECK(taller.gas[0 * 2 + 1] == Approx(std::exp(-16.0)).epsilon(1e-12));
  CHECK(taller.gas[1 * 2 + 1] == Approx(std::exp(-14.0)).epsilon(1e-12));
  CHECK(taller.gas[2 * 2 + 1] == solved.gas[1]);
  CHECK(taller.gas[0] == 0.9);
  CHECK(taller.liquid[0 * 2 + 1] == Approx(1e-10).epsilon(1e-12));
  CHECK(taller.temperature[0] == 300.0);
  CHECK(taller.temperature[3] == 305.0);
}

TEST_CASE("scrubber column: chord steps on the kept Jacobian find the answer Newton finds", "[scrubber]") {
  // With a memory of its last solve the column first takes chord steps from its previous answer on
  // that solve's last Jacobian (docs/units.md, "Warm start"); near feeds and far ones, the answer
  // must be the cold column's to the tolerance (far ones fall back to Newton).
  using protonflow::scrubber::ColumnMemory;
  LinearStageModel model(0.8);
  ColumnSpecification specification;
  specification.stages = 12;
  specification.efficiency = {1.0, 0.7};
  ColumnFeeds feeds;
  feeds.liquid = {1.2, 0.0};
  feeds.gas = {0.9, 0.1};
  ColumnMemory memory;
  auto previous = solve_column(model, specification, feeds, nullptr, &memory);
  for (const double solute : {0.1001, 0.1003, 0.15, 0.02}) {
    CAPTURE(solute);
    feeds.gas[1] = solute;
    const auto warm = solve_column(model, specification, feeds, &previous, &memory);
    const auto cold = solve_column(model, specification, feeds);
    CHECK(warm.residual_norm <= specification.tolerance);
    for (std::size_t i = 0; i < cold.gas.size(); ++i) CHECK(warm.gas[i] == Approx(cold.gas[i]).epsilon(1e-9));
    for (std::size_t i = 0; i < cold.liquid.size(); ++i) CHECK(warm.liquid[i] == Approx(cold.liquid[i]).epsilon(1e-9));
    previous = warm;
  }
}

TEST_CASE("scrubber column: a previous answer without a component the feeds now bring still finds the cold column's answer",
          "[scrubber]") {
  // The first pass over a sump of fresh water, then the reagent: the previous answer lacks an
  // unknown of this column, so the column sweeps from it with the new component placed as the
  // cold start places it (docs/units.md, "Warm start"), and must find the cold column's answer.
  LinearStageModel model(0.8);
  ColumnSpecification specification;
  specification.stages = 8;
  specification.efficiency = {1.0, 0.7};
  ColumnFeeds feeds;
  feeds.liquid = {1.2, 0.0};
  feeds.gas = {0.9, 0.0};  // no solute yet
  const auto without = solve_column(model, specification, feeds);
  feeds.gas[1] = 0.05;
  const auto warm = solve_column(model, specification, feeds, &without);
  const auto cold = solve_column(model, specification, feeds);
  for (std::size_t i = 0; i < cold.gas.size(); ++i) CHECK(warm.gas[i] == Approx(cold.gas[i]).epsilon(1e-9));
  for (std::size_t i = 0; i < cold.liquid.size(); ++i) CHECK(warm.liquid[i] == Approx(cold.liquid[i]).epsilon(1e-9));
}
