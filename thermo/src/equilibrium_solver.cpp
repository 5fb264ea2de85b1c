// Aqueous speciation with KINSOL (Newton with line search, dense direct linear solver, analytic
// Jacobian). Unknowns u = (ln m_1 … ln m_n, ln W); equations and references in docs/equilibrium.md.
#include "protonflow/thermo/equilibrium_solver.hpp"

#include <cstdlib>
#include <limits>

#include "dense_linear_solver.hpp"
#include "equilibrium_solver_impl.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"

namespace protonflow::thermo {

using detail::inactive_log_molality;
using detail::safe_exp;


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
      basis_available(chemical_system.basis_count(), 2),
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
      basis_amount(nb),
      previous_basis_total(nb),
      ln_basis_activity(nb),
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
  factored_solid_present.assign(allowed.size(), 0);
  maximum_rounds = 4 * (allowed.size() + 1) + 8;
  tried_sets.reserve(maximum_rounds * (allowed.size() + 2));
  previous_u.assign(size, 0.0);
  newton_start.assign(size, 0.0);
  before_addition.assign(size, 0.0);
  evaluated_at.assign(size, 0.0);
  latest_residual.assign(size, 0.0);
  latest_residual_at.assign(size, std::numeric_limits<double>::quiet_NaN());
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
    properties.name.push_back(s.name);
  }
  activity = make_activity_model(chemical_system.options().activity, std::move(properties));

  // KINSOL set-up, once per solver: context, vectors, dense matrix and linear solver, options.
  // The reduced form gives KINSOL its own, shorter vectors; u, f_scale and f_work stay full-size.
  const bool reduced = options.form == NewtonForm::reduced;
  reduced_size = size - (n - nb);
  if (reduced) {
    full_x.assign(size, 0.0);
    full_f.assign(size, 0.0);
    full_jacobian.assign(size * size, 0.0);
    secondary_matrix.assign((n - nb) * (n - nb), 0.0);
    secondary_step.assign(n - nb, 0.0);
    secondary_pivot.assign(n - nb, 0);
    schur = std::make_unique<detail::SchurComplement>(size, nb, n);
  }
  check_flag(SUNContext_Create(nullptr, &context), "SUNContext_Create");
  const auto length = static_cast<sunindextype>(size);
  u = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  u_scale = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  f_scale = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  f_work = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  newton_step = check_created(N_VNew_Serial(length, context), "N_VNew_Serial");
  N_VConst(1.0, u);
  N_VConst(1.0, u_scale);  // ln m and ln W are already well scaled
  const auto newton_length = static_cast<sunindextype>(reduced ? reduced_size : size);
  if (reduced) {
    reduced_u = check_created(N_VNew_Serial(newton_length, context), "N_VNew_Serial");
    reduced_u_scale = check_created(N_VNew_Serial(newton_length, context), "N_VNew_Serial");
    reduced_f_scale = check_created(N_VNew_Serial(newton_length, context), "N_VNew_Serial");
    N_VConst(1.0, reduced_u);
    N_VConst(1.0, reduced_u_scale);
  }
  kinsol = check_created(KINCreate(context), "KINCreate");
  check_flag(KINInit(kinsol, reduced ? reduced_residual_callback : residual_callback, reduced ? reduced_u : u), "KINInit");
  check_flag(KINSetUserData(kinsol, this), "KINSetUserData");
  check_flag(KINSetErrHandlerFn(kinsol, error_callback, this), "KINSetErrHandlerFn");
  check_flag(KINSetFuncNormTol(kinsol, options.tolerance), "KINSetFuncNormTol");
  check_flag(KINSetScaledStepTol(kinsol, 1e-15), "KINSetScaledStepTol");
  check_flag(KINSetNumMaxIters(kinsol, options.max_iterations), "KINSetNumMaxIters");
  // KINSOL asks for a Jacobian every step; the callback keeps the LU it holds where a chord step serves.
  check_flag(KINSetMaxSetupCalls(kinsol, 1), "KINSetMaxSetupCalls");
  check_flag(KINSetMaxNewtonStep(kinsol, 20.0 * std::sqrt(static_cast<double>(size))), "KINSetMaxNewtonStep");
  jacobian_matrix = check_created(detail::make_dense_jacobian(context, newton_length), "make_dense_jacobian");
  linear_solver = options.form == NewtonForm::full_by_schur
                      ? check_created(detail::make_schur_lu_solver(context, length, nb, n), "make_schur_lu_solver")
                      : check_created(detail::make_dense_lu_solver(context, newton_length), "make_dense_lu_solver");
  check_flag(KINSetLinearSolver(kinsol, linear_solver, jacobian_matrix), "KINSetLinearSolver");
  check_flag(KINSetJacFn(kinsol, reduced ? reduced_jacobian_callback : jacobian_callback), "KINSetJacFn");
}

