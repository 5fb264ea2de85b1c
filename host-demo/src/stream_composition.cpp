#include "stream_composition.hpp"

#include <cmath>

#include <fmt/format.h>

#include "protonflow/thermo/constants.hpp"

namespace protonflow::host {
namespace {

using thermo::constants::gas_constant;      // J/(mol K), CODATA 2018
using thermo::constants::water_molar_mass;  // kg/mol, IAPWS-95: the value the equilibrium solver uses

bool is_fraction(CompositionBasis basis) {
  return basis == CompositionBasis::mass_fraction || basis == CompositionBasis::mole_fraction ||
         basis == CompositionBasis::volume_fraction;
}

bool water_is_solvent(CompositionBasis basis) {
  return basis == CompositionBasis::molality || basis == CompositionBasis::molarity ||
         basis == CompositionBasis::mass_concentration;
}

std::string_view fraction_word(CompositionBasis basis) {
  switch (basis) {
    case CompositionBasis::mass_fraction: return "mass fractions";
    case CompositionBasis::mole_fraction: return "mole fractions";
    default: return "volume fractions";
  }
}

// Fractions with the balance filled in and a sum of exactly 1.
std::vector<double> fractions(const PhaseComposition& phase) {
  std::vector<double> values(phase.items.size(), 0.0);
  double given = 0.0;
  std::size_t balance = CompositionError::npos;
  for (std::size_t i = 0; i < phase.items.size(); ++i) {
    const CompositionItem& item = phase.items[i];
    if (item.balance) {
      if (balance != CompositionError::npos) {
        throw CompositionError(i, fmt::format("only one component can be the balance; {} already is",
                                              phase.items[balance].formula));
      }
      balance = i;
      continue;
    }
    if (item.value > 1.0) {
      const std::string_view word = fraction_word(phase.basis);
      throw CompositionError(i, fmt::format("the {} of {} is {:.6g}, more than 1", word.substr(0, word.size() - 1),
                                            item.formula, item.value));
    }
    values[i] = item.value;
    given += item.value;
  }
  if (balance != CompositionError::npos) {
    if (given > 1.0 + fraction_sum_tolerance) {
      throw CompositionError(balance, fmt::format("the {} without {} (the balance) already add up to {:.9g}, "
                                                  "{:.3g} over 1, so nothing is left for it",
                                                  fraction_word(phase.basis), phase.items[balance].formula, given,
                                                  given - 1.0));
    }
    values[balance] = std::max(0.0, 1.0 - given);
    return values;
  }
  if (std::abs(given - 1.0) > fraction_sum_tolerance) {
    throw CompositionError(CompositionError::npos,
                           fmt::format("the {} add up to {:.9g}, {:.3g} {} 1; give them all so that they add up to 1, "
                                       "or write 'balance' for the one that makes up the rest",
                                       fraction_word(phase.basis), given, std::abs(given - 1.0),
                                       given < 1.0 ? "short of" : "over"));
  }
  for (double& value : values) value /= given;  // rounding of the last digits, not a change of composition
  return values;
}

std::vector<ComponentFlow> from_fractions(const PhaseComposition& phase) {
  const std::vector<double> x = fractions(phase);
  std::vector<ComponentFlow> flows;
  const bool by_mass = phase.basis == CompositionBasis::mass_fraction;
  // Molar flow of the phase, and the moles per unit of fraction.
  double total_molar = 0.0;
  double moles_per_unit = 0.0;  // Σ w_i/M_i (mass basis) or Σ x_i M_i (mole basis)
  for (std::size_t i = 0; i < x.size(); ++i) {
    moles_per_unit += by_mass ? x[i] / phase.items[i].molar_mass : x[i] * phase.items[i].molar_mass;
  }
  switch (phase.total_kind) {
    case TotalFlowKind::molar: total_molar = phase.total; break;
    case TotalFlowKind::mass: total_molar = by_mass ? phase.total * moles_per_unit : phase.total / moles_per_unit; break;
    case TotalFlowKind::volume:
      if (phase.phase == PhaseKind::gas) {
        total_molar = phase.pressure * phase.total / (gas_constant * phase.temperature);  // ideal gas
      } else {
        const double mass = phase.density * phase.total;
        total_molar = by_mass ? mass * moles_per_unit : mass / moles_per_unit;
      }
      break;
  }
  for (std::size_t i = 0; i < x.size(); ++i) {
    // Mass basis: n_i = (w_i/M_i) / Σ(w_j/M_j) · n; mole basis: n_i = x_i · n.
    const double share = by_mass ? (x[i] / phase.items[i].molar_mass) / moles_per_unit : x[i];
    flows.push_back({phase.items[i].formula, share * total_molar});
  }
  return flows;
}

// Molality: water is the solvent; per kg of water the phase has 1 kg + Σ b_i M_i of mass and
// 1/M_w + Σ b_i of moles.
std::vector<ComponentFlow> from_molality(const PhaseComposition& phase) {
  double solute_mass = 0.0;   // kg per kg of water
  double solute_moles = 0.0;  // mol per kg of water
  for (const CompositionItem& item : phase.items) {
    solute_mass += item.value * item.molar_mass;
    solute_moles += item.value;
  }
  double water_mass = 0.0;  // kg/s
  switch (phase.total_kind) {
    case TotalFlowKind::molar: water_mass = phase.total / (1.0 / water_molar_mass + solute_moles); break;
    case TotalFlowKind::mass: water_mass = phase.total / (1.0 + solute_mass); break;
    case TotalFlowKind::volume: water_mass = phase.density * phase.total / (1.0 + solute_mass); break;
  }
  std::vector<ComponentFlow> flows;
  for (const CompositionItem& item : phase.items) flows.push_back({item.formula, item.value * water_mass});
  flows.push_back({"H2O", water_mass / water_molar_mass});
  return flows;
}

// Per volume of solution: the solution's density ρ fixes its mass, and water is what the solutes
// leave of it, ρ − Σ c_i M_i per m³.
std::vector<ComponentFlow> from_per_volume(const PhaseComposition& phase) {
  std::vector<double> molar(phase.items.size());  // mol/m³
  double solute_mass = 0.0;                        // kg/m³
  double solute_moles = 0.0;                       // mol/m³
  for (std::size_t i = 0; i < phase.items.size(); ++i) {
    const CompositionItem& item = phase.items[i];
    molar[i] = phase.basis == CompositionBasis::molarity ? item.value : item.value / item.molar_mass;
    solute_mass += molar[i] * item.molar_mass;
    solute_moles += molar[i];
  }
  const double water_density = phase.density - solute_mass;  // kg of water per m³ of solution
  if (!(water_density > 0.0)) {
    throw CompositionError(CompositionError::npos,
                           fmt::format("the solutes weigh {:.6g} kg per m³ of solution, but the solution's density is "
                                       "{:.6g} kg/m³: no water would be left; check the concentrations or give the "
                                       "measured 'density'",
                                       solute_mass, phase.density));
  }
  double volume = 0.0;  // m³/s of solution
  switch (phase.total_kind) {
    case TotalFlowKind::volume: volume = phase.total; break;
    case TotalFlowKind::mass: volume = phase.total / phase.density; break;
    case TotalFlowKind::molar: volume = phase.total / (water_density / water_molar_mass + solute_moles); break;
  }
  std::vector<ComponentFlow> flows;
  for (std::size_t i = 0; i < phase.items.size(); ++i) flows.push_back({phase.items[i].formula, molar[i] * volume});
  flows.push_back({"H2O", water_density * volume / water_molar_mass});
  return flows;
}

}  // namespace

std::string_view to_string(CompositionBasis basis) noexcept {
  switch (basis) {
    case CompositionBasis::flows: return "flows";
    case CompositionBasis::mass_fraction: return "mass_fraction";
    case CompositionBasis::mole_fraction: return "mole_fraction";
    case CompositionBasis::volume_fraction: return "volume_fraction";
    case CompositionBasis::molality: return "molality";
    case CompositionBasis::molarity: return "molarity";
    case CompositionBasis::mass_concentration: return "mass_concentration";
  }
  return "?";
}

std::string_view to_string(PhaseKind kind) noexcept {
  switch (kind) {
    case PhaseKind::aqueous: return "aqueous";
    case PhaseKind::gas: return "gas";
    case PhaseKind::solid: return "solid";
  }
  return "?";
}

std::vector<ComponentFlow> component_flows(const PhaseComposition& phase) {
  for (std::size_t i = 0; i < phase.items.size(); ++i) {
    const CompositionItem& item = phase.items[i];
    if (!item.balance && !(item.value >= 0.0 && std::isfinite(item.value))) {
      throw CompositionError(i, fmt::format("the amount of {} must be zero or more", item.formula));
    }
    if (!(item.molar_mass > 0.0)) throw CompositionError(i, fmt::format("{} has no molar mass", item.formula));
    if (item.balance && !is_fraction(phase.basis)) {
      throw CompositionError(i, fmt::format("'balance' makes up fractions to 1; with basis {} give a number",
                                            to_string(phase.basis)));
    }
    if (water_is_solvent(phase.basis) && item.formula == "H2O") {
      throw CompositionError(i, fmt::format("with basis {} water is the solvent: do not list H2O; it follows from "
                                            "the total flow",
                                            to_string(phase.basis)));
    }
  }
  if (!(phase.total >= 0.0 && std::isfinite(phase.total))) {
    throw CompositionError(CompositionError::npos, "the total flow must be zero or more");
  }
  if (phase.items.empty()) throw CompositionError(CompositionError::npos, "the composition lists no component");
  switch (phase.basis) {
    case CompositionBasis::flows:
      throw CompositionError(CompositionError::npos, "per-component flows need no composition arithmetic");
    case CompositionBasis::mass_fraction:
    case CompositionBasis::mole_fraction:
    case CompositionBasis::volume_fraction: return from_fractions(phase);
    case CompositionBasis::molality: return from_molality(phase);
    case CompositionBasis::molarity:
    case CompositionBasis::mass_concentration: return from_per_volume(phase);
  }
  return {};
}

}  // namespace protonflow::host
