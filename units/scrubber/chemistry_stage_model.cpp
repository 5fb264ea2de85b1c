#include "chemistry_stage_model.hpp"

#include <protonflow/thermo/constants.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>
#include <protonflow/thermo/temperature_function.hpp>

#include <algorithm>
#include <cmath>

namespace protonflow::scrubber {

namespace {

// The floor share of a trace component in a stage's speciation (see evaluate()): far below the
// engine's tolerance of 1e-13 on every balance. The engine now scales a warm start to a trace total
// that moved by decades, so a trace re-solves in one Newton step at any level; the floor is kept
// because without it the cold 40-stage benchmark column costs 151.5 M instructions against 96.8 M
// with it (20 stages: the same 48.4 M either way; docs/performance.md, "Warm starts scaled").
constexpr double trace_share = 1e-16;

}  // namespace

ChemistryStageModel::ChemistryStageModel(const thermo::ChemicalSystem& liquid_system,
                                         const thermo::ChemicalSystem& flash_system, std::vector<ColumnGas> gases)
    : system_(&liquid_system),
      gases_(std::move(gases)),
      flash_system_(&flash_system),
      ln_total_ratio_(liquid_system.basis_count(), 0.0) {}

void ChemistryStageModel::prepare(std::size_t stages) {
  while (solvers_.size() < stages + 1) {
    solvers_.emplace_back(*system_);
    flash_solvers_.emplace_back(*flash_system_);
    states_.emplace_back();
  }
}

const std::vector<double>& ChemistryStageModel::with_traces_at_floor(std::span<const double> amounts) {
  double total = 0.0;
  for (const double amount : amounts) total += amount;
  const double floor = trace_share * total;
  solve_amounts_.assign(amounts.begin(), amounts.end());
  for (double& amount : solve_amounts_)
    if (amount > 0.0 && amount < floor) amount = floor;
  return solve_amounts_;
}

// The stage's totals at equilibrium with a gas phase at the given pressure (the engine's closed
// gas phase, docs/equilibrium.md): the gas holds each column gas's amount, the liquid the rest.
void ChemistryStageModel::flash(std::size_t stage, double temperature, double pressure, std::span<const double> totals,
                                std::span<double> liquid, std::span<double> gas) {
  // Traces at their floor, as in evaluate(); a trace's gas share is then scaled back to its total.
  const std::vector<double>& floored = with_traces_at_floor(totals);
  flash_solvers_[stage].solve(temperature, pressure, floored, flash_state_);
  std::copy(totals.begin(), totals.end(), liquid.begin());
  for (std::size_t k = 0; k < gases_.size(); ++k) {
    const std::size_t c = gases_[k].liquid_component;
    const double share = c == no_component || floored[c] == 0.0 ? 1.0 : totals[c] / floored[c];
    const double amount = flash_state_.gas_phase_present ? flash_state_.gas_amount[gases_[k].phase_gas] * share : 0.0;
    gas[k] = amount;
    if (gases_[k].liquid_component != no_component) liquid[gases_[k].liquid_component] -= amount;
  }
}

// p_k / p° = K_k(T) · Π_b a_b^ν_kb · a_w^ν_kw: the formation of gas k from the basis at
// equilibrium with the liquid (Henry's law for a solute gas, Raoult's law with the water activity
// for water vapour; thermo/data/gases.yaml), p° = 1 atm.
//
// Each a_b is taken times T_b / Σ_s ν_sb m_s W, the basis species' total over what the speciation
// holds of it. The engine meets its mass balances to a tolerance relative to the whole solution,
// so a trace total (the HCl left near the top of a caustic column, 1e-20 mol/kg) is held only to a
// few digits, while its mass-action ratios are exact: the factor restores the trace total exactly,
// and with it Henry's law linear in the trace amount, which the column's Jacobian needs. For a
// converged major total the factor is 1 to round-off; a trace raised to its floor for the
// speciation (below) is scaled back to its own amount by the same factor.
void ChemistryStageModel::evaluate(std::size_t stage, double temperature, double pressure, std::span<const double> liquid,
                                   StageEquilibrium& out) {
  thermo::Speciation& state = states_[stage];
  // A trace component is speciated at a floor share of the liquid instead of its own amount (HCl
  // near the top of a long caustic column, and the Newton iterates on the way there): measured
  // cheaper on long columns (trace_share above). At the floor the trace moves nothing else in the
  // solution (1e-16 of it, below the engine's own tolerance), so its species keep the proportions
  // they would have at the true amount, and the factor below scales them back to it.
  solvers_[stage].solve(temperature, pressure, with_traces_at_floor(liquid), state);
  const double ln_water_activity = std::log(state.water_activity);
  const std::size_t basis_count = system_->basis_count();
  for (std::size_t b = 1; b < basis_count; ++b) {
    double wanted = 0.0;
    for (std::size_t c = 0; c < liquid.size(); ++c) wanted += liquid[c] * system_->composition(c)[b];
    double held = 0.0;
    for (std::size_t s = 0; s < system_->solutes().size(); ++s) held += system_->solutes()[s].stoichiometry[b] * state.molality[s];
    held *= state.water_mass;
    ln_total_ratio_[b] = wanted > 0.0 && held > 0.0 ? std::log(wanted / held) : 0.0;
  }
  for (std::size_t k = 0; k < gases_.size(); ++k) {
    const ColumnGas& gas = gases_[k];
    if (gas.liquid_component == no_component) {
      out.partial_pressure[k] = 0.0;
      continue;
    }
    double ln_p = thermo::constants::ln10 * thermo::log_k(gas.data.log_k, temperature, pressure) +
                  gas.data.water_coefficient * ln_water_activity;
    for (std::size_t b = 0; b < gas.data.stoichiometry.size(); ++b) {
      const double nu = gas.data.stoichiometry[b];
      if (nu != 0.0) ln_p += nu * (std::log(std::max(state.activity[b], 1e-300)) + (b > 0 ? ln_total_ratio_[b] : 0.0));
    }
    out.partial_pressure[k] = std::exp(ln_p) * thermo::constants::standard_atmosphere;
  }
  out.liquid_enthalpy = thermo::state_enthalpy(*system_, state);
}

// Ideal gas: ΔfH°(298.15 K) + Cp (T − 298.15 K), with the data's constant Cp (docs/energy.md).
double ChemistryStageModel::gas_enthalpy(std::size_t gas, double temperature) const {
  const thermo::PhaseSpecies& data = gases_[gas].data;
  return data.reference_enthalpy + data.heat_capacity * (temperature - thermo::constants::reference_temperature);
}

}  // namespace protonflow::scrubber