EquilibriumSolver::Impl::~Impl() {
  // KINSOL clean-up, in reverse order of creation.
  KINFree(&kinsol);
  SUNLinSolFree(linear_solver);
  SUNMatDestroy(jacobian_matrix);
  if (reduced_u) {
    N_VDestroy(reduced_f_scale);
    N_VDestroy(reduced_u_scale);
    N_VDestroy(reduced_u);
  }
  N_VDestroy(newton_step);
  N_VDestroy(f_work);
  N_VDestroy(f_scale);
  N_VDestroy(u_scale);
  N_VDestroy(u);
  SUNContext_Free(&context);
}

// Newton with KINSOL's line search first; where the line search stalls, full Newton steps from
// the same start. The line search measures progress by the scaled residual norm, and in an
// unbuffered solution the pH direction is so much weaker than the mass balances of trace species
// that a step which solves the charge balance first raises the norm and is refused, iteration after
// iteration, although Newton itself converges (docs/equilibrium.md, "Globalisation").
int EquilibriumSolver::Impl::run_newton() {
  double* x = N_VGetArrayPointer(u);
  std::copy(x, x + size, newton_start.begin());
  // A warm start of the same phase set is within a step or two of its answer, where the line
  // search only accepts full steps at the price of its norms: take full steps, a few at most, and
  // fall back to the line search from the same start if they do not converge.
  if (reuse_factorization) {
    constexpr long full_steps_of_a_warm_start = 8;
    const int flag = full_newton_steps(full_steps_of_a_warm_start);
    if (accepted(flag)) return flag;
    std::copy(newton_start.begin(), newton_start.end(), x);
  }
  int flag = run_kinsol(KIN_LINESEARCH);
  if (accepted(flag)) return flag;
  std::copy(newton_start.begin(), newton_start.end(), x);
  return run_kinsol(KIN_NONE);
}

