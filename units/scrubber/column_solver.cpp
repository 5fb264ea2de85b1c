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

// The SUNDIALS objects of one solve, freed in reverse order of creation whatever happens.
struct KinsolObjects {
  SUNContext context = nullptr;
  N_Vector u = nullptr, u_scale = nullptr, f_scale = nullptr, constraints = nullptr;
  SUNMatrix band = nullptr;
  SUNLinearSolver linear_solver = nullptr;
  void* kinsol = nullptr;
  ~KinsolObjects() {
    KINFree(&kinsol);
    if (linear_solver) SUNLinSolFree(linear_solver);
    if (band) SUNMatDestroy(band);
    if (constraints) N_VDestroy(constraints);
    if (f_scale) N_VDestroy(f_scale);
    if (u_scale) N_VDestroy(u_scale);
    if (u) N_VDestroy(u);
    if (context) SUNContext_Free(&context);
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

namespace {

// One solve from `start`, Newton steps at most `max_step` long.
ColumnProfile solve_from(detail::ColumnEquations& equations, const ColumnSpecification& specification,
                         const ColumnProfile& start, double max_step) {
  CallbackData data{&equations, {}};

  // Set-up: context, vectors, the band matrix (half-bandwidths 2b − 1 for blocks of b unknowns)
  // and its LU solver, the options.
  KinsolObjects k;
  check(SUNContext_Create(nullptr, &k.context), "SUNContext_Create");
  const auto length = static_cast<sunindextype>(equations.size());
  const auto half_band = static_cast<sunindextype>(2 * equations.block() - 1);
  k.u = check_created(N_VNew_Serial(length, k.context), "N_VNew_Serial");
  k.u_scale = check_created(N_VNew_Serial(length, k.context), "N_VNew_Serial");
  k.f_scale = check_created(N_VNew_Serial(length, k.context), "N_VNew_Serial");
  double* u = N_VGetArrayPointer(k.u);
  equations.pack(start, u);
  // ln(flow) is scaled already; a temperature step of 10 K counts as one unit.
  double* u_scale = N_VGetArrayPointer(k.u_scale);
  for (std::size_t i = 0; i < equations.size(); ++i) u_scale[i] = i % equations.block() == equations.temperature_slot() ? 0.1 : 1.0;
  N_VConst(1.0, k.f_scale);  // every residual is scaled where it is written
  k.constraints = check_created(N_VNew_Serial(length, k.context), "N_VNew_Serial");
  equations.constraints(N_VGetArrayPointer(k.constraints));
  k.kinsol = check_created(KINCreate(k.context), "KINCreate");
  check(KINInit(k.kinsol, residual_callback, k.u), "KINInit");
  check(KINSetUserData(k.kinsol, &data), "KINSetUserData");
  check(KINSetErrHandlerFn(k.kinsol, silent_error_handler, nullptr), "KINSetErrHandlerFn");
  check(KINSetFuncNormTol(k.kinsol, specification.tolerance), "KINSetFuncNormTol");
  check(KINSetScaledStepTol(k.kinsol, 1e-14), "KINSetScaledStepTol");
  check(KINSetNumMaxIters(k.kinsol, specification.max_iterations), "KINSetNumMaxIters");
  check(KINSetMaxSetupCalls(k.kinsol, 1), "KINSetMaxSetupCalls");  // exact Newton: a fresh Jacobian each step
  check(KINSetConstraints(k.kinsol, k.constraints), "KINSetConstraints");
  check(KINSetMaxNewtonStep(k.kinsol, max_step), "KINSetMaxNewtonStep");
  k.band = check_created(SUNBandMatrix(length, half_band, half_band, k.context), "SUNBandMatrix");
  k.linear_solver = check_created(SUNLinSol_Band(k.u, k.band, k.context), "SUNLinSol_Band");
  check(KINSetLinearSolver(k.kinsol, k.linear_solver, k.band), "KINSetLinearSolver");
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
  return profile;
}

}  // namespace

ColumnProfile solve_column(StageModel& model, const ColumnSpecification& specification, const ColumnFeeds& feeds,
                           const ColumnProfile* previous) {
  detail::ColumnEquations equations(model, specification, feeds);
  // A previous answer of the same column (the last pass of a recycle) is a better start than any
  // sweep: Newton from it, and from a cold start only if that fails.
  if (previous != nullptr && equations.can_start_from(*previous)) {
    try {
      return solve_from(equations, specification, *previous, attempts[0].max_step);
    } catch (const ColumnConvergenceError&) {
    }
  }
  for (std::size_t a = 0;; ++a) {
    try {
      return solve_from(equations, specification, equations.start_profile(attempts[a].sweeps), attempts[a].max_step);
    } catch (const ColumnConvergenceError&) {
      if (a + 1 == std::size(attempts)) throw;
    }
  }
}

}  // namespace protonflow::scrubber
