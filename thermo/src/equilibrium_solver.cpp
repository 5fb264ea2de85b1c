// Aqueous speciation with KINSOL (Newton with line search, dense direct linear solver, analytic
// Jacobian). Unknowns u = (ln m_1 … ln m_n, ln W); equations and references in docs/equilibrium.md.
#include "protonflow/thermo/equilibrium_solver.hpp"

#include <kinsol/kinsol.h>
#include <nvector/nvector_serial.h>
#include <sunmatrix/sunmatrix_dense.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <fmt/format.h>

#include "eigen_dense_linear_solver.hpp"
#include "initial_guess.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"

namespace protonflow::thermo {

namespace {

constexpr double inactive_log_molality = -700.0;  // stands for m = 0 in rows of absent solutes
constexpr double lowest_log = -700.0;
constexpr double highest_log = 40.0;  // e^40 mol/kg: far above any solution, keeps exp() finite

}  // namespace

struct EquilibriumSolver::Impl {
  explicit Impl(const ChemicalSystem& chemical_system, SolverOptions solver_options);
  ~Impl();
  Impl(const Impl&) = delete;
  Impl& operator=(const Impl&) = delete;

  void solve(double temperature, double pressure, std::span<const double> amounts, Speciation& out);

  // The system of equations, evaluated at u: residual F(u) and its Jacobian.
  void evaluate_molalities(const double* u);
  void residual(const double* u, double* f);
  void jacobian(const double* u, SUNMatrix jacobian_matrix);
  // KINSOL's callbacks: the user data is this Impl.
  static int residual_callback(N_Vector u, N_Vector f, void* user_data) {
    static_cast<Impl*>(user_data)->residual(N_VGetArrayPointer(u), N_VGetArrayPointer(f));
    return 0;
  }
  // KINSOL's messages go into the error we throw, never to stderr: a library does not print.
  static void error_callback(int, const char*, const char* function, char* message, void* user_data) {
    static_cast<Impl*>(user_data)->kinsol_message = fmt::format("{}: {}", function, message);
  }
  static int jacobian_callback(N_Vector u, N_Vector, SUNMatrix jacobian_matrix, void* user_data, N_Vector, N_Vector) {
    static_cast<Impl*>(user_data)->jacobian(N_VGetArrayPointer(u), jacobian_matrix);
    return 0;
  }

  void set_totals(std::span<const double> amounts);
  void update_log_k(double temperature, double pressure);
  void cold_start(double* u);
  int run_kinsol();
  double scaled_residual_norm();
  std::vector<EquationResidual> residual_report();
  void fill(Speciation& out, bool warm);

  const ChemicalSystem* system;
  SolverOptions options;
  std::size_t n;      // solutes
  std::size_t nb;     // basis solutes (index 0 is H+)
  std::size_t size;   // unknowns: n + 1
  std::vector<double> charge, stoichiometry, water_coefficient, ln_k;
  std::vector<char> active;
  std::vector<double> basis_total;  // mol
  double water_total = 0.0;         // mol H2O as a component
  double proton_total = 0.0;        // mol H+ from the tableau (for the cold start only)
  double temperature = 0.0, pressure = 0.0, log_k_temperature = -1.0;
  std::unique_ptr<ActivityModel> activity;
  ActivityEvaluation evaluation;
  std::vector<double> molality;
  double water_mass = 0.0;
  std::vector<double> guess_x, guess_totals, previous_u;
  std::vector<char> previous_active;
  bool has_previous = false;
  std::string kinsol_message;
  std::vector<double> evaluated_at;  // the u of the current molalities and activity evaluation
  bool evaluation_valid = false;
  // Non-zero stoichiometry of each solute, so the Jacobian skips the zeros of a sparse tableau.
  struct Term {
    std::size_t basis;
    double coefficient;
  };
  std::vector<std::vector<Term>> terms;

