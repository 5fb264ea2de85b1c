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
#include <limits>

#include <Eigen/LU>
#include <boost/math/tools/roots.hpp>

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

  void solve(double temperature, double pressure, std::span<const double> amounts,
             std::span<const double> open_gas_pressures, Speciation& out);

  // The system of equations, evaluated at u: residual F(u) and its Jacobian.
  void evaluate_molalities(const double* u);
  void residual(const double* u, double* f);
  void jacobian(const double* u, SUNMatrix jacobian_matrix);
  // ln of a solid's saturation ratio or a gas's p/p°: ln K + Σ_b ν_b ln a_b + ν_w ln a_w, and its
  // gradient over the solute unknowns.
  double phase_log_activity(const PhaseSpecies& p, double ln_k_phase) const;
  void phase_log_activity_gradient(const PhaseSpecies& p, double* gradient) const;
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

  void set_totals(std::span<const double> amounts, std::span<const double> open_gas_pressures);
  bool settle_phases();
  void predict_precipitation(std::size_t allowed_index);
  void update_log_k(double temperature, double pressure);
  void ideal_guess(double* u);  // for the current set of present phases
  void guess_pass(double* u, double ln_water_activity);
  bool solve_current_set();
  bool replace_rival(std::size_t added);
  int run_kinsol(int strategy);
  int run_newton();
  bool accepted(int flag);
  double scaled_residual_norm();
  std::vector<EquationResidual> residual_report();
  void fill(Speciation& out, bool warm);

  const ChemicalSystem* system;
  SolverOptions options;
  std::size_t n;      // solutes
  std::size_t nb;     // basis solutes (index 0 is H+)
  // Unknowns: [0, n) ln m_i; n: ln W; then one per allowed solid (n_p / s_p), one per open gas
  // (uptake / ξ_s), one per gas of a closed phase (n_g / N_s) and the phase total (N / N_s).
  std::size_t solid_offset, open_offset, phase_offset, phase_total_index, size;
  std::vector<std::size_t> allowed;  // indices into system->solids() of the allowed solids
  std::vector<double> charge, stoichiometry, water_coefficient, ln_k;
  std::vector<double> ln_k_solid, ln_k_open, ln_k_phase;
  std::vector<char> active, solid_active;
  // The active set: which allowed solids are present, whether the closed gas phase is; and the sets
  // already tried in this solve (flat, one row of allowed.size() + 1 flags each, capacity reserved).
  std::vector<char> solid_present, previous_solid_present, tried_sets;
  bool gas_phase_present = false, previous_gas_phase_present = false;
  std::size_t maximum_rounds = 0;
  std::vector<double> basis_total;  // mol
  double water_total = 0.0;         // mol H2O as a component
  double proton_total = 0.0;        // mol H+ from the tableau (for the cold start only)
  std::vector<double> solid_scale;  // s_p, mol: the most of each allowed solid the totals allow
  double uptake_scale = 1.0;        // ξ_s, mol: 1 mol per kg of the water present
  double phase_scale = 1.0;         // N_s, mol: all the moles the system holds
  std::vector<double> open_log_pressure;  // ln(p_g / p°) of each open gas
  double temperature = 0.0, pressure = 0.0, log_k_temperature = -1.0;
  std::unique_ptr<ActivityModel> activity;
  ActivityEvaluation evaluation;
  std::vector<double> molality;
  double water_mass = 0.0;
  std::vector<double> before_addition;  // u before the latest solid was added
  std::vector<double> newton_start;    // u before a Newton solve, for the full-step retry
  std::vector<double> guess_ln_gamma, conditional_ln_k;  // the guess's activity corrections
  std::vector<double> shift_by_basis;  // ln of the fraction of each basis species a precipitation leaves
  std::vector<double> guess_x, guess_totals, guess_stoichiometry, guess_ln_k, previous_u, gradient;
  std::vector<char> guess_active, previous_active;
  bool has_previous = false;
  int last_flag = 0;
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
      charge(n),
      stoichiometry(n * nb),
      water_coefficient(n),
      ln_k(n),
      ln_k_solid(chemical_system.solids().size()),
      ln_k_open(chemical_system.open_gases().size()),
      ln_k_phase(chemical_system.phase_gases().size()),
      active(n, 1),
      solid_active(chemical_system.solids().size(), 0),
      basis_total(nb),
      open_log_pressure(chemical_system.open_gases().size()),
      evaluation(n),
      molality(n),
      guess_ln_gamma(n),
      conditional_ln_k(n),
      shift_by_basis(nb),
      guess_x(nb),
      guess_totals(nb),
      guess_stoichiometry(n * nb),
      guess_ln_k(n),
      gradient(n),
      guess_active(n),
      previous_active(n, 0),
      terms(n) {
  for (std::size_t p = 0; p < chemical_system.solids().size(); ++p)
    if (chemical_system.solids()[p].allowed) allowed.push_back(p);
  solid_offset = n + 1;
  open_offset = solid_offset + allowed.size();
  phase_offset = open_offset + chemical_system.open_gases().size();
  phase_total_index = phase_offset + chemical_system.phase_gases().size();
  size = phase_total_index + (chemical_system.phase_gases().empty() ? 0 : 1);
  solid_scale.assign(allowed.size(), 1.0);
  solid_present.assign(allowed.size(), 0);
  previous_solid_present.assign(allowed.size(), 0);
  maximum_rounds = 4 * (allowed.size() + 1) + 8;
  tried_sets.reserve(maximum_rounds * (allowed.size() + 1));
  previous_u.assign(size, 0.0);
  newton_start.assign(size, 0.0);
  before_addition.assign(size, 0.0);
  evaluated_at.assign(size, 0.0);
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

double EquilibriumSolver::Impl::phase_log_activity(const PhaseSpecies& p, double ln_k_phase) const {
  double value = ln_k_phase + p.water_coefficient * evaluation.ln_water_activity;
  for (std::size_t b = 0; b < nb; ++b)
    if (p.stoichiometry[b] != 0.0) value += p.stoichiometry[b] * (std::log(std::max(molality[b], 1e-300)) + evaluation.ln_gamma[b]);
  return value;
}

void EquilibriumSolver::Impl::phase_log_activity_gradient(const PhaseSpecies& p, double* g) const {
  const double* dg = evaluation.d_ln_gamma_d_molality.data();
  const double* dw = evaluation.d_ln_water_activity_d_molality.data();
  for (std::size_t k = 0; k < n; ++k) {
    double d = p.water_coefficient * dw[k];
    for (std::size_t b = 0; b < nb; ++b)
      if (p.stoichiometry[b] != 0.0) d += p.stoichiometry[b] * dg[b * n + k];
    g[k] = d * molality[k] + (k < nb ? p.stoichiometry[k] : 0.0);
  }
}

namespace {

double safe_exp(double x) { return std::exp(std::clamp(x, lowest_log, highest_log)); }

}  // namespace

// Rows, in order of the unknowns (docs/equilibrium.md):
//   secondary solute s:  ln m_s + ln γ_s − Σ_b ν_sb (ln m_b + ln γ_b) − ν_sw ln a_w − ln K_s = 0         (mass action)
//   basis solute b ≠ H+: W Σ_i ν_ib m_i + Σ_p ν_pb n_p + Σ_g ν_gb n_g − T_b − Σ_o ν_ob ξ_o = 0        (mass balance, mol)
//   H+:                  Σ_i z_i m_i = 0                                                            (charge balance)
//   ln W:                W (1/M_w + Σ_i ν_iw m_i) + Σ_p ν_pw n_p + Σ_g ν_gw n_g − T_w − Σ_o ν_ow ξ_o = 0  (water)
//   allowed solid p:     ln Ω_p = ln K_p + Σ_b ν_pb ln a_b + ν_pw ln a_w = 0 if present, n_p = 0 if not (saturation)
//   open gas o:          ln(p_o/p°) of the solution − ln(p_o,fixed/p°) = 0                           (Henry's law)
//   closed-phase gas g:  n_g/N_s − (N/N_s) p_g/P = 0, p_g/p° = K_g Π a                              (y_g P = p_g)
//   phase total N:       1 − Σ_g p_g/P = 0 if the gas phase is present, N = 0 if not               (bubble point)
// Which phases are present is decided outside Newton, by the active-set rule of solve().
void EquilibriumSolver::Impl::residual(const double* x, double* f) {
  evaluate_molalities(x);
  const double* ln_gamma = evaluation.ln_gamma.data();
  const auto& solids = system->solids();
  const auto& open = system->open_gases();
  const auto& phase = system->phase_gases();
  for (std::size_t i = nb; i < n; ++i) {
    if (!active[i]) {
      f[i] = x[i] - inactive_log_molality;
      continue;
    }
    double r = x[i] + ln_gamma[i] - water_coefficient[i] * evaluation.ln_water_activity - ln_k[i];
    for (const Term& t : terms[i]) r -= t.coefficient * (x[t.basis] + ln_gamma[t.basis]);
    f[i] = r;
  }
  // Amounts held outside the solution, per basis solute and for water.
  const auto outside = [&](std::size_t b, bool water) {
    double held = 0.0;
    for (std::size_t a = 0; a < allowed.size(); ++a) {
      const PhaseSpecies& p = solids[allowed[a]];
      held += (water ? p.water_coefficient : p.stoichiometry[b]) * solid_scale[a] * x[solid_offset + a];
    }
    for (std::size_t o = 0; o < open.size(); ++o)
      held -= (water ? open[o].water_coefficient : open[o].stoichiometry[b]) * uptake_scale * x[open_offset + o];
    for (std::size_t g = 0; g < phase.size(); ++g)
      held += (water ? phase[g].water_coefficient : phase[g].stoichiometry[b]) * phase_scale * x[phase_offset + g];
    return held;
  };
  for (std::size_t b = 1; b < nb; ++b) {
    if (!active[b]) {
      f[b] = x[b] - inactive_log_molality;
      continue;
    }
    double amount = 0.0;
    for (std::size_t i = 0; i < n; ++i) amount += stoichiometry[i * nb + b] * molality[i];
    f[b] = water_mass * amount + outside(b, false) - basis_total[b];
  }
  double charge_sum = 0.0, water_bound = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    charge_sum += charge[i] * molality[i];
    water_bound += water_coefficient[i] * molality[i];
  }
  f[0] = charge_sum;
  f[n] = water_mass * (1.0 / constants::water_molar_mass + water_bound) + outside(0, true) - water_total;

  for (std::size_t a = 0; a < allowed.size(); ++a) {
    const std::size_t row = solid_offset + a;
    f[row] = solid_present[a] ? phase_log_activity(solids[allowed[a]], ln_k_solid[allowed[a]]) : x[row];
  }
  for (std::size_t o = 0; o < open.size(); ++o)
    f[open_offset + o] = phase_log_activity(open[o], ln_k_open[o]) - open_log_pressure[o];
  if (!phase.empty()) {
    const double total = x[phase_total_index];
    double pressure_sum = 0.0;  // Σ p_g / P
    for (std::size_t g = 0; g < phase.size(); ++g) {
      const double relative = safe_exp(phase_log_activity(phase[g], ln_k_phase[g])) * constants::standard_atmosphere / pressure;
      f[phase_offset + g] = x[phase_offset + g] - total * relative;
      pressure_sum += relative;
    }
    f[phase_total_index] = gas_phase_present ? 1.0 - pressure_sum : total;
  }
}

