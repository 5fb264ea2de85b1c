#include "chemistry_stage_model.hpp"

#include <protonflow/thermo/constants.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>
#include <protonflow/thermo/temperature_function.hpp>

#include <algorithm>
#include <cmath>

namespace protonflow::scrubber {

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

// The stage's totals at equilibrium with a gas phase at the given pressure (the engine's closed
// gas phase, docs/equilibrium.md): the gas holds each column gas's amount, the liquid the rest.
void ChemistryStageModel::flash(std::size_t stage, double temperature, double pressure, std::span<const double> totals,
                                std::span<double> liquid, std::span<double> gas) {
  flash_solvers_[stage].solve(temperature, pressure, totals, flash_state_);
  std::copy(totals.begin(), totals.end(), liquid.begin());
  for (std::size_t k = 0; k < gases_.size(); ++k) {
    const double amount = flash_state_.gas_phase_present ? flash_state_.gas_amount[gases_[k].phase_gas] : 0.0;
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
// converged major total the factor is 1 to round-off.
void ChemistryStageModel::evaluate(std::size_t stage, double temperature, double pressure, std::span<const double> liquid,
                                   StageEquilibrium& out) {
  thermo::Speciation& state = states_[stage];
  solvers_[stage].solve(temperature, pressure, liquid, state);
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
