#include "component_amounts.hpp"

#include <algorithm>
#include <cmath>

#include <fmt/format.h>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/formula.hpp"

namespace protonflow::host {
namespace {

using thermo::constants::water_molar_mass;  // kg/mol, IAPWS-95; the solver uses the same value

// Mass fractions are read with this slack on their sum, so that fractions rounded to the digits a
// user writes (0.3333 + 0.6667) still count as adding up to 1.
constexpr double fraction_sum_tolerance = 1e-9;

const ComponentEntry* find_water(const SolutionInput& input) {
  const auto found = std::find_if(input.components.begin(), input.components.end(),
                                  [](const ComponentEntry& entry) { return entry.formula == water_formula; });
  return found == input.components.end() ? nullptr : &*found;
}

double formula_molar_mass(const ComponentEntry& entry) {
  try {
    const thermo::Formula formula = thermo::parse_formula(entry.formula);
    if (formula.charge != 0) {
      throw InputError(entry.key_at, fmt::format("component {} is charged; components are neutral compounds such as "
                                                 "NaCl or H2SO4",
                                                 entry.formula));
    }
    return thermo::molar_mass(formula);
  } catch (const thermo::ThermoError& error) {
    throw InputError(entry.key_at, fmt::format("cannot read the formula {}: {}", entry.formula, error.what()));
  }
}

ComponentSlate from_molality(const SolutionInput& input) {
  if (const ComponentEntry* const water = find_water(input)) {
    throw InputError(water->key_at, "H2O is the solvent with amounts_as: molality; give its mass with "
                                    "'water_mass' (default 1 kg) instead of listing it");
  }
  const double water_mass = input.water_mass.value_or(1.0);  // kg; 1 kg unless given
  ComponentSlate slate;
  slate.names.emplace_back(water_formula);
  slate.amounts.push_back(water_mass / water_molar_mass);
  for (const ComponentEntry& entry : input.components) {
    slate.names.push_back(entry.formula);
    slate.amounts.push_back(entry.amount * water_mass);
  }
  return slate;
}

ComponentSlate from_moles(const SolutionInput& input) {
  const ComponentEntry* const water = find_water(input);
  if (water == nullptr) {
    throw InputError(input.components_at, "with amounts_as: moles, list the water as H2O (mol)");
  }
  if (water->amount <= 0.0) {
    throw InputError(water->value_at, "the amount of H2O must be above zero: it is the solvent");
  }
  ComponentSlate slate;
  slate.names.emplace_back(water_formula);
  slate.amounts.push_back(water->amount);
  for (const ComponentEntry& entry : input.components) {
    if (&entry != water) {
      slate.names.push_back(entry.formula);
      slate.amounts.push_back(entry.amount);
    }
  }
  return slate;
}

// Fractions of 1 kg of solution; the speciation is intensive, so the basis mass does not matter
// except for the reported water mass.
ComponentSlate from_mass_fraction(const SolutionInput& input) {
  const ComponentEntry* const water = find_water(input);
  ComponentSlate slate;
  slate.names.emplace_back(water_formula);
  slate.amounts.push_back(0.0);
  double solute_fraction = 0.0;
  for (const ComponentEntry& entry : input.components) {
    if (&entry == water) {
      continue;
    }
    solute_fraction += entry.amount;
    if (solute_fraction > 1.0 + fraction_sum_tolerance) {
      throw InputError(entry.value_at, fmt::format("the mass fractions add up to {:.6g} here, more than 1", solute_fraction));
    }
    slate.names.push_back(entry.formula);
    slate.amounts.push_back(entry.amount / formula_molar_mass(entry));  // mol in 1 kg of solution
  }
  double water_fraction = 1.0 - solute_fraction;
  if (water != nullptr) {
    if (std::abs(solute_fraction + water->amount - 1.0) > fraction_sum_tolerance) {
      throw InputError(water->value_at, fmt::format("with H2O listed the mass fractions must add up to 1; they add "
                                                    "up to {:.9g}",
                                                    solute_fraction + water->amount));
    }
    water_fraction = water->amount;
  }
  if (water_fraction <= 0.0) {
    throw InputError(input.components_at, "no water is left: the mass fractions of the solutes add up to 1");
  }
  slate.amounts[0] = water_fraction / water_molar_mass;
  return slate;
}

}  // namespace

ComponentSlate to_component_slate(const SolutionInput& input) {
  switch (input.basis) {
    case AmountBasis::molality: return from_molality(input);
    case AmountBasis::moles: return from_moles(input);
    case AmountBasis::mass_fraction: return from_mass_fraction(input);
  }
  throw InputError(input.solution_at, "unknown amount basis");
}

}  // namespace protonflow::host
