// The column on KINSOL: set-up, solve, check the flag, free, each step visible (docs/units.md,
// "scrubber", "Solution").
#include "column_solver.hpp"

#include <kinsol/kinsol.h>
#include <nvector/nvector_serial.h>
#include <sunlinsol/sunlinsol_band.h>
#include <sunmatrix/sunmatrix_band.h>

#include <algorithm>
#include <cmath>
#include <exception>
#include <optional>
#include <string>

#include "column_equations.hpp"

namespace protonflow::scrubber {

namespace {

// Three attempts: the first from 6 sweeps of the start (enough for 5 to 40 stages: Newton then
// takes 4 iterations on the benchmark column, docs/performance.md); the second more careful (more
// sweeps, shorter Newton steps; scaled 2-norm of the step, ln(flow) is already of order one); the
// third with long steps, for a gas that the liquor takes up to a trace tens of decades down on
// several stages at once (CO2 in air on caustic), where every Newton step is long and KINSOL stops
// after five of the longest allowed.
struct Attempt {
  int sweeps;
  double max_step;
};
constexpr Attempt attempts[] = {{6, 50.0}, {24, 15.0}, {8, 200.0}};
constexpr int sweeps_from_previous = 2;

// What the callbacks share with the driver: the equations, and the first failure of a stage
// evaluation (a speciation that did not converge, a temperature out of the data's range).
struct CallbackData {
  detail::ColumnEquations* equations;
  std::string stage_failure;
};

int residual_callback(N_Vector u, N_Vector f, void* user_data) {
  auto* data = static_cast<CallbackData*>(user_data);
  try {
    data->equations->residual(N_VGetArrayPointer(u), N_VGetArrayPointer(f));
    return 0;
  } catch (const std::exception& error) {
    if (data->stage_failure.empty()) data->stage_failure = error.what();
    return 1;  // recoverable: the line search may step back
  }
}

int jacobian_callback(N_Vector u, N_Vector, SUNMatrix jacobian, void* user_data, N_Vector, N_Vector) {
  auto* data = static_cast<CallbackData*>(user_data);
  try {
    data->equations->jacobian(N_VGetArrayPointer(u), jacobian);
    return 0;
  } catch (const std::exception& error) {
    if (data->stage_failure.empty()) data->stage_failure = error.what();
    return 1;
  }
}

void silent_error_handler(int, const char*, const char*, char*, void*) {}

void check(int flag, const char* call) {
  if (flag < 0) throw std::runtime_error(std::string("KINSOL set-up failed in ") + call + " (flag " + std::to_string(flag) + ")");
}

template <class T>
T* check_created(T* created, const char* call) {
  if (created == nullptr) throw std::runtime_error(std::string("KINSOL set-up failed in ") + call);
  return created;
}

// The SUNDIALS objects of one solve, freed in reverse order of creation whatever happens; the
// context, band matrix and linear solver are the column memory's.
struct KinsolObjects {
  N_Vector u = nullptr, u_scale = nullptr, f_scale = nullptr, constraints = nullptr;
  void* kinsol = nullptr;
  ~KinsolObjects() {
    KINFree(&kinsol);
    if (constraints) N_VDestroy(constraints);
    if (f_scale) N_VDestroy(f_scale);
    if (u_scale) N_VDestroy(u_scale);
    if (u) N_VDestroy(u);
  }
};

std::vector<StageResidual> largest_residuals(detail::ColumnEquations& equations, const double* f, std::size_t count) {
  std::vector<StageResidual> all;
  for (std::size_t i = 0; i < equations.size(); ++i)
    all.push_back({i / equations.block() + 1, equations.equation_name(i % equations.block()), f[i]});
  std::sort(all.begin(), all.end(),
            [](const StageResidual& a, const StageResidual& b) { return std::abs(a.scaled_residual) > std::abs(b.scaled_residual); });
  if (all.size() > count) all.resize(count);
  return all;
}

}  // namespace

// The context, the band matrix (half-bandwidths 2b − 1 for blocks of b unknowns) and its LU
// solver of a column, kept between solves; `factored` when the matrix holds the LU factors of the
// last Jacobian of a converged solve.
struct ColumnMemory::Objects {
  SUNContext context = nullptr;
  N_Vector model = nullptr;  // a vector of the column's length, for the linear solver's set-up
  N_Vector step = nullptr, right_side = nullptr;
  SUNMatrix band = nullptr;
  SUNLinearSolver linear_solver = nullptr;
  std::size_t size = 0, block = 0;
  bool factored = false;

