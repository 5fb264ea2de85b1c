// The equations of the equilibrium problem, side by side with their Jacobian (docs/equilibrium.md).
#include "equilibrium_solver_impl.hpp"

#include "dense_linear_solver.hpp"

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"

namespace protonflow::thermo {

using detail::highest_log;
using detail::inactive_log_molality;
using detail::lowest_log;
using detail::safe_exp;

// m_i = exp(u_i) for present solutes, exactly 0 for absent ones; then γ and a_w at those m.
void EquilibriumSolver::Impl::evaluate_molalities(const double* x) {
  // KINSOL asks for F and then J at the same u: evaluate once.
  if (evaluation_valid && std::equal(x, x + size, evaluated_at.begin())) return;
  std::copy(x, x + size, evaluated_at.begin());
  evaluation_valid = true;
  for (std::size_t i = 0; i < n; ++i) molality[i] = active[i] ? std::exp(std::clamp(x[i], lowest_log, highest_log)) : 0.0;
  basis_amount_current = false;
  water_mass = std::exp(std::clamp(x[n], lowest_log, highest_log));
  activity->evaluate(temperature, pressure, molality, evaluation);
}

// Σ_i ν_ib m_i over the tableau's non-zero entries, for every basis species at once.
const double* EquilibriumSolver::Impl::basis_amounts() {
  double* amount = basis_amount.data();
  if (basis_amount_current) return amount;
  std::fill(amount, amount + nb, 0.0);
  for (std::size_t i = 0; i < n; ++i)
    for (const Term& t : terms[i]) amount[t.basis] += t.coefficient * molality[i];
  basis_amount_current = true;
  return amount;
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
  for (std::size_t k = 0; k < n; ++k) g[k] = p.water_coefficient * dw[k];
  for (std::size_t b = 0; b < nb; ++b) {
    const double nu = p.stoichiometry[b];
    if (nu == 0.0) continue;
    const double* dg_b = dg + b * n;
    for (std::size_t k = 0; k < n; ++k) g[k] += nu * dg_b[k];
  }
  for (std::size_t k = 0; k < n; ++k) g[k] *= molality[k];
  for (std::size_t b = 0; b < nb; ++b) g[b] += p.stoichiometry[b];
}

// Rows, in order of the unknowns (docs/equilibrium.md):
//   secondary solute s:  ln m_s + ln γ_s − Σ_b ν_sb (ln m_b + ln γ_b) − ν_sw ln a_w − ln K_s = 0         (mass action)
//   basis solute b ≠ H^+: W Σ_i ν_ib m_i + Σ_p ν_pb n_p + Σ_g ν_gb n_g − T_b − Σ_o ν_ob ξ_o = 0        (mass balance, mol)
//   H^+:                  Σ_i z_i m_i = 0                                                            (charge balance)
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
  const double* amount = basis_amounts();
  for (std::size_t b = 1; b < nb; ++b) {
    if (!active[b]) {
      f[b] = x[b] - inactive_log_molality;
      continue;
    }
    f[b] = water_mass * amount[b] + outside(b, false) - basis_total[b];
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
  std::copy(f, f + size, latest_residual.begin());
  std::copy(x, x + size, latest_residual_at.begin());
}

int EquilibriumSolver::Impl::jacobian_callback(N_Vector u, N_Vector fu, SUNMatrix jm, void* user_data, N_Vector, N_Vector) {
  auto* self = static_cast<Impl*>(user_data);
  if (self->chord_step(N_VGetArrayPointer(fu), N_VGetArrayPointer(self->f_scale), self->size)) {
    detail::keep_factorization(jm);
    return 0;
  }
  self->jacobian(N_VGetArrayPointer(u), jm);
  self->factored_this_call = true;
  self->chord_steps = 0;
  return 0;
}

// Near the answer a Newton step from the LU of the step before (a chord step) converges as fast as
// a new one: the error falls by the factor of the Jacobian's change over one step, which is itself
// of the order of the residual then (docs/equilibrium.md, "Solving with KINSOL"). A new Jacobian
// and LU cost three times a chord step's residual, solve and KINSOL's vector work.
bool EquilibriumSolver::Impl::chord_step(const double* f, const double* scale, std::size_t length) {
  constexpr double chord_residual = 1e-6;  // scaled max-norm of F below which a chord step serves
  constexpr int most_chord_steps = 2;
  if (reuse_factorization || !factored_this_call || chord_steps >= most_chord_steps) return false;
  for (std::size_t i = 0; i < length; ++i)
    if (!(std::abs(f[i] * scale[i]) <= chord_residual)) return false;
  ++chord_steps;
  return true;
}

// ∂F/∂u, column k: ∂(ln γ_i)/∂u_k = (∂ln γ_i/∂m_k) m_k, and likewise for ln a_w.
void EquilibriumSolver::Impl::jacobian(const double* x, SUNMatrix jm) {
  // The first step of a warm solve keeps the LU of the previous answer's last Jacobian: evaluated
  // within a converging step of that answer, at the same T, P and phase set, it is the Newton
  // matrix there (docs/equilibrium.md, "Solving with KINSOL").
  if (reuse_factorization) {
    reuse_factorization = false;
    detail::keep_factorization(jm);
    return;
  }
  evaluate_molalities(x);
  factorization_current = true;  // the linear solver factors this matrix next
  factored_temperature = temperature;
  factored_pressure = pressure;
  std::copy(solid_present.begin(), solid_present.end(), factored_solid_present.begin());
  factored_gas_phase_present = gas_phase_present;
  jacobian_entries(x, detail::dense_jacobian_data(jm));
}

void EquilibriumSolver::Impl::jacobian_entries(const double* x, double* data) {
  evaluate_molalities(x);
  std::fill(data, data + size * size, 0.0);
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
    // row[k] = ∂(ln γ_i − Σ_b ν_ib ln γ_b − ν_iw ln a_w)/∂m_k, built from whole rows of ∂ln γ/∂m.
    double* row = gradient.data();
    const double* dg_i = dg + i * n;
    const double nu_w = water_coefficient[i];
    for (std::size_t k = 0; k < n; ++k) row[k] = dg_i[k] - nu_w * dw[k];
    for (const Term& t : terms[i]) {
      const double* dg_b = dg + t.basis * n;
      const double nu = t.coefficient;
      for (std::size_t k = 0; k < n; ++k) row[k] -= nu * dg_b[k];
    }
    for (std::size_t k = 0; k < n; ++k) at(i, k) = row[k] * molality[k];
    at(i, i) += 1.0;
    for (const Term& t : terms[i]) at(i, t.basis) -= t.coefficient;
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
  // H^+ is balanced by charge; its tableau total is kept for the cold start.
  proton_total = basis_total[0];
  // A basis species with no total is absent, and so is every solute built from it, unless an open
  // gas supplies it (pure water open to air takes up CO2). A gas supplies every basis species of its
  // formation reaction, not only its pivot: Cl2(g) brings both Cl^- and HOCl(aq).
  bool same_basis_available = true;
  for (std::size_t b = 1; b < nb; ++b) {
    const char here = basis_total[b] > 0.0 ||
                      std::any_of(open.begin(), open.end(), [&](const PhaseSpecies& g) { return g.stoichiometry[b] != 0.0; });
    same_basis_available = same_basis_available && here == basis_available[b];
    basis_available[b] = here;
  }
  const auto& solids = system->solids();
  // Which solutes and solids can exist changes only with the set of available basis species (most
  // calls, a flowsheet's iterations, keep it).
  if (!same_basis_available) {
    for (std::size_t i = 0; i < n; ++i) {
      bool present = true;
      for (std::size_t b = 1; b < nb; ++b)
        if (stoichiometry[i * nb + b] != 0.0 && !basis_available[b]) present = false;
      active[i] = present;
    }
    // A solid can form only from present basis species.
    for (std::size_t p = 0; p < solids.size(); ++p) {
      bool possible = true;
      for (std::size_t b = 1; b < nb; ++b)
        if (solids[p].stoichiometry[b] != 0.0 && !basis_available[b]) possible = false;
      solid_active[p] = possible;
    }
  }
  // s_p is the most of a solid the limiting total allows.
  uptake_scale = water_total * constants::water_molar_mass;
  phase_scale = water_total;
  for (std::size_t b = 1; b < nb; ++b) phase_scale += std::abs(basis_total[b]);
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

// Scaled max-norm of the residual at the current u, with the charge balance relative to the
// equivalents of the answer itself.
double EquilibriumSolver::Impl::scaled_residual_norm(bool latest_residual_serves) {
  const double* x = N_VGetArrayPointer(u);
  double* f = N_VGetArrayPointer(f_work);
  if (latest_residual_serves && std::equal(x, x + size, latest_residual_at.begin())) {
    std::copy(latest_residual.begin(), latest_residual.end(), f);
    evaluate_molalities(x);
  } else {
    residual(x, f);
  }
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
  for (std::size_t i = nb; i < n; ++i) report.push_back({"mass action " + solutes[i].name, f[i] * scale[i]});
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

}  // namespace protonflow::thermo