// ∂F/∂u, column k: ∂(ln γ_i)/∂u_k = (∂ln γ_i/∂m_k) m_k, and likewise for ln a_w.
void EquilibriumSolver::Impl::jacobian(const double* x, SUNMatrix jm) {
  evaluate_molalities(x);
  double* data = SUNDenseMatrix_Data(jm);  // column-major, size × size; KINSOL zeroes it before each call
  const auto at = [&](std::size_t row, std::size_t column) -> double& { return data[column * size + row]; };
  const double* dg = evaluation.d_ln_gamma_d_molality.data();
  const double* dw = evaluation.d_ln_water_activity_d_molality.data();
  const auto& solids = system->solids();
  const auto& open = system->open_gases();
  const auto& phase = system->phase_gases();
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

  // Columns of the phase amounts in the mass and water balances.
  const auto balance_column = [&](std::size_t column, const PhaseSpecies& p, double scale) {
    for (std::size_t b = 1; b < nb; ++b)
      if (active[b]) at(b, column) = p.stoichiometry[b] * scale;
    at(n, column) = p.water_coefficient * scale;
  };
  for (std::size_t a = 0; a < allowed.size(); ++a) {
    const std::size_t row = solid_offset + a;
    balance_column(row, solids[allowed[a]], solid_scale[a]);
    if (!solid_present[a]) {
      at(row, row) = 1.0;
      continue;
    }
    phase_log_activity_gradient(solids[allowed[a]], gradient.data());
    for (std::size_t k = 0; k < n; ++k) at(row, k) = gradient[k];
  }
  for (std::size_t o = 0; o < open.size(); ++o) {
    const std::size_t row = open_offset + o;
    balance_column(row, open[o], -uptake_scale);
    phase_log_activity_gradient(open[o], gradient.data());
    for (std::size_t k = 0; k < n; ++k) at(row, k) = gradient[k];
  }
  if (!phase.empty()) {
    const double total = x[phase_total_index];
    for (std::size_t g = 0; g < phase.size(); ++g) {
      const std::size_t row = phase_offset + g;
      balance_column(row, phase[g], phase_scale);
      const double relative = safe_exp(phase_log_activity(phase[g], ln_k_phase[g])) * constants::standard_atmosphere / pressure;
      at(row, row) = 1.0;
      at(row, phase_total_index) = -relative;
      phase_log_activity_gradient(phase[g], gradient.data());
      for (std::size_t k = 0; k < n; ++k) {
        at(row, k) = -total * relative * gradient[k];
        at(phase_total_index, k) += relative * gradient[k];  // ∂(Σ p_g/P)/∂u_k
      }
    }
    if (gas_phase_present) {
      for (std::size_t k = 0; k < n; ++k) at(phase_total_index, k) *= -1.0;
    } else {
      for (std::size_t k = 0; k < n; ++k) at(phase_total_index, k) = 0.0;
      at(phase_total_index, phase_total_index) = 1.0;
    }
  }
}

