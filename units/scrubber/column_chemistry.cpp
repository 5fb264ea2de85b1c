#include "column_chemistry.hpp"

#include <protonflow/thermo/errors.hpp>

#include <algorithm>
#include <cmath>
#include <string>

namespace protonflow::scrubber {

namespace {

// Coefficients of a tableau are small whole numbers or simple fractions; equal within this.
constexpr double same_coefficient = 1e-12;

bool same_composition(const thermo::ChemicalSystem& system, std::size_t component, const thermo::PhaseSpecies& gas) {
  const auto& composition = system.composition(component);
  if (std::abs(system.water_in(component) - gas.water_coefficient) > same_coefficient) return false;
  for (std::size_t b = 0; b < composition.size(); ++b)
    if (std::abs(composition[b] - gas.stoichiometry[b]) > same_coefficient) return false;
  return true;
}

// The basis species (other than H+, index 0) a component carries.
std::vector<std::size_t> carried_basis(const thermo::ChemicalSystem& system, std::size_t component) {
  std::vector<std::size_t> carried;
  const auto& composition = system.composition(component);
  for (std::size_t b = 1; b < composition.size(); ++b)
    if (composition[b] != 0.0) carried.push_back(b);
  return carried;
}

std::size_t solute_index(const thermo::ChemicalSystem& system, const std::string& name) {
  for (std::size_t i = 0; i < system.basis_count(); ++i)
    if (system.solutes()[i].name == name) return i;
  return StageModel::no_component;
}

}  // namespace

std::vector<double> ColumnChemistry::liquid_of(std::span<const double> slate_amounts) const {
  std::vector<double> amounts(to_column.size(), 0.0);
  for (std::size_t k = 0; k < to_column.size(); ++k)
    for (std::size_t c = 0; c < slate_amounts.size(); ++c) amounts[k] += to_column[k][c] * slate_amounts[c];
  return amounts;
}

ColumnChemistry make_column_chemistry(std::string_view unit_type, const thermo::Database& database,
                                      const unit::Slate& slate, thermo::ActivityModelKind activity) {
  const std::string prefix = "unit '" + std::string(unit_type) + "': ";
  const auto refuse = [&](const std::string& why) { throw unit::UnitError(PFU_INVALID_PARAMETER, prefix + why); };
  if (!slate.find_component("H2O")) refuse("the slate must include H2O, the solvent");
  try {
    thermo::SystemOptions probe_options;
    probe_options.gas_phase = true;
    const thermo::ChemicalSystem on_slate(database, slate.components, probe_options);
    const std::size_t slate_count = slate.components.size();

    // Volatile components: those written exactly as a gas of the data.
    ColumnChemistry chemistry;
    chemistry.gas_of_slate_component.assign(slate_count, StageModel::no_component);
    std::vector<std::size_t> chosen;
    std::vector<std::size_t> carrier_of_basis(on_slate.basis_count(), StageModel::no_component);
    for (std::size_t c = 0; c < slate_count; ++c) {
      for (const thermo::PhaseSpecies& gas : on_slate.phase_gases()) {
        if (!same_composition(on_slate, c, gas)) continue;
        const auto carried = carried_basis(on_slate, c);
        if (carried.size() > 1) continue;  // no gas of the data carries two basis species
        if (!carried.empty()) {
          if (carrier_of_basis[carried[0]] != StageModel::no_component)
            refuse("slate components '" + slate.components[carrier_of_basis[carried[0]]] + "' and '" + slate.components[c] +
                   "' are both gases of one basis species; the column needs one");
          carrier_of_basis[carried[0]] = c;
        }
        chosen.push_back(c);
        break;
      }
    }
    // Every other basis species the slate reaches: a component that carries it alone.
    for (std::size_t c = 0; c < slate_count; ++c) {
      if (std::find(chosen.begin(), chosen.end(), c) != chosen.end()) continue;
      const auto carried = carried_basis(on_slate, c);
      if (carried.size() != 1 || carrier_of_basis[carried[0]] != StageModel::no_component) continue;
      carrier_of_basis[carried[0]] = c;
      chosen.push_back(c);
    }
    for (std::size_t b = 1; b < on_slate.basis_count(); ++b) {
      if (carrier_of_basis[b] != StageModel::no_component) continue;
      bool reached = false;
      for (std::size_t c = 0; c < slate_count; ++c) reached = reached || on_slate.composition(c)[b] != 0.0;
      if (reached)
        refuse("no slate component carries " + on_slate.solutes()[b].name +
               " alone (with H+ and H2O only), as the column's liquid needs; add one, such as the hydroxide of a "
               "cation (NaOH) or the acid of an anion (H2SO4)");
    }
    std::sort(chosen.begin(), chosen.end());
    chemistry.slate_component = chosen;

    // The column's own systems over those components: one to solve (no gas phase, no solids) and
    // one that lists the gases in its basis.
    std::vector<std::string> components;
    for (const std::size_t c : chosen) components.push_back(slate.components[c]);
    thermo::SystemOptions liquid_options;
    liquid_options.activity = activity;
    chemistry.liquid_system = std::make_unique<thermo::ChemicalSystem>(database, components, liquid_options);
    thermo::SystemOptions gas_options = liquid_options;
    gas_options.gas_phase = true;
    chemistry.flash_system = std::make_unique<thermo::ChemicalSystem>(database, components, gas_options);
    const thermo::ChemicalSystem& with_gases = *chemistry.flash_system;
    const thermo::ChemicalSystem& liquid = *chemistry.liquid_system;
    for (std::size_t i = 0; i < liquid.basis_count(); ++i)
      if (with_gases.solutes()[i].name != liquid.solutes()[i].name)
        throw unit::UnitError(PFU_INTERNAL_ERROR, prefix + "the column's two systems disagree on their basis");

    for (std::size_t k = 0; k < components.size(); ++k) {
      for (std::size_t g = 0; g < with_gases.phase_gases().size(); ++g) {
        const thermo::PhaseSpecies& gas = with_gases.phase_gases()[g];
        if (!same_composition(liquid, k, gas)) continue;
        if (std::isnan(gas.reference_enthalpy))
          refuse("gas " + gas.name + " has no formation enthalpy in the species data; the column's energy balance needs it");
        chemistry.gas_of_slate_component[chosen[k]] = chemistry.gases.size();
        chemistry.gases.push_back({components[k], k, g, gas});
        break;
      }
    }

    // Slate liquid → column liquid: each carrier takes its basis species' total, water the rest.
    chemistry.to_column.assign(components.size(), std::vector<double>(slate_count, 0.0));
    const std::size_t water = std::find(components.begin(), components.end(), "H2O") - components.begin();
    for (std::size_t k = 0; k < components.size(); ++k) {
      if (k == water) continue;
      const auto carried = carried_basis(liquid, k);
      if (carried.size() != 1)
        throw unit::UnitError(PFU_INTERNAL_ERROR, prefix + "column component " + components[k] + " carries no single basis species");
      const std::size_t b_column = carried[0];
      const std::size_t b_slate = solute_index(on_slate, liquid.solutes()[b_column].name);
      for (std::size_t c = 0; c < slate_count; ++c)
        chemistry.to_column[k][c] = on_slate.composition(c)[b_slate] / liquid.composition(k)[b_column];
    }
    for (std::size_t c = 0; c < slate_count; ++c) {
      double water_amount = on_slate.water_in(c);
      for (std::size_t k = 0; k < components.size(); ++k)
        if (k != water) water_amount -= chemistry.to_column[k][c] * liquid.water_in(k);
      chemistry.to_column[water][c] = water_amount;
    }
    return chemistry;
  } catch (const thermo::ThermoError& error) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, prefix + "the slate cannot be used: " + error.what());
  }
}

}  // namespace protonflow::scrubber