  ~Objects() {
    release();
    if (context) SUNContext_Free(&context);
  }
  void release() {
    if (linear_solver) SUNLinSolFree(linear_solver);
    if (band) SUNMatDestroy(band);
    if (right_side) N_VDestroy(right_side);
    if (step) N_VDestroy(step);
    if (model) N_VDestroy(model);
    linear_solver = nullptr;
    band = nullptr;
    right_side = step = model = nullptr;
    size = block = 0;
    factored = false;
  }
  // Sized for these equations: kept as they are where they fit, made afresh where not.
  void fit(const detail::ColumnEquations& equations) {
    if (!context) check(SUNContext_Create(nullptr, &context), "SUNContext_Create");
    if (band && size == equations.size() && block == equations.block()) return;
    release();
    const auto length = static_cast<sunindextype>(equations.size());
    const auto half_band = static_cast<sunindextype>(2 * equations.block() - 1);
    model = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
    step = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
    right_side = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
    band = check_created(SUNBandMatrix(length, half_band, half_band, context), "SUNBandMatrix");
    linear_solver = check_created(SUNLinSol_Band(model, band, context), "SUNLinSol_Band");
    size = equations.size();
    block = equations.block();
  }
};

ColumnMemory::ColumnMemory() : objects_(std::make_unique<Objects>()) {}
ColumnMemory::~ColumnMemory() = default;
ColumnMemory::ColumnMemory(ColumnMemory&&) noexcept = default;
ColumnMemory& ColumnMemory::operator=(ColumnMemory&&) noexcept = default;

namespace {

// Chord steps from `start` on the Jacobian kept from the last solve: x ← x − J⁻¹ F(x), each step
// required to cut the residual's max-norm by chord_contraction, to the solve's tolerance in at most
// chord_steps steps. Nothing where they do not get there (or a step leaves the range where stages
// have an answer): Newton then runs as it would have.
constexpr int chord_steps = 4;
constexpr double chord_contraction = 0.25;

std::optional<ColumnProfile> chord_from(detail::ColumnEquations& equations, const ColumnSpecification& specification,
                                        const ColumnProfile& start, ColumnMemory::Objects& memory) {
  const std::size_t n = equations.size();
  std::vector<double> x(n), f(n), trial(n);
  equations.pack(start, x.data());
  const auto max_norm = [](const std::vector<double>& values) {
    double norm = 0.0;
    for (const double v : values) norm = std::max(norm, std::abs(v));
    return norm;
  };
  try {
    equations.residual(x.data(), f.data());
    double norm = max_norm(f);
    for (long step = 0;; ++step) {
      if (norm <= specification.tolerance) {
        ColumnProfile profile = equations.unpack(x.data());
        profile.iterations = step;
        profile.residual_norm = norm;
        return profile;
      }
      if (step == chord_steps) return std::nullopt;
      double* right_side = N_VGetArrayPointer(memory.right_side);
      for (std::size_t i = 0; i < n; ++i) right_side[i] = -f[i];
      if (SUNLinSolSolve(memory.linear_solver, memory.band, memory.step, memory.right_side, 0.0) != 0) return std::nullopt;
      const double* dx = N_VGetArrayPointer(memory.step);
      for (std::size_t i = 0; i < n; ++i) x[i] += dx[i];
      equations.residual(x.data(), f.data());  // throws where the step left the stages' range
      const double next = max_norm(f);
      if (!(next <= chord_contraction * norm)) return std::nullopt;
      norm = next;
    }
  } catch (const std::exception&) {
    return std::nullopt;
  }
}

// One solve from `start`, Newton steps at most `max_step` long, on the memory's band matrix and
// solver (left holding the LU factors of the last Jacobian).
ColumnProfile solve_from(detail::ColumnEquations& equations, const ColumnSpecification& specification,
                         const ColumnProfile& start, double max_step, ColumnMemory::Objects& memory) {
  CallbackData data{&equations, {}};

  // Set-up: vectors, the band matrix and its LU solver (the memory's), the options.
  KinsolObjects k;
  memory.fit(equations);
  memory.factored = false;
  const SUNContext context = memory.context;
  const auto length = static_cast<sunindextype>(equations.size());
  k.u = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  k.u_scale = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  k.f_scale = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  double* u = N_VGetArrayPointer(k.u);
  equations.pack(start, u);
  // ln(flow) is scaled already; a temperature step of 10 K counts as one unit.
  double* u_scale = N_VGetArrayPointer(k.u_scale);
  for (std::size_t i = 0; i < equations.size(); ++i) u_scale[i] = i % equations.block() == equations.temperature_slot() ? 0.1 : 1.0;
  N_VConst(1.0, k.f_scale);  // every residual is scaled where it is written
  k.constraints = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  equations.constraints(N_VGetArrayPointer(k.constraints));
  k.kinsol = check_created(KINCreate(context), "KINCreate");
  check(KINInit(k.kinsol, residual_callback, k.u), "KINInit");
  check(KINSetUserData(k.kinsol, &data), "KINSetUserData");
  check(KINSetErrHandlerFn(k.kinsol, silent_error_handler, nullptr), "KINSetErrHandlerFn");
  check(KINSetFuncNormTol(k.kinsol, specification.tolerance), "KINSetFuncNormTol");
  check(KINSetScaledStepTol(k.kinsol, 1e-14), "KINSetScaledStepTol");
  check(KINSetNumMaxIters(k.kinsol, specification.max_iterations), "KINSetNumMaxIters");
  check(KINSetMaxSetupCalls(k.kinsol, 1), "KINSetMaxSetupCalls");  // exact Newton: a fresh Jacobian each step
  check(KINSetConstraints(k.kinsol, k.constraints), "KINSetConstraints");
  check(KINSetMaxNewtonStep(k.kinsol, max_step), "KINSetMaxNewtonStep");
  check(KINSetLinearSolver(k.kinsol, memory.linear_solver, memory.band), "KINSetLinearSolver");
  check(KINSetJacFn(k.kinsol, jacobian_callback), "KINSetJacFn");

  // Solve, with KINSOL's line search.
  const int flag = KINSol(k.kinsol, k.u, KIN_LINESEARCH, k.u_scale, k.f_scale);

  // Check: the flag, and the residual itself at the answer.
  long iterations = 0;
  KINGetNumNonlinSolvIters(k.kinsol, &iterations);
  std::vector<double> f(equations.size(), 0.0);
  double norm = INFINITY;
  try {
    equations.residual(u, f.data());
    norm = 0.0;
    for (const double r : f) norm = std::max(norm, std::abs(r));
  } catch (const std::exception& error) {
    if (data.stage_failure.empty()) data.stage_failure = error.what();
  }
  if (flag < 0 || !(norm <= specification.tolerance * 10.0)) {
    std::string message = "the column of " + std::to_string(specification.stages) +
                          " stages did not converge (KINSOL flag " + std::to_string(flag) + " after " +
                          std::to_string(iterations) + " Newton iterations; scaled residual max-norm " +
                          std::to_string(norm) + ")";
    if (!data.stage_failure.empty()) message += "; a stage failed on the way: " + data.stage_failure;
    throw ColumnConvergenceError(message, std::isfinite(norm) ? largest_residuals(equations, f.data(), 3) : std::vector<StageResidual>{},
                                 iterations);
  }
  ColumnProfile profile = equations.unpack(u);
  profile.iterations = iterations;
  profile.residual_norm = norm;
  // The band matrix holds the LU factors of the Jacobian of the last Newton step, where KINSOL
  // took one (a start that already met the tolerance leaves none).
  memory.factored = iterations > 0;
  return profile;
}

}  // namespace

ColumnProfile solve_column(StageModel& model, const ColumnSpecification& specification, const ColumnFeeds& feeds,
                           const ColumnProfile* previous, ColumnMemory* memory) {
  detail::ColumnEquations equations(model, specification, feeds);
  ColumnMemory local;
  ColumnMemory::Objects& objects = memory != nullptr ? memory->objects() : local.objects();
  // A previous answer of the same column (the last pass of a recycle) is a better start than any
  // sweep: chord steps on the last Jacobian where it is kept and fits, then Newton from it, and
  // from a cold start only if that fails.
  if (previous != nullptr && equations.can_start_from(*previous)) {
    if (objects.factored && objects.size == equations.size() && objects.block == equations.block()) {
      if (std::optional<ColumnProfile> profile = chord_from(equations, specification, *previous, objects)) return *profile;
    }
    try {
      return solve_from(equations, specification, *previous, attempts[0].max_step, objects);
    } catch (const ColumnConvergenceError&) {
    }
  }
  // A previous answer whose unknowns differ from this column's (a component new to the feeds: the
  // first reagent into a sump of fresh water) is still closer than the cold start's first profile:
  // a few sweeps from it, where the new component finds its place.
  if (previous != nullptr && previous->stages == specification.stages && !equations.can_start_from(*previous)) {
    try {
      return solve_from(equations, specification, equations.start_profile_from(*previous, sweeps_from_previous),
                        attempts[0].max_step, objects);
    } catch (const ColumnConvergenceError&) {
    }
  }
  for (std::size_t a = 0;; ++a) {
    try {
      return solve_from(equations, specification, equations.start_profile(attempts[a].sweeps), attempts[a].max_step, objects);
    } catch (const ColumnConvergenceError&) {
      if (a + 1 == std::size(attempts)) throw;
    }
  }
}

}  // namespace protonflow::scrubber