void EquilibriumSolver::Impl::set_totals(std::span<const double> amounts, std::span<const double> open_gas_pressures) {
  const auto& components = system->components();
  if (amounts.size() != components.size())
    throw ThermoError(ErrorKind::bad_input, fmt::format("{} amounts given for {} components", amounts.size(), components.size()));
  const auto& open = system->open_gases();
  if (open_gas_pressures.size() != open.size())
    throw ThermoError(ErrorKind::bad_input,
                      fmt::format("{} partial pressures given for {} open gases", open_gas_pressures.size(), open.size()));
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
  for (std::size_t o = 0; o < open.size(); ++o) {
    if (!std::isfinite(open_gas_pressures[o]) || open_gas_pressures[o] <= 0.0)
      throw ThermoError(ErrorKind::bad_input,
                        fmt::format("the partial pressure of {} is {} Pa; it must be positive", open[o].name, open_gas_pressures[o]));
    open_log_pressure[o] = std::log(open_gas_pressures[o] / constants::standard_atmosphere);
  }
  // H+ is balanced by charge; its tableau total is kept for the cold start.
  proton_total = basis_total[0];
  // A basis species with no total is absent, and so is every solute built from it, unless an open
  // gas supplies it (pure water open to air takes up CO2).
  const auto available = [&](std::size_t b) {
    if (basis_total[b] > 0.0) return true;
    return std::any_of(open.begin(), open.end(), [&](const PhaseSpecies& g) { return g.pivot == b; });
  };
  for (std::size_t i = 0; i < n; ++i) {
    bool present = true;
    for (std::size_t b = 1; b < nb; ++b)
      if (stoichiometry[i * nb + b] != 0.0 && !available(b)) present = false;
    active[i] = present;
  }
  // A solid can form only from present basis species; s_p is the most of it the limiting total allows.
  uptake_scale = water_total * constants::water_molar_mass;
  phase_scale = water_total;
  for (std::size_t b = 1; b < nb; ++b) phase_scale += std::abs(basis_total[b]);
  const auto& solids = system->solids();
  for (std::size_t p = 0; p < solids.size(); ++p) {
    bool possible = true;
    for (std::size_t b = 1; b < nb; ++b)
      if (solids[p].stoichiometry[b] != 0.0 && !available(b)) possible = false;
    solid_active[p] = possible;
  }
  for (std::size_t a = 0; a < allowed.size(); ++a) {
    const PhaseSpecies& p = solids[allowed[a]];
    double limit = 1e300;
    for (std::size_t b = 1; b < nb; ++b)
      if (p.stoichiometry[b] > 0.0 && basis_total[b] > 0.0) limit = std::min(limit, basis_total[b] / p.stoichiometry[b]);
    solid_scale[a] = limit < 1e300 ? limit : uptake_scale;
  }
}

