#include "recycle_solver.hpp"

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>
#include <memory>
#include <new>
#include <stdexcept>

#include <fmt/format.h>
#include <kinsol/kinsol.h>
#include <nvector/nvector_serial.h>
#include <sundials/sundials_context.h>

namespace protonflow::host {
namespace {

struct ContextDeleter {
  void operator()(SUNContext context) const noexcept { SUNContext_Free(&context); }
};
struct VectorDeleter {
  void operator()(N_Vector vector) const noexcept { N_VDestroy(vector); }
};
struct KinsolDeleter {
  void operator()(void* memory) const noexcept { KINFree(&memory); }
};
using Context = std::unique_ptr<std::remove_pointer_t<SUNContext>, ContextDeleter>;
using Vector = std::unique_ptr<std::remove_pointer_t<N_Vector>, VectorDeleter>;
using Kinsol = std::unique_ptr<void, KinsolDeleter>;

// Everything the C callback needs; an exception from G is parked here, because it must not cross
// KINSOL's C frames.
struct Problem {
  const RecycleFunction* g;
  const RecycleFloor* floor;
  long max_iterations;
  std::vector<double> scale;  // x = scale ∘ u
  std::vector<double> x;
  std::vector<double> gx;
  std::vector<double> floors;
  std::vector<RecycleIteration> history;
  double tolerance;  // the host's own test on the relative change
  std::exception_ptr error;
  std::string kinsol_message;
  bool breakdown = false;  // Anderson's extrapolation gave a non-finite iterate
};

// One pass, recorded: the relative change is the convergence measure this host reports.
void evaluate(Problem& problem) {
  (*problem.g)(problem.x, problem.gx);
  (*problem.floor)(problem.gx, problem.floors);
  RecycleIteration record{static_cast<long>(problem.history.size()) + 1, 0.0, 0};
  for (std::size_t i = 0; i < problem.x.size(); ++i) {
    const double size = std::max({std::abs(problem.gx[i]), std::abs(problem.x[i]), problem.floors[i]});
    const double change = size > 0.0 ? std::abs(problem.gx[i] - problem.x[i]) / size : 0.0;
    if (!std::isfinite(problem.gx[i])) {
      record.largest_relative_change = std::numeric_limits<double>::infinity();
      record.variable = i;
      break;
    }
    if (change > record.largest_relative_change) {
      record.largest_relative_change = change;
      record.variable = i;
    }
  }
  problem.history.push_back(record);
}

int scaled_pass(N_Vector u, N_Vector gu, void* data) {
  auto& problem = *static_cast<Problem*>(data);
  try {
    // KINSOL stops at its own iteration limit; this guard keeps the count of passes exact when a
    // restart leaves it fewer than KINSOL would take.
    if (static_cast<long>(problem.history.size()) >= problem.max_iterations) return -1;
    const double* uu = N_VGetArrayPointer(u);
    double* gg = N_VGetArrayPointer(gu);
    // KINSOL's Anderson update solves its least-squares problem by a QR factorisation without
    // rank checks; once the differences of the last iterates are (nearly) dependent, as they
    // become when the loop stagnates in round-off, it can divide by zero. Stop, and let the
    // driver restart from the last good pass with a fresh history.
    for (std::size_t i = 0; i < problem.x.size(); ++i) {
      if (!std::isfinite(uu[i])) {
        problem.breakdown = true;
        return -1;
      }
    }
    for (std::size_t i = 0; i < problem.x.size(); ++i) problem.x[i] = problem.scale[i] * uu[i];
    evaluate(problem);
    for (std::size_t i = 0; i < problem.x.size(); ++i) gg[i] = problem.gx[i] / problem.scale[i];
    // KINSOL tests its step against the scales of its last restart, which can lag far behind
    // the variables' sizes now; the host's test decides, and once it is met every further pass
    // is wasted: stop KINSOL here (the driver sees the test met and returns this pass).
    if (problem.history.back().largest_relative_change <= problem.tolerance) return -1;
    return 0;
  } catch (...) {
    problem.error = std::current_exception();
    return -1;  // unrecoverable: KINSOL returns KIN_SYSFUNC_FAIL and the exception is rethrown
  }
}

void collect_message(int, const char* module, const char* function, char* message, void* data) {
  // KINSOL would print to stderr; the host reports its messages itself.
  static_cast<Problem*>(data)->kinsol_message = fmt::format("{} ({}): {}", function, module, message);
}

void check(int flag, const char* call) {
  if (flag < 0) throw std::runtime_error(fmt::format("KINSOL: {} failed with flag {}", call, flag));
}

}  // namespace

RecycleOutcome converge_recycle(std::vector<double> x0, const RecycleFunction& g, const RecycleFloor& floor,
                                const RecycleOptions& options) {
  const std::size_t n = x0.size();
  if (n == 0) throw std::invalid_argument("a recycle needs at least one variable");
  Problem problem{&g, &floor, options.max_iterations, std::vector<double>(n, 1.0), std::move(x0),
                  std::vector<double>(n), std::vector<double>(n), {}, options.tolerance, nullptr, {}};

  const auto outcome = [&] {
    const RecycleIteration& last = problem.history.back();
    return RecycleOutcome{problem.gx, last.iteration, last.largest_relative_change, last.variable, problem.history};
  };
  const auto converged = [&] { return problem.history.back().largest_relative_change <= options.tolerance; };

  // The first pass is plain substitution: from an estimate of zero flow it carries the feeds round
  // the loop once, so the scales below are the sizes of real flows.
  evaluate(problem);
  if (converged()) return outcome();

  SUNContext raw_context = nullptr;
  check(SUNContext_Create(nullptr, &raw_context), "SUNContext_Create");
  const Context context(raw_context);
  while (static_cast<long>(problem.history.size()) < options.max_iterations) {
    problem.x = problem.gx;
    for (std::size_t i = 0; i < n; ++i) {
      const double size = std::max(std::abs(problem.x[i]), problem.floors[i]);
      problem.scale[i] = size > 0.0 ? size : 1.0;  // a variable that is zero everywhere stays so at any scale
    }
    const Vector u(N_VNew_Serial(static_cast<sunindextype>(n), context.get()));
    const Vector ones(N_VNew_Serial(static_cast<sunindextype>(n), context.get()));
    if (!u || !ones) throw std::bad_alloc();
    N_VConst(1.0, ones.get());
    double* uu = N_VGetArrayPointer(u.get());
    for (std::size_t i = 0; i < n; ++i) uu[i] = problem.x[i] / problem.scale[i];

    const Kinsol kinsol(KINCreate(context.get()));
    if (!kinsol) throw std::bad_alloc();
    void* memory = kinsol.get();
    check(KINSetErrHandlerFn(memory, collect_message, &problem), "KINSetErrHandlerFn");
    // Anderson's depth must be set before KINInit, which sizes its history; more earlier
    // iterates than variables would make its least-squares problem singular.
    check(KINSetMAA(memory, std::min<long>(options.acceleration_depth, static_cast<long>(n))), "KINSetMAA");
    check(KINInit(memory, scaled_pass, u.get()), "KINInit");
    check(KINSetUserData(memory, &problem), "KINSetUserData");
    const long remaining = options.max_iterations - static_cast<long>(problem.history.size());
    check(KINSetNumMaxIters(memory, remaining), "KINSetNumMaxIters");
    // In scaled variables KINSOL's max-norm step test is a relative change against the sizes at
    // this restart; the host's own test (against the current sizes) decides.
    check(KINSetFuncNormTol(memory, options.tolerance), "KINSetFuncNormTol");
    if (options.damping < 1.0) {
      check(options.acceleration_depth > 0 ? KINSetDampingAA(memory, options.damping)
                                           : KINSetDamping(memory, options.damping),
            "KINSetDamping");
    }
    const int flag = KINSol(memory, u.get(), KIN_FP, ones.get(), ones.get());
    if (problem.error) std::rethrow_exception(problem.error);
    if (!problem.history.empty() && converged()) return outcome();
    if (problem.breakdown) {
      problem.breakdown = false;
      continue;  // restart from the last pass, which was finite
    }
    if (flag == KIN_MAXITER_REACHED || flag == KIN_SYSFUNC_FAIL) break;  // out of passes
    if (flag < 0) {
      throw RecycleNotConverged(fmt::format("KINSOL's fixed-point iteration failed (flag {}): {}", flag,
                                            problem.kinsol_message),
                                problem.history);
    }
    // KINSOL's step test passed but the change against today's sizes is still too large: start
    // again from here with new scales (the acceleration history is lost, the progress is not).
  }
  throw RecycleNotConverged(
      fmt::format("after {} iterations the largest relative change is still {:.3g} (tolerance {:.3g})",
                  problem.history.size(), problem.history.back().largest_relative_change, options.tolerance),
      problem.history);
}

}  // namespace protonflow::host