  SUNContext context = nullptr;
  void* kinsol = nullptr;
  N_Vector u = nullptr, u_scale = nullptr, f_scale = nullptr, f_work = nullptr;
  SUNMatrix jacobian_matrix = nullptr;
  SUNLinearSolver linear_solver = nullptr;
};

namespace {

void check_flag(int flag, const char* call) {
  if (flag < 0) throw ThermoError(ErrorKind::not_converged, fmt::format("SUNDIALS call {} failed with flag {}", call, flag));
}

// KINGetReturnFlagName hands back a malloc'd string; copy and free it.
std::string flag_name(int flag) {
  char* name = KINGetReturnFlagName(flag);
  std::string text = name ? name : "unknown flag";
  std::free(name);
  return text;
}

template <typename T>
T* check_created(T* object, const char* call) {
  if (!object) throw ThermoError(ErrorKind::not_converged, fmt::format("SUNDIALS call {} returned nothing", call));
  return object;
}

}  // namespace

EquilibriumSolver::Impl::Impl(const ChemicalSystem& chemical_system, SolverOptions solver_options)
    : system(&chemical_system),
      options(solver_options),
      n(chemical_system.solutes().size()),
      nb(chemical_system.basis_count()),
      size(n + 1),
      charge(n),
      stoichiometry(n * nb),
      water_coefficient(n),
      ln_k(n),
      active(n, 1),
      basis_total(nb),
      evaluation(n),
      molality(n),
      guess_x(nb),
      guess_totals(nb),
      previous_u(n + 1),
      previous_active(n, 0),
      evaluated_at(n + 1),
      terms(n) {
  SoluteProperties properties;
  for (std::size_t i = 0; i < n; ++i) {
    const Solute& s = chemical_system.solutes()[i];
    charge[i] = s.charge;
    water_coefficient[i] = s.water_coefficient;
    std::copy(s.stoichiometry.begin(), s.stoichiometry.end(), stoichiometry.begin() + static_cast<std::ptrdiff_t>(i * nb));
    for (std::size_t b = 0; b < nb; ++b)
      if (s.stoichiometry[b] != 0.0) terms[i].push_back({b, s.stoichiometry[b]});
    properties.charge.push_back(s.charge);
    properties.ion_size_angstrom.push_back(s.ion_size_angstrom);
  }
  activity = make_activity_model(chemical_system.options().activity, std::move(properties));

  // KINSOL set-up, once per solver: context, vectors, dense matrix and linear solver, options.
  check_flag(SUNContext_Create(nullptr, &context), "SUNContext_Create");
  const auto length = static_cast<sunindextype>(size);
  u = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  u_scale = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  f_scale = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  f_work = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  N_VConst(1.0, u);
  N_VConst(1.0, u_scale);  // ln m and ln W are already well scaled
  kinsol = check_created(KINCreate(context), "KINCreate");
  check_flag(KINInit(kinsol, residual_callback, u), "KINInit");
  check_flag(KINSetUserData(kinsol, this), "KINSetUserData");
  check_flag(KINSetErrHandlerFn(kinsol, error_callback, this), "KINSetErrHandlerFn");
  check_flag(KINSetFuncNormTol(kinsol, options.tolerance), "KINSetFuncNormTol");
  check_flag(KINSetScaledStepTol(kinsol, 1e-15), "KINSetScaledStepTol");
  check_flag(KINSetNumMaxIters(kinsol, options.max_iterations), "KINSetNumMaxIters");
  check_flag(KINSetMaxSetupCalls(kinsol, 1), "KINSetMaxSetupCalls");  // exact Newton: a fresh Jacobian each step
  check_flag(KINSetMaxNewtonStep(kinsol, 20.0 * std::sqrt(static_cast<double>(size))), "KINSetMaxNewtonStep");
  jacobian_matrix = check_created(SUNDenseMatrix(length, length, context), "SUNDenseMatrix");
  linear_solver = check_created(detail::make_eigen_dense_linear_solver(context, length), "make_eigen_dense_linear_solver");
  check_flag(KINSetLinearSolver(kinsol, linear_solver, jacobian_matrix), "KINSetLinearSolver");
  check_flag(KINSetJacFn(kinsol, jacobian_callback), "KINSetJacFn");
}

EquilibriumSolver::Impl::~Impl() {
  // KINSOL clean-up, in reverse order of creation.
  KINFree(&kinsol);
  SUNLinSolFree(linear_solver);
  SUNMatDestroy(jacobian_matrix);
  N_VDestroy(f_work);
  N_VDestroy(f_scale);
  N_VDestroy(u_scale);
  N_VDestroy(u);
  SUNContext_Free(&context);
}

// m_i = exp(u_i) for present solutes, exactly 0 for absent ones; then γ and a_w at those m.
void EquilibriumSolver::Impl::evaluate_molalities(const double* x) {
  // KINSOL asks for F and then J at the same u: evaluate once.
  if (evaluation_valid && std::equal(x, x + size, evaluated_at.begin())) return;
  std::copy(x, x + size, evaluated_at.begin());
  evaluation_valid = true;
  for (std::size_t i = 0; i < n; ++i) molality[i] = active[i] ? std::exp(std::clamp(x[i], lowest_log, highest_log)) : 0.0;
  water_mass = std::exp(std::clamp(x[n], lowest_log, highest_log));
  activity->evaluate(temperature, pressure, molality, evaluation);
}

// Rows, in order of the unknowns:
//   secondary solute s:  ln m_s + ln γ_s − Σ_b ν_sb (ln m_b + ln γ_b) − ν_sw ln a_w − ln K_s = 0   (mass action)
//   basis solute b ≠ H+: W Σ_i ν_ib m_i − T_b = 0                                              (mass balance, mol)
//   H+:                  Σ_i z_i m_i = 0                                                       (charge balance, mol/kg)
//   ln W:                W (1/M_w + Σ_i ν_iw m_i) − T_w = 0                                    (water balance, mol)
void EquilibriumSolver::Impl::residual(const double* x, double* f) {
  evaluate_molalities(x);
  const double* ln_gamma = evaluation.ln_gamma.data();
  for (std::size_t i = nb; i < n; ++i) {
    if (!active[i]) {
      f[i] = x[i] - inactive_log_molality;
      continue;
    }
    double r = x[i] + ln_gamma[i] - water_coefficient[i] * evaluation.ln_water_activity - ln_k[i];
    for (std::size_t b = 0; b < nb; ++b) {
      const double nu = stoichiometry[i * nb + b];
      if (nu != 0.0) r -= nu * (x[b] + ln_gamma[b]);
    }
    f[i] = r;
  }
  for (std::size_t b = 1; b < nb; ++b) {
    if (!active[b]) {
      f[b] = x[b] - inactive_log_molality;
      continue;
    }
    double amount = 0.0;
    for (std::size_t i = 0; i < n; ++i) amount += stoichiometry[i * nb + b] * molality[i];
    f[b] = water_mass * amount - basis_total[b];
  }
  double charge_sum = 0.0, water_bound = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    charge_sum += charge[i] * molality[i];
    water_bound += water_coefficient[i] * molality[i];
  }
  f[0] = charge_sum;
  f[n] = water_mass * (1.0 / constants::water_molar_mass + water_bound) - water_total;
}