// A warm start whose totals moved by more than a factor e from what the previous answer holds:
// Newton in ln m meets a mass balance W Σ ν m = T from a start far above it one unit of ln m per
// step (m e^{-1 + T/(W m)}), so a trace total that falls ten decades between two solves took some
// twenty-five steps. Each such basis species, and every solute and gas built from it, is scaled by
// T_b / held_b first, as the cold start's proportions would have it: exact for a trace, which moves
// nothing else, and a start Newton corrects for a major total (docs/equilibrium.md, "Warm start").
// A basis species a present solid or an open gas fixes keeps its start.
void EquilibriumSolver::Impl::rescale_warm_start(double* x) {
  constexpr double largest_unscaled_ratio = 2.718281828459045;  // e: one unit of ln m
  // Most warm starts move no total far: where every total is within a factor 2 of the previous
  // answer's, that answer, whose balances closed to the tolerance, holds each within a factor e,
  // and nothing is scaled. Only a total that moved further is weighed against what the start holds.
  constexpr double largest_unweighed_ratio = 2.0;
  bool moved = false;
  for (std::size_t b = 1; b < nb; ++b) {
    const double now = basis_total[b], before = previous_basis_total[b];
    moved = moved || (now > 0.0 && !(now <= largest_unweighed_ratio * before && largest_unweighed_ratio * now >= before));
  }
  if (!moved) return;
  const auto& solids = system->solids();
  const auto& open = system->open_gases();
  const auto& phase = system->phase_gases();
  // What the start holds of each basis species, from the molalities last evaluated where they are
  // those of the start (the previous answer, evaluated for its results).
  if (!std::equal(x, x + size, evaluated_at.begin())) {
    for (std::size_t i = 0; i < n; ++i) molality[i] = active[i] ? std::exp(std::clamp(x[i], detail::lowest_log, detail::highest_log)) : 0.0;
    basis_amount_current = false;
    water_mass = std::exp(std::clamp(x[n], detail::lowest_log, detail::highest_log));
    std::copy(x, x + size, evaluated_at.begin());  // the molalities held are of x; γ is not evaluated
    evaluation_valid = false;
  }
  const double* held = basis_amounts();
  bool any = false;
  for (std::size_t b = 1; b < nb; ++b) {
    shift_by_basis[b] = 0.0;
    double in_solution = held[b] * water_mass;
    if (gas_phase_present)
      for (std::size_t g = 0; g < phase.size(); ++g) in_solution += phase[g].stoichiometry[b] * phase_scale * x[phase_offset + g];
    if (!active[b] || !(basis_total[b] > 0.0) || !(in_solution > 0.0)) continue;
    const double ratio = basis_total[b] / in_solution;
    if (ratio <= largest_unscaled_ratio && ratio * largest_unscaled_ratio >= 1.0) continue;
    bool fixed = false;  // by an open gas or a present solid
    for (const PhaseSpecies& gas : open) fixed = fixed || gas.stoichiometry[b] != 0.0;
    for (std::size_t a = 0; a < allowed.size(); ++a)
      fixed = fixed || (solid_present[a] && solids[allowed[a]].stoichiometry[b] != 0.0);
    if (fixed) continue;
    shift_by_basis[b] = std::log(ratio);
    any = true;
  }
  if (!any) return;
  shift_by_basis[0] = 0.0;  // H^+ follows the charge balance
  for (std::size_t i = 0; i < n; ++i) {
    if (!active[i]) continue;
    double shift = 0.0;
    for (const Term& t : terms[i]) shift += t.coefficient * shift_by_basis[t.basis];
    x[i] = std::clamp(x[i] + shift, detail::lowest_log, detail::highest_log);
  }
  if (gas_phase_present) {
    for (std::size_t g = 0; g < phase.size(); ++g) {
      double shift = 0.0;
      for (std::size_t b = 1; b < nb; ++b) shift += phase[g].stoichiometry[b] * shift_by_basis[b];
      x[phase_offset + g] *= std::exp(std::clamp(shift, detail::lowest_log, detail::highest_log));
    }
  }
  reuse_factorization = false;  // the kept LU is the Jacobian at the unscaled start
}

// Scale each residual by its natural size, so the tolerance is relative for every balance.
void EquilibriumSolver::Impl::set_residual_scales(const double* x, double* scale) {
  evaluate_molalities(x);
  double charge_scale = 0.0;
  for (std::size_t i = 0; i < n; ++i) charge_scale += 0.5 * std::abs(charge[i]) * molality[i];
  for (std::size_t i = 0; i < size; ++i) scale[i] = 1.0;
  scale[0] = 1.0 / std::max(charge_scale, 1e-300);
  // A mass balance is relative to the larger of its total and what the solution holds now: an open
  // gas brings in what the inputs never had (carbonate into water open to air).
  const double* amount = basis_amounts();
  for (std::size_t b = 1; b < nb; ++b) {
    if (!active[b]) continue;
    const double dissolved = amount[b] * water_mass;
    const double natural = std::max(basis_total[b], dissolved);
    scale[b] = 1.0 / (natural > 0.0 ? natural : uptake_scale);
  }
  scale[n] = 1.0 / water_total;
  scale_mass_action_rows(x, scale);
}