void EquilibriumSolver::Impl::update_log_k(double t, double p) {
  if (t == log_k_temperature) return;
  for (std::size_t i = nb; i < n; ++i) ln_k[i] = constants::ln10 * log_k(system->solutes()[i].log_k, t, p);
  for (std::size_t k = 0; k < ln_k_solid.size(); ++k) ln_k_solid[k] = constants::ln10 * log_k(system->solids()[k].log_k, t, p);
  for (std::size_t k = 0; k < ln_k_open.size(); ++k) ln_k_open[k] = constants::ln10 * log_k(system->open_gases()[k].log_k, t, p);
  for (std::size_t k = 0; k < ln_k_phase.size(); ++k) ln_k_phase[k] = constants::ln10 * log_k(system->phase_gases()[k].log_k, t, p);
  log_k_temperature = t;
}

// The cold start: the ideal problem (then with the previous pass's γ and a_w as conditional
// constants) minimised as a convex function of the basis ln molalities, W from the water total. A
// phase of fixed activity — an open gas (p/p°) or a solid taken as present (activity 1) — fixes one
// basis species, its pivot: the guess swaps the phase into the basis in its place
// (docs/equilibrium.md), which keeps the problem convex, and the phase's amount follows from the
// pivots' mass balances.
void EquilibriumSolver::Impl::ideal_guess(double* x) {
  // Up to three passes: ideal first, then with the activity coefficients and water activity of the
  // previous pass as conditional constants, which brings a concentrated solution's guess close.
  std::fill(guess_ln_gamma.begin(), guess_ln_gamma.end(), 0.0);
  double ln_water_activity = 0.0;
  const int passes = system->options().activity == ActivityModelKind::ideal ? 1 : 3;
  for (int pass = 0; pass < passes; ++pass) {
    guess_pass(x, ln_water_activity);
    if (pass + 1 == passes) break;
    evaluate_molalities(x);
    std::copy(evaluation.ln_gamma.begin(), evaluation.ln_gamma.end(), guess_ln_gamma.begin());
    ln_water_activity = evaluation.ln_water_activity;
  }
}