// ∂F/∂u, column k: ∂(ln γ_i)/∂u_k = (∂ln γ_i/∂m_k) m_k, and likewise for ln a_w.
void EquilibriumSolver::Impl::jacobian(const double* x, SUNMatrix jm) {
  evaluate_molalities(x);
  double* data = SUNDenseMatrix_Data(jm);  // column-major, size × size; KINSOL zeroes it before each call
  const auto at = [&](std::size_t row, std::size_t column) -> double& { return data[column * size + row]; };
  const double* dg = evaluation.d_ln_gamma_d_molality.data();
  const double* dw = evaluation.d_ln_water_activity_d_molality.data();
  for (std::size_t i = nb; i < n; ++i) {
    if (!active[i]) {
      at(i, i) = 1.0;
      continue;
    }
    at(i, i) += 1.0;
    for (const Term& t : terms[i]) at(i, t.basis) -= t.coefficient;
    const double* dg_i = dg + i * n;
    for (std::size_t k = 0; k < n; ++k) {
      if (molality[k] == 0.0) continue;
      double d = dg_i[k] - water_coefficient[i] * dw[k];
      for (const Term& t : terms[i]) d -= t.coefficient * dg[t.basis * n + k];
      at(i, k) += d * molality[k];
    }
  }
  for (std::size_t b = 1; b < nb; ++b)
    if (!active[b]) at(b, b) = 1.0;
  for (std::size_t k = 0; k < n; ++k) {
    const double mk = molality[k];
    for (const Term& t : terms[k]) {
      if (t.basis == 0 || !active[t.basis]) continue;
      const double term = t.coefficient * mk;
      at(t.basis, k) = water_mass * term;
      at(t.basis, n) += water_mass * term;
    }
  }
  double water_bound = 0.0;
  for (std::size_t k = 0; k < n; ++k) {
    at(0, k) = charge[k] * molality[k];
    at(n, k) = water_mass * water_coefficient[k] * molality[k];
    water_bound += water_coefficient[k] * molality[k];
  }
  at(n, n) = water_mass * (1.0 / constants::water_molar_mass + water_bound);
}