// Full Newton steps without KINSOL, for the warm start: the same steps as KINSOL's KIN_NONE strategy
// (the same residual, Jacobian callback, linear solver, step cap, and its stopping tests in its
// order), without its per-call set-up and per-step vector work, which in a warm solve of 3 steps on
// 16 unknowns cost about a quarter of the call (docs/performance.md, "KINSOL's overhead").
int EquilibriumSolver::Impl::full_newton_steps(long most_steps) {
  // The reduced form steps in its own unknowns y (the full form's outside the mass-action block).
  const bool reduced = options.form == NewtonForm::reduced;
  double* x = N_VGetArrayPointer(u);
  set_residual_scales(x, N_VGetArrayPointer(f_scale));
  factored_this_call = false;
  chord_steps = 0;
  N_Vector unknowns = reduced ? reduced_u : u;
  const std::size_t length = reduced ? reduced_size : size;
  double* y = N_VGetArrayPointer(unknowns);
  double* f = N_VGetArrayPointer(f_work);
  double* step = N_VGetArrayPointer(newton_step);
  const double* scale = N_VGetArrayPointer(reduced ? reduced_f_scale : f_scale);
  if (reduced) {
    std::copy(x, x + size, full_x.begin());
    double* y_scale = N_VGetArrayPointer(reduced_f_scale);
    for (std::size_t r = 0; r < reduced_size; ++r) {
      y[r] = x[full_index(r)];
      y_scale[r] = N_VGetArrayPointer(f_scale)[full_index(r)];
    }
  }
  const double longest_step = 20.0 * std::sqrt(static_cast<double>(size));  // as KINSetMaxNewtonStep
  const auto residual_at = [&]() {
    if (reduced) return reduced_residual(y, f);
    residual(y, f);
    return true;
  };
  const auto scaled_norm = [&]() {  // KINSOL's scaled max-norm of F; a NaN or infinity passes no test
    double norm = 0.0;
    for (std::size_t i = 0; i < length; ++i) {
      const double scaled = std::abs(f[i] * scale[i]);
      if (!std::isfinite(scaled)) return std::numeric_limits<double>::infinity();
      norm = std::max(norm, scaled);
    }
    return norm;
  };
  newton_iterations = 0;
  if (!residual_at()) return end_full_newton_steps(KIN_SYSFUNC_FAIL);
  // KINSOL's tests in its order: the start is the answer within 1/100 of the tolerance; after a step,
  // the residual within the tolerance, else the step below the scaled step tolerance (1e-15 of every
  // unknown plus one, KINSetScaledStepTol above), else the most steps.
  if (scaled_norm() <= 0.01 * options.tolerance) return end_full_newton_steps(KIN_INITIAL_GUESS_OK);
  while (true) {
    // The Newton matrix: the LU held (a warm start's first step, a chord step) or a new one.
    const int evaluated = reduced ? reduced_jacobian_callback(unknowns, f_work, jacobian_matrix, this, nullptr, nullptr)
                                  : jacobian_callback(unknowns, f_work, jacobian_matrix, this, nullptr, nullptr);
    if (evaluated != 0 || SUNLinSolSetup(linear_solver, jacobian_matrix) != SUNLS_SUCCESS)
      return end_full_newton_steps(KIN_LSETUP_FAIL);
    for (std::size_t i = 0; i < length; ++i) step[i] = -f[i];
    if (SUNLinSolSolve(linear_solver, jacobian_matrix, newton_step, newton_step, 0.0) != SUNLS_SUCCESS)
      return end_full_newton_steps(KIN_LSOLVE_FAIL);
    double step_length = 0.0;
    for (std::size_t i = 0; i < length; ++i) step_length += step[i] * step[i];
    step_length = std::sqrt(step_length);
    const double shorten = step_length > longest_step ? longest_step / step_length : 1.0;
    for (std::size_t i = 0; i < length; ++i) y[i] += shorten * step[i];
    ++newton_iterations;
    if (!residual_at()) return end_full_newton_steps(KIN_SYSFUNC_FAIL);
    if (scaled_norm() <= options.tolerance) return end_full_newton_steps(KIN_SUCCESS);
    double relative_step = 0.0;
    for (std::size_t i = 0; i < length; ++i)
      relative_step = std::max(relative_step, shorten * std::abs(step[i]) / (std::abs(y[i]) + 1.0));
    if (relative_step <= 1e-15) return end_full_newton_steps(KIN_STEP_LT_STPTOL);
    if (newton_iterations >= most_steps) return end_full_newton_steps(KIN_MAXITER_REACHED);
  }
}