void EquilibriumSolver::Impl::guess_pass(double* x, double ln_water_activity) {
  const double water_guess = water_total * constants::water_molar_mass;
  std::copy(stoichiometry.begin(), stoichiometry.end(), guess_stoichiometry.begin());
  // Conditional constants: ln m_i = ln K'_i + Σ_b ν_ib ln m_b with the γ and a_w of the last pass.
  for (std::size_t i = 0; i < n; ++i) {
    double k = ln_k[i];
    if (i >= nb) {
      k += water_coefficient[i] * ln_water_activity - guess_ln_gamma[i];
      for (const Term& t : terms[i]) k += t.coefficient * guess_ln_gamma[t.basis];
    }
    conditional_ln_k[i] = k;
  }
  std::copy(conditional_ln_k.begin(), conditional_ln_k.end(), guess_ln_k.begin());
  std::copy(active.begin(), active.end(), guess_active.begin());
  for (std::size_t b = 0; b < nb; ++b) guess_totals[b] = (b == 0 ? proton_total : basis_total[b]) / water_guess;

  // The fixed phases: open gases first (their pivots are chosen by the system), then present solids.
  const auto& open = system->open_gases();
  const auto& solids = system->solids();
  struct Fixed {
    const PhaseSpecies* phase;
    std::size_t pivot, unknown;
    double constant, scale;  // ln activity − ln K; amount = scale · x[unknown] is held out of solution
  };
  std::vector<Fixed> fixed;
  // ln activity − ln K − Σ_b ν_b ln γ_b − ν_w ln a_w: the phase's condition on the basis molalities.
  const auto condition = [&](const PhaseSpecies& p, double ln_activity, double ln_k_phase) {
    double c = ln_activity - ln_k_phase - p.water_coefficient * ln_water_activity;
    for (std::size_t b = 0; b < nb; ++b) c -= p.stoichiometry[b] * guess_ln_gamma[b];
    return c;
  };
  for (std::size_t o = 0; o < open.size(); ++o)
    fixed.push_back({&open[o], open[o].pivot, open_offset + o, condition(open[o], open_log_pressure[o], ln_k_open[o]),
                     -uptake_scale});
  for (std::size_t a = 0; a < allowed.size(); ++a)
    if (solid_present[a])
      fixed.push_back({&solids[allowed[a]], nb, solid_offset + a, condition(solids[allowed[a]], 0.0, ln_k_solid[allowed[a]]),
                       solid_scale[a]});

  // row[f]: phase f's stoichiometry in the current (swapped) basis. Each phase takes as pivot a basis
  // species still in its swapped row (an open gas its own pivot where it can, H+ only as the last
  // resort); a phase whose swapped row has none left (anhydrite after gypsum: only water remains)
  // is left for Newton to place.
  std::vector<std::vector<double>> row(fixed.size());
  std::vector<char> pivot_taken(nb, 0);
  std::vector<Fixed> swapped;
  std::vector<std::vector<double>> swapped_row;
  for (std::size_t f = 0; f < fixed.size(); ++f) row[f] = fixed[f].phase->stoichiometry;
  for (std::size_t f = 0; f < fixed.size(); ++f) {
    constexpr double negligible = 1e-12;
    std::size_t pivot = nb;
    if (fixed[f].pivot < nb && std::abs(row[f][fixed[f].pivot]) > negligible && !pivot_taken[fixed[f].pivot])
      pivot = fixed[f].pivot;
    for (std::size_t b = 1; b < nb && pivot == nb; ++b)
      if (std::abs(row[f][b]) > negligible && !pivot_taken[b] && active[b]) pivot = b;
    if (pivot == nb && std::abs(row[f][0]) > negligible && !pivot_taken[0]) pivot = 0;
    if (pivot == nb) continue;
    pivot_taken[pivot] = 1;
    fixed[f].pivot = pivot;
    const double nu_pivot = row[f][pivot];
    // x_pivot = (constant − Σ_{b≠pivot} ν_fb x_b) / ν_f,pivot; substitute into every solute and later phase.
    for (std::size_t i = 0; i < n; ++i) {
      const double nu = guess_stoichiometry[i * nb + pivot];
      if (nu == 0.0) continue;
      for (std::size_t b = 0; b < nb; ++b)
        if (b != pivot) guess_stoichiometry[i * nb + b] -= nu * row[f][b] / nu_pivot;
      guess_ln_k[i] += nu * fixed[f].constant / nu_pivot;
      guess_stoichiometry[i * nb + pivot] = 0.0;
    }
    for (std::size_t later = f + 1; later < fixed.size(); ++later) {
      const double nu = row[later][pivot];
      if (nu == 0.0) continue;
      for (std::size_t b = 0; b < nb; ++b)
        if (b != pivot) row[later][b] -= nu * row[f][b] / nu_pivot;
      fixed[later].constant -= nu * fixed[f].constant / nu_pivot;
      row[later][pivot] = 0.0;
    }
    for (std::size_t b = 0; b < nb; ++b)
      if (b != pivot) guess_totals[b] -= row[f][b] / nu_pivot * guess_totals[pivot];
    guess_active[pivot] = 0;  // not swept: it follows from the phase
    swapped.push_back(fixed[f]);
    swapped_row.push_back(row[f]);
  }
  for (std::size_t b = 0; b < nb; ++b)
    guess_x[b] = !active[b] ? inactive_log_molality : b == 0 ? std::log(1e-7) : std::log(std::max(std::abs(guess_totals[b]), 1e-7));
  // Swapped-out and absent basis species are not variables, but solutes built from them stay in.
  detail::GuessProblem problem{n, nb, guess_stoichiometry, guess_ln_k, std::span<const char>(guess_active.data(), n),
                               guess_totals, std::span<const char>(active.data(), n)};
  detail::minimise_ideal_dual(problem, guess_x, 100);
  // Back-substitute the pivots, last swap first.
  for (std::size_t f = swapped.size(); f-- > 0;) {
    const std::size_t pivot = swapped[f].pivot;
    double value = swapped[f].constant;
    for (std::size_t b = 0; b < nb; ++b)
      if (b != pivot) value -= swapped_row[f][b] * guess_x[b];
    guess_x[pivot] = value / swapped_row[f][pivot];
  }
  for (std::size_t b = 0; b < nb; ++b) x[b] = active[b] ? std::clamp(guess_x[b], lowest_log, highest_log) : inactive_log_molality;
  for (std::size_t i = nb; i < n; ++i) {
    if (!active[i]) {
      x[i] = inactive_log_molality;
      continue;
    }
    double exponent = conditional_ln_k[i];
    for (std::size_t b = 0; b < nb; ++b) exponent += stoichiometry[i * nb + b] * x[b];
    x[i] = std::clamp(exponent, lowest_log, highest_log);
  }
  x[n] = std::log(water_guess);
  std::fill(x + solid_offset, x + size, 0.0);
  if (swapped.empty()) return;

  // Amounts held in the swapped phases: the pivots' mass balances, Σ_f ν_f,q h_f = T_q − D_q.
  const auto& fixed_phases = swapped;
  Eigen::MatrixXd balance(fixed_phases.size(), fixed_phases.size());
  Eigen::VectorXd missing(fixed_phases.size());
  for (std::size_t q = 0; q < fixed_phases.size(); ++q) {
    const std::size_t pivot = fixed_phases[q].pivot;
    double dissolved = 0.0;
    for (std::size_t i = 0; i < n; ++i)
      if (active[i]) dissolved += stoichiometry[i * nb + pivot] * std::exp(x[i]) * water_guess;
    missing[static_cast<Eigen::Index>(q)] = (pivot == 0 ? proton_total : basis_total[pivot]) - dissolved;
    for (std::size_t f = 0; f < fixed_phases.size(); ++f)
      balance(static_cast<Eigen::Index>(q), static_cast<Eigen::Index>(f)) = fixed_phases[f].phase->stoichiometry[pivot];
  }
  const Eigen::VectorXd held = balance.fullPivLu().solve(missing);
  for (std::size_t f = 0; f < fixed_phases.size(); ++f)
    if (std::isfinite(held[static_cast<Eigen::Index>(f)]))
      x[fixed_phases[f].unknown] = held[static_cast<Eigen::Index>(f)] / fixed_phases[f].scale;
}