void EquilibriumSolver::Impl::set_totals(std::span<const double> amounts) {
  const auto& components = system->components();
  if (amounts.size() != components.size())
    throw ThermoError(ErrorKind::bad_input, fmt::format("{} amounts given for {} components", amounts.size(), components.size()));
  std::fill(basis_total.begin(), basis_total.end(), 0.0);
  water_total = 0.0;
  for (std::size_t c = 0; c < amounts.size(); ++c) {
    if (!std::isfinite(amounts[c]) || amounts[c] < 0.0)
      throw ThermoError(ErrorKind::bad_input,
                        fmt::format("the amount of {} is {} mol; amounts must be finite and not negative", components[c], amounts[c]));
    const auto& composition = system->composition(c);
    for (std::size_t b = 0; b < nb; ++b) basis_total[b] += composition[b] * amounts[c];
    water_total += system->water_in(c) * amounts[c];
  }
  if (!(water_total > 0.0))
    throw ThermoError(ErrorKind::bad_input, "the solution has no water; an aqueous solution needs H2O as a component");
  // H+ is balanced by charge; its tableau total is kept for the cold start.
  proton_total = basis_total[0];
  // A basis species with no total is absent, and so is every solute built from it.
  for (std::size_t i = 0; i < n; ++i) {
    bool present = true;
    for (std::size_t b = 1; b < nb; ++b)
      if (stoichiometry[i * nb + b] != 0.0 && !(basis_total[b] > 0.0)) present = false;
    active[i] = present;
  }
}

void EquilibriumSolver::Impl::update_log_k(double t, double p) {
  if (t == log_k_temperature) return;
  for (std::size_t i = nb; i < n; ++i) ln_k[i] = constants::ln10 * log_k(system->solutes()[i].log_k, t, p);
  log_k_temperature = t;
}

// Ideal sweeps with a_w = 1 and W from the water total, then the unknowns from that guess.
void EquilibriumSolver::Impl::cold_start(double* x) {
  const double water_guess = water_total * constants::water_molar_mass;
  for (std::size_t b = 0; b < nb; ++b) {
    guess_totals[b] = (b == 0 ? proton_total : basis_total[b]) / water_guess;
    guess_x[b] = active[b] ? std::log(std::max(guess_totals[b], 1e-7)) : inactive_log_molality;
  }
  detail::GuessProblem problem{n, nb, stoichiometry, ln_k, std::span<const char>(active.data(), n), guess_totals};
  detail::sweep_basis_balances(problem, guess_x, 30);
  for (std::size_t b = 0; b < nb; ++b) x[b] = guess_x[b];
  for (std::size_t i = nb; i < n; ++i) {
    if (!active[i]) {
      x[i] = inactive_log_molality;
      continue;
    }
    double exponent = ln_k[i];
    for (std::size_t b = 0; b < nb; ++b) exponent += stoichiometry[i * nb + b] * guess_x[b];
    x[i] = std::clamp(exponent, lowest_log, highest_log);
  }
  x[n] = std::log(water_guess);
}