int EquilibriumSolver::Impl::end_full_newton_steps(int flag) {
  const bool reduced = options.form == NewtonForm::reduced;
  double* x = N_VGetArrayPointer(u);
  if (reduced) std::copy(full_x.begin(), full_x.end(), x);  // the last residual's full u, at y
  reuse_factorization = false;  // only ever for the first step of a warm solve
  if (flag < 0) factorization_current = false;
  return flag;
}

int EquilibriumSolver::Impl::run_kinsol(int strategy) {
  double* x = N_VGetArrayPointer(u);
  double* scale = N_VGetArrayPointer(f_scale);
  set_residual_scales(x, scale);
  factored_this_call = false;
  chord_steps = 0;
  int flag = 0;
  if (options.form == NewtonForm::reduced) {
    // The reduced unknowns and their scales are the full form's outside the mass-action block; the
    // secondary ln m start where x has them and end solving their rows at the answer.
    double* y = N_VGetArrayPointer(reduced_u);
    double* y_scale = N_VGetArrayPointer(reduced_f_scale);
    std::copy(x, x + size, full_x.begin());
    for (std::size_t r = 0; r < reduced_size; ++r) {
      y[r] = x[full_index(r)];
      y_scale[r] = scale[full_index(r)];
    }
    flag = KINSol(kinsol, reduced_u, strategy, reduced_u_scale, reduced_f_scale);
    bool at_y = true;
    for (std::size_t r = 0; r < reduced_size; ++r) at_y = at_y && full_x[full_index(r)] == y[r];
    if (!at_y) reduced_residual(y, N_VGetArrayPointer(f_work));
    std::copy(full_x.begin(), full_x.end(), x);
  } else {
    // Solve, then check the flag.
    flag = KINSol(kinsol, u, strategy, u_scale, f_scale);
  }
  KINGetNumNonlinSolvIters(kinsol, &newton_iterations);
  reuse_factorization = false;  // only ever for the first step of a warm solve
  if (flag < 0) factorization_current = false;
  return flag;
}

// A mass-action row adds ln K and ν (ln m + ln γ) terms of up to hundreds each and cancels them to
// zero: it cannot be computed to better than a few ε times their magnitude. For the Al13 Keggin ion
// (13 Al, 32 H^+) at pH 14 that floor is about 5e-13, above the 1e-13 tolerance, and Newton would
// stall on rounding error. A row whose floor could reach an eighth of the tolerance is divided by its
// magnitude (docs/equilibrium.md, "Rounding floors").
void EquilibriumSolver::Impl::scale_mass_action_rows(const double* x, double* scale) const {
  const double* ln_gamma = evaluation.ln_gamma.data();
  const double floor_per_magnitude = 8.0 * std::numeric_limits<double>::epsilon() / options.tolerance;
  for (std::size_t i = nb; i < n; ++i) {
    if (!active[i]) continue;
    double magnitude = std::abs(ln_k[i]) + std::abs(x[i]) + std::abs(ln_gamma[i]) +
                       std::abs(water_coefficient[i] * evaluation.ln_water_activity);
    for (const Term& t : terms[i]) magnitude += std::abs(t.coefficient) * (std::abs(x[t.basis]) + std::abs(ln_gamma[t.basis]));
    scale[i] = 1.0 / std::max(1.0, floor_per_magnitude * magnitude);
  }
}