// Newton with KINSOL's line search first; where the line search stalls, full Newton steps from
// the same start. The line search measures progress by the scaled residual norm, and in an
// unbuffered solution the pH direction is so much weaker than the mass balances of trace species
// that a step which solves the charge balance first raises the norm and is refused, iteration after
// iteration, although Newton itself converges (docs/equilibrium.md, "Globalisation").
int EquilibriumSolver::Impl::run_newton() {
  double* x = N_VGetArrayPointer(u);
  std::copy(x, x + size, newton_start.begin());
  int flag = run_kinsol(KIN_LINESEARCH);
  if (accepted(flag)) return flag;
  std::copy(newton_start.begin(), newton_start.end(), x);
  return run_kinsol(KIN_NONE);
}

int EquilibriumSolver::Impl::run_kinsol(int strategy) {
  // Scale each residual by its natural size, so the tolerance is relative for every balance.
  double* x = N_VGetArrayPointer(u);
  double* scale = N_VGetArrayPointer(f_scale);
  evaluate_molalities(x);
  double charge_scale = 0.0;
  for (std::size_t i = 0; i < n; ++i) charge_scale += 0.5 * std::abs(charge[i]) * molality[i];
  for (std::size_t i = 0; i < size; ++i) scale[i] = 1.0;
  scale[0] = 1.0 / std::max(charge_scale, 1e-300);
  // A mass balance is relative to the larger of its total and what the solution holds now: an open
  // gas brings in what the inputs never had (carbonate into water open to air).
  for (std::size_t b = 1; b < nb; ++b) {
    if (!active[b]) continue;
    double dissolved = 0.0;
    for (std::size_t i = 0; i < n; ++i) dissolved += stoichiometry[i * nb + b] * molality[i] * water_mass;
    const double natural = std::max(basis_total[b], dissolved);
    scale[b] = 1.0 / (natural > 0.0 ? natural : uptake_scale);
  }
  scale[n] = 1.0 / water_total;
  // Solve, then check the flag.
  return KINSol(kinsol, u, strategy, u_scale, f_scale);
}

// KINSOL's success, or a step-size stop whose residual is close enough to the tolerance.
bool EquilibriumSolver::Impl::accepted(int flag) {
  if (flag < 0) return false;
  return flag != KIN_STEP_LT_STPTOL || scaled_residual_norm() <= 100.0 * options.tolerance;
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
  for (std::size_t a = 0; a < allowed.size(); ++a)
    report.push_back({"saturation " + system->solids()[allowed[a]].name, f[solid_offset + a]});
  for (std::size_t o = 0; o < system->open_gases().size(); ++o)
    report.push_back({"partial pressure " + system->open_gases()[o].name, f[open_offset + o]});
  for (std::size_t g = 0; g < system->phase_gases().size(); ++g)
    report.push_back({"gas phase " + system->phase_gases()[g].name, f[phase_offset + g]});
  if (!system->phase_gases().empty()) report.push_back({"gas phase total", f[phase_total_index]});
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

  const auto& solids = system->solids();
  out.solid_amount.assign(solids.size(), 0.0);
  out.saturation_index.resize(solids.size());
  for (std::size_t p = 0; p < solids.size(); ++p) {
    const bool in_range = temperature >= solids[p].minimum_temperature && temperature <= solids[p].maximum_temperature;
    out.saturation_index[p] = solid_active[p] && in_range ? phase_log_activity(solids[p], ln_k_solid[p]) / constants::ln10
                                                          : std::numeric_limits<double>::quiet_NaN();
  }
  for (std::size_t a = 0; a < allowed.size(); ++a)
    if (solid_present[a]) out.solid_amount[allowed[a]] = solid_scale[a] * x[solid_offset + a];
  const auto& open = system->open_gases();
  out.gas_uptake.resize(open.size());
  for (std::size_t o = 0; o < open.size(); ++o) out.gas_uptake[o] = uptake_scale * x[open_offset + o];
  const auto& phase = system->phase_gases();
  out.gas_amount.assign(phase.size(), 0.0);
  out.partial_pressure.resize(phase.size());
  out.gas_phase_present = gas_phase_present;
  out.gas_phase_amount = gas_phase_present ? phase_scale * x[phase_total_index] : 0.0;
  for (std::size_t g = 0; g < phase.size(); ++g) {
    out.partial_pressure[g] = safe_exp(phase_log_activity(phase[g], ln_k_phase[g])) * constants::standard_atmosphere;
    if (out.gas_phase_present) out.gas_amount[g] = phase_scale * x[phase_offset + g];
  }

  long iterations = 0;
  KINGetNumNonlinSolvIters(kinsol, &iterations);
  out.iterations = iterations;
  out.residual_norm = scaled_residual_norm();
  out.warm_started = warm;
  out.activity_model_limit = activity->maximum_ionic_strength();
  out.activity_model_name = activity->name().data();
  out.warnings = out.ionic_strength > out.activity_model_limit ? ionic_strength_beyond_model : 0u;
}