int EquilibriumSolver::Impl::run_kinsol() {
  // Scale each residual by its natural size, so the tolerance is relative for every balance.
  double* x = N_VGetArrayPointer(u);
  double* scale = N_VGetArrayPointer(f_scale);
  evaluate_molalities(x);
  double charge_scale = 0.0;
  for (std::size_t i = 0; i < n; ++i) charge_scale += 0.5 * std::abs(charge[i]) * molality[i];
  for (std::size_t i = 0; i < size; ++i) scale[i] = 1.0;
  scale[0] = 1.0 / std::max(charge_scale, 1e-300);
  for (std::size_t b = 1; b < nb; ++b) scale[b] = active[b] ? 1.0 / basis_total[b] : 1.0;
  scale[n] = 1.0 / water_total;
  // Solve, then check the flag.
  return KINSol(kinsol, u, KIN_LINESEARCH, u_scale, f_scale);
}

// Scaled max-norm of the residual at the current u, with the charge balance relative to the
// equivalents of the answer itself.
double EquilibriumSolver::Impl::scaled_residual_norm() {
  const double* x = N_VGetArrayPointer(u);
  double* f = N_VGetArrayPointer(f_work);
  residual(x, f);
  double charge_scale = 0.0;
  for (std::size_t i = 0; i < n; ++i) charge_scale += 0.5 * std::abs(charge[i]) * molality[i];
  double norm = std::abs(f[0]) / charge_scale;
  for (std::size_t i = 1; i < size; ++i) norm = std::max(norm, std::abs(f[i]) * N_VGetArrayPointer(f_scale)[i]);
  return norm;
}

std::vector<EquationResidual> EquilibriumSolver::Impl::residual_report() {
  scaled_residual_norm();  // refreshes f_work at the final iterate
  const double* f = N_VGetArrayPointer(f_work);
  const double* scale = N_VGetArrayPointer(f_scale);
  std::vector<EquationResidual> report;
  const auto& solutes = system->solutes();
  report.push_back({"charge balance", f[0] * scale[0]});
  for (std::size_t b = 1; b < nb; ++b) report.push_back({"mass balance " + solutes[b].name, f[b] * scale[b]});
  for (std::size_t i = nb; i < n; ++i) report.push_back({"mass action " + solutes[i].name, f[i]});
  report.push_back({"water balance", f[n] * scale[n]});
  return report;
}

void EquilibriumSolver::Impl::fill(Speciation& out, bool warm) {
  const double* x = N_VGetArrayPointer(u);
  evaluate_molalities(x);
  out.temperature = temperature;
  out.pressure = pressure;
  out.molality.resize(n);
  out.activity.resize(n);
  out.log10_gamma.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    out.molality[i] = molality[i];
    out.log10_gamma[i] = evaluation.ln_gamma[i] / constants::ln10;
    out.activity[i] = molality[i] * std::exp(evaluation.ln_gamma[i]);
  }
  out.ph = -(x[0] + evaluation.ln_gamma[0]) / constants::ln10;
  out.ionic_strength = evaluation.ionic_strength;
  out.water_mass = water_mass;
  out.water_activity = std::exp(evaluation.ln_water_activity);
  long iterations = 0;
  KINGetNumNonlinSolvIters(kinsol, &iterations);
  out.iterations = iterations;
  out.residual_norm = scaled_residual_norm();
  out.warm_started = warm;
  out.activity_model_limit = activity->maximum_ionic_strength();
  out.activity_model_name = activity->name().data();
  out.warnings = out.ionic_strength > out.activity_model_limit ? ionic_strength_beyond_model : 0u;
}