// KINSOL's success, or a step-size stop whose residual is close enough to the tolerance.
bool EquilibriumSolver::Impl::accepted(int flag) {
  if (flag < 0) return false;
  return flag != KIN_STEP_LT_STPTOL || scaled_residual_norm() <= 100.0 * options.tolerance;
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
  // ln a_b once for every solid's saturation index: the sum of phase_log_activity, term for term.
  for (std::size_t b = 0; b < nb; ++b) ln_basis_activity[b] = std::log(std::max(molality[b], 1e-300)) + evaluation.ln_gamma[b];
  for (std::size_t p = 0; p < solids.size(); ++p) {
    const PhaseSpecies& solid = solids[p];
    const bool in_range = temperature >= solid.minimum_temperature && temperature <= solid.maximum_temperature;
    if (!(solid_active[p] && in_range)) {
      out.saturation_index[p] = std::numeric_limits<double>::quiet_NaN();
      continue;
    }
    double ln_omega = ln_k_solid[p] + solid.water_coefficient * evaluation.ln_water_activity;
    for (std::size_t b = 0; b < nb; ++b)
      if (solid.stoichiometry[b] != 0.0) ln_omega += solid.stoichiometry[b] * ln_basis_activity[b];
    out.saturation_index[p] = ln_omega / constants::ln10;
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

  out.iterations = newton_iterations;
  out.residual_norm = scaled_residual_norm(true);  // F at the answer is KINSOL's last evaluation
  out.warm_started = warm;
  out.activity_model_limit = activity->maximum_ionic_strength();
  out.activity_model_name = activity->name().data();
  out.warnings = out.ionic_strength > out.activity_model_limit ? ionic_strength_beyond_model : 0u;
}

void EquilibriumSolver::Impl::solve(double t, double p, std::span<const double> amounts,
                                    std::span<const double> open_gas_pressures, Speciation& out) {
  if (!std::isfinite(t) || t < system->minimum_temperature() || t > system->maximum_temperature())
    throw ThermoError(ErrorKind::out_of_range,
                      fmt::format("temperature {:.2f} K ({:.2f} °C) is outside the species data's range {:.2f}–{:.2f} K",
                                  t, t - 273.15, system->minimum_temperature(), system->maximum_temperature()));
  if (!std::isfinite(p) || p <= 0.0)
    throw ThermoError(ErrorKind::bad_input, fmt::format("pressure {} Pa is not a positive number", p));
  const bool same_conditions = t == temperature && p == pressure;
  temperature = t;
  pressure = p;
  set_totals(amounts, open_gas_pressures);
  update_log_k(t, p);

  double* x = N_VGetArrayPointer(u);
  const bool warm = has_previous && previous_active == active;
  // γ and a_w depend on T, P and the molalities alone: the evaluation at the previous answer serves
  // a warm start from it at the same T and P (evaluate_molalities checks that u is the same).
  if (!(warm && same_conditions)) evaluation_valid = false;
  const auto start_cold = [&] {
    std::fill(solid_present.begin(), solid_present.end(), 0);
    gas_phase_present = false;
    ideal_guess(x);
  };
  if (warm) {
    reuse_factorization = factorization_current && factored_temperature == t && factored_pressure == p &&
                          factored_solid_present == previous_solid_present &&
                          factored_gas_phase_present == previous_gas_phase_present;
    std::copy(previous_u.begin(), previous_u.end(), x);
    solid_present = previous_solid_present;
    gas_phase_present = previous_gas_phase_present;
    rescale_warm_start(x);
  } else {
    start_cold();
  }
  bool converged = settle_phases();
  bool used_warm = warm;
  if (!converged && warm) {  // a poor warm start is retried cold before giving up
    reuse_factorization = false;
    start_cold();
    converged = settle_phases();
    used_warm = false;
  }
  if (!converged) {
    has_previous = false;
    const long iterations = newton_iterations;
    throw ConvergenceError(
        fmt::format("speciation did not converge at {:.2f} K (KINSOL {}: {}); scaled residual max-norm {:.3g}",
                    t, flag_name(last_flag), kinsol_message, scaled_residual_norm()),
        residual_report(), iterations);
  }
  std::copy(x, x + size, previous_u.begin());
  std::copy(basis_total.begin(), basis_total.end(), previous_basis_total.begin());
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
                               "activities, and pH with them, are extrapolated; {}",
                               s.ionic_strength, s.activity_model_name, s.activity_model_limit,
                               // 6 mol/kg: the range of the bundled Pitzer parameters (thermo/data/pitzer)
                               s.ionic_strength <= 6.0 && std::string_view(s.activity_model_name) != "pitzer"
                                   ? "the pitzer model serves to about 6 mol/kg"
                                   : "no ion-interaction model serves here; a concentrated acid or base needs a "
                                     "full-range acid-water property model"));
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

double EquilibriumSolver::jacobian_finite_difference_error(double offset) {
  return impl_->jacobian_finite_difference_error(offset);
}

const ChemicalSystem& EquilibriumSolver::system() const noexcept { return *impl_->system; }

}  // namespace protonflow::thermo