// The active-set rule for phases (docs/equilibrium.md): solve with the present phases saturated and
// the others absent; if a present phase came out with a negative amount, remove the most negative;
// otherwise, if an absent phase is supersaturated, add the most supersaturated; otherwise done. A
// set seen before in the same solve is a cycle and an error, so the sets never oscillate.
bool EquilibriumSolver::Impl::settle_phases() {
  constexpr double supersaturation_to_add = 1e-10;  // log10 units, well inside the 1e-8 of the tests
  const std::size_t width = allowed.size() + 1;
  const auto& solids = system->solids();
  tried_sets.clear();
  std::ptrdiff_t last_added = -1;
  for (std::size_t round = 0; round < maximum_rounds; ++round) {
    const std::size_t rows = tried_sets.size() / width;
    for (std::size_t r = 0; r < rows; ++r) {
      const bool same = std::equal(solid_present.begin(), solid_present.end(), tried_sets.begin() + static_cast<std::ptrdiff_t>(r * width)) &&
                        tried_sets[r * width + allowed.size()] == static_cast<char>(gas_phase_present);
      if (same) {
        std::string phases;
        for (std::size_t a = 0; a < allowed.size(); ++a)
          if (solid_present[a]) phases += (phases.empty() ? "" : ", ") + solids[allowed[a]].name;
        if (gas_phase_present) phases += phases.empty() ? "gas phase" : ", gas phase";
        throw ConvergenceError(fmt::format("the set of phases present cycles back to {{{}}}; no consistent set was found",
                                           phases),
                               residual_report(), 0);
      }
    }
    tried_sets.insert(tried_sets.end(), solid_present.begin(), solid_present.end());
    tried_sets.push_back(static_cast<char>(gas_phase_present));

    if (!solve_current_set()) {
      // A solid just added that cannot coexist with the present ones (gypsum and anhydrite are
      // both saturated only at one water activity) replaces the present solid it shares a basis
      // species with; without such a rival the failure stands.
      if (last_added < 0 || !replace_rival(static_cast<std::size_t>(last_added))) return false;
      tried_sets.insert(tried_sets.end(), solid_present.begin(), solid_present.end());
      tried_sets.push_back(static_cast<char>(gas_phase_present));
    }
    last_added = -1;
    const double* x = N_VGetArrayPointer(u);
    evaluate_molalities(x);

    // Remove the present phase with the most negative (scaled) amount.
    double most_negative = 0.0;
    std::ptrdiff_t remove = -1;  // allowed-solid index, or allowed.size() for the gas phase
    for (std::size_t a = 0; a < allowed.size(); ++a)
      if (solid_present[a] && x[solid_offset + a] < most_negative) {
        most_negative = x[solid_offset + a];
        remove = static_cast<std::ptrdiff_t>(a);
      }
    if (gas_phase_present && x[phase_total_index] < most_negative) remove = static_cast<std::ptrdiff_t>(allowed.size());
    if (remove >= 0) {
      if (static_cast<std::size_t>(remove) == allowed.size()) {
        gas_phase_present = false;
      } else {
        solid_present[static_cast<std::size_t>(remove)] = 0;
      }
      continue;
    }
    // Add the absent phase that is most supersaturated.
    double most_supersaturated = supersaturation_to_add;
    std::ptrdiff_t add = -1;
    for (std::size_t a = 0; a < allowed.size(); ++a) {
      if (solid_present[a] || !solid_active[allowed[a]]) continue;
      const double si = phase_log_activity(solids[allowed[a]], ln_k_solid[allowed[a]]) / constants::ln10;
      if (si > most_supersaturated) {
        most_supersaturated = si;
        add = static_cast<std::ptrdiff_t>(a);
      }
    }
    if (!gas_phase_present && !system->phase_gases().empty()) {
      double pressure_sum = 0.0;
      for (std::size_t g = 0; g < system->phase_gases().size(); ++g)
        pressure_sum += safe_exp(phase_log_activity(system->phase_gases()[g], ln_k_phase[g])) *
                        constants::standard_atmosphere / pressure;
      if (std::log10(pressure_sum) > most_supersaturated) add = static_cast<std::ptrdiff_t>(allowed.size());
    }
    if (add < 0) return true;
    if (static_cast<std::size_t>(add) == allowed.size()) {
      gas_phase_present = true;
    } else {
      std::copy(N_VGetArrayPointer(u), N_VGetArrayPointer(u) + size, before_addition.begin());
      solid_present[static_cast<std::size_t>(add)] = 1;
      last_added = add;
      predict_precipitation(static_cast<std::size_t>(add));
    }
  }
  throw ConvergenceError(fmt::format("the set of phases present did not settle in {} rounds", maximum_rounds),
                         residual_report(), 0);
}

// Tries the set with `added` in place of each present solid that shares a basis species with it,
// from the state before `added` came in; keeps the first that solves.
bool EquilibriumSolver::Impl::replace_rival(std::size_t added) {
  const auto& solids = system->solids();
  const PhaseSpecies& newcomer = solids[allowed[added]];
  for (std::size_t rival = 0; rival < allowed.size(); ++rival) {
    if (rival == added || !solid_present[rival]) continue;
    bool shares = false;
    for (std::size_t b = 1; b < nb; ++b)
      shares = shares || (newcomer.stoichiometry[b] != 0.0 && solids[allowed[rival]].stoichiometry[b] != 0.0);
    if (!shares) continue;
    solid_present[rival] = 0;
    double* x = N_VGetArrayPointer(u);
    std::copy(before_addition.begin(), before_addition.end(), x);
    x[solid_offset + rival] = 0.0;
    predict_precipitation(added);
    if (solve_current_set()) return true;
    solid_present[rival] = 1;
  }
  return false;
}

// Newton for the current set from where the previous set left off; if that fails, Newton again
// from the ideal guess made for this set.
bool EquilibriumSolver::Impl::solve_current_set() {
  last_flag = run_newton();
  if (accepted(last_flag)) return true;
  ideal_guess(N_VGetArrayPointer(u));
  last_flag = run_newton();
  return accepted(last_flag);
}