void EquilibriumSolver::Impl::solve(double t, double p, std::span<const double> amounts, Speciation& out) {
  if (!std::isfinite(t) || t < system->minimum_temperature() || t > system->maximum_temperature())
    throw ThermoError(ErrorKind::out_of_range,
                      fmt::format("temperature {:.2f} K ({:.2f} °C) is outside the species data's range {:.2f}–{:.2f} K",
                                  t, t - 273.15, system->minimum_temperature(), system->maximum_temperature()));
  if (!std::isfinite(p) || p <= 0.0)
    throw ThermoError(ErrorKind::bad_input, fmt::format("pressure {} Pa is not a positive number", p));
  temperature = t;
  pressure = p;
  evaluation_valid = false;  // γ and a_w depend on T and on which solutes are present
  set_totals(amounts);
  update_log_k(t, p);

  double* x = N_VGetArrayPointer(u);
  const bool warm = has_previous && previous_active == active;
  if (warm) {
    std::copy(previous_u.begin(), previous_u.end(), x);
  } else {
    cold_start(x);
  }
  int flag = run_kinsol();
  const double acceptable = 100.0 * options.tolerance;  // a step-size stop close enough to the tolerance
  bool converged = flag >= 0 && (flag != KIN_STEP_LT_STPTOL || scaled_residual_norm() <= acceptable);
  bool used_warm = warm;
  if (!converged && warm) {  // a poor warm start is retried cold before giving up
    cold_start(x);
    flag = run_kinsol();
    converged = flag >= 0 && (flag != KIN_STEP_LT_STPTOL || scaled_residual_norm() <= acceptable);
    used_warm = false;
  }
  if (!converged) {
    has_previous = false;
    long iterations = 0;
    KINGetNumNonlinSolvIters(kinsol, &iterations);
    throw ConvergenceError(
        fmt::format("speciation did not converge at {:.2f} K (KINSOL {}: {}); scaled residual max-norm {:.3g}",
                    t, flag_name(flag), kinsol_message, scaled_residual_norm()),
        residual_report(), iterations);
  }
  std::copy(x, x + size, previous_u.begin());
  previous_active = active;
  has_previous = true;
  fill(out, used_warm);
}

std::vector<std::string> describe_warnings(const Speciation& s) {
  std::vector<std::string> text;
  if (s.warnings & ionic_strength_beyond_model)
    text.push_back(fmt::format("ionic strength {:.3g} mol/kg is beyond the {} activity model's range (about {:g} mol/kg): "
                               "activities, and pH with them, are extrapolated",
                               s.ionic_strength, s.activity_model_name, s.activity_model_limit));
  return text;
}

EquilibriumSolver::EquilibriumSolver(const ChemicalSystem& system, SolverOptions options)
    : impl_(std::make_unique<Impl>(system, options)) {}
EquilibriumSolver::~EquilibriumSolver() = default;
EquilibriumSolver::EquilibriumSolver(EquilibriumSolver&&) noexcept = default;
EquilibriumSolver& EquilibriumSolver::operator=(EquilibriumSolver&&) noexcept = default;

void EquilibriumSolver::solve(double temperature, double pressure, std::span<const double> amounts, Speciation& out) {
  impl_->solve(temperature, pressure, amounts, out);
}

Speciation EquilibriumSolver::solve(double temperature, double pressure, std::span<const double> amounts) {
  Speciation out;
  solve(temperature, pressure, amounts, out);
  return out;
}

void EquilibriumSolver::reset_warm_start() noexcept { impl_->has_previous = false; }

const ChemicalSystem& EquilibriumSolver::system() const noexcept { return *impl_->system; }

}  // namespace protonflow::thermo