// Before Newton meets a newly added solid, precipitate the amount ξ that saturates it if the
// solution's speciation stayed in proportion: ln Ω(ξ) = ln Ω(0) + Σ_b ν_pb ln(1 − ν_pb ξ / S_b) = 0
// over the basis species the solid takes (S_b: what the solution holds). ln Ω falls monotonically in
// ξ, so TOMS 748 brackets the root; Newton then corrects what the proportional guess missed. From a
// state many decades supersaturated, this is the difference between a few Newton steps and none.
void EquilibriumSolver::Impl::predict_precipitation(std::size_t a) {
  double* x = N_VGetArrayPointer(u);
  evaluate_molalities(x);
  const PhaseSpecies& p = system->solids()[allowed[a]];
  const double ln_omega = phase_log_activity(p, ln_k_solid[allowed[a]]);
  // What the solution holds of each basis species the solid takes, and the most ξ can be.
  double ceiling = 1e300;
  for (std::size_t b = 1; b < nb; ++b) {
    guess_totals[b] = 0.0;
    if (p.stoichiometry[b] <= 0.0) continue;
    for (std::size_t i = 0; i < n; ++i) guess_totals[b] += stoichiometry[i * nb + b] * molality[i] * water_mass;
    ceiling = std::min(ceiling, guess_totals[b] / p.stoichiometry[b]);
  }
  if (!(ln_omega > 0.0) || !(ceiling > 0.0) || ceiling >= 1e300) return;
  const auto saturation = [&](double xi) {
    double value = ln_omega;
    for (std::size_t b = 1; b < nb; ++b)
      if (p.stoichiometry[b] > 0.0) value += p.stoichiometry[b] * std::log1p(-p.stoichiometry[b] * xi / guess_totals[b]);
    return value;
  };
  const double high = ceiling * (1.0 - 1e-15);
  const double at_high = saturation(high);
  if (!(at_high < 0.0)) return;
  std::uintmax_t iterations = 60;
  const auto [low_end, high_end] = boost::math::tools::toms748_solve(
      saturation, 0.0, high, ln_omega, at_high, boost::math::tools::eps_tolerance<double>(30), iterations);
  const double xi = 0.5 * (low_end + high_end);
  // Scale the basis species, and every solute built from them, by the fraction left in solution.
  shift_by_basis[0] = 0.0;  // H+ is left to Newton
  for (std::size_t b = 1; b < nb; ++b)
    shift_by_basis[b] = p.stoichiometry[b] > 0.0 ? std::log1p(-p.stoichiometry[b] * xi / guess_totals[b]) : 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    if (!active[i]) continue;
    double shift = 0.0;
    for (const Term& t : terms[i]) shift += t.coefficient * shift_by_basis[t.basis];
    x[i] += shift;
  }
  x[solid_offset + a] = xi / solid_scale[a];
}

void EquilibriumSolver::Impl::solve(double t, double p, std::span<const double> amounts,
                                    std::span<const double> open_gas_pressures, Speciation& out) {
  if (!std::isfinite(t) || t < system->minimum_temperature() || t > system->maximum_temperature())
    throw ThermoError(ErrorKind::out_of_range,
                      fmt::format("temperature {:.2f} K ({:.2f} °C) is outside the species data's range {:.2f}–{:.2f} K",
                                  t, t - 273.15, system->minimum_temperature(), system->maximum_temperature()));
  if (!std::isfinite(p) || p <= 0.0)
    throw ThermoError(ErrorKind::bad_input, fmt::format("pressure {} Pa is not a positive number", p));
  temperature = t;
  pressure = p;
  evaluation_valid = false;  // γ and a_w depend on T and on which solutes are present
  set_totals(amounts, open_gas_pressures);
  update_log_k(t, p);

  double* x = N_VGetArrayPointer(u);
  const bool warm = has_previous && previous_active == active;
  const auto start_cold = [&] {
    std::fill(solid_present.begin(), solid_present.end(), 0);
    gas_phase_present = false;
    ideal_guess(x);
  };
  if (warm) {
    std::copy(previous_u.begin(), previous_u.end(), x);
    solid_present = previous_solid_present;
    gas_phase_present = previous_gas_phase_present;
  } else {
    start_cold();
  }
  bool converged = settle_phases();
  bool used_warm = warm;
  if (!converged && warm) {  // a poor warm start is retried cold before giving up
    start_cold();
    converged = settle_phases();
    used_warm = false;
  }
  if (!converged) {
    has_previous = false;
    long iterations = 0;
    KINGetNumNonlinSolvIters(kinsol, &iterations);
    throw ConvergenceError(
        fmt::format("speciation did not converge at {:.2f} K (KINSOL {}: {}); scaled residual max-norm {:.3g}",
                    t, flag_name(last_flag), kinsol_message, scaled_residual_norm()),
        residual_report(), iterations);
  }
  std::copy(x, x + size, previous_u.begin());
  previous_active = active;
  previous_solid_present = solid_present;
  previous_gas_phase_present = gas_phase_present;
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
  impl_->solve(temperature, pressure, amounts, {}, out);
}

void EquilibriumSolver::solve(double temperature, double pressure, std::span<const double> amounts,
                              std::span<const double> open_gas_pressures, Speciation& out) {
  impl_->solve(temperature, pressure, amounts, open_gas_pressures, out);
}

Speciation EquilibriumSolver::solve(double temperature, double pressure, std::span<const double> amounts) {
  Speciation out;
  solve(temperature, pressure, amounts, out);
  return out;
}

void EquilibriumSolver::reset_warm_start() noexcept { impl_->has_previous = false; }

const ChemicalSystem& EquilibriumSolver::system() const noexcept { return *impl_->system; }

}  // namespace protonflow::thermo
