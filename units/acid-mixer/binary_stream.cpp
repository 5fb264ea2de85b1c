#include "binary_stream.hpp"

#include <algorithm>
#include <string>

namespace protonflow::units {

BinaryColumns::BinaryColumns(const unit::Slate& slate) {
  water = slate.find_component("H2O");
  for (const char* solute : {"H2SO4", "HCl", "HNO3", "NaOH"}) {
    if (const auto column = slate.find_component(solute)) solutes.push_back({thermo::concentrated_binary_of(solute), *column});
  }
}

std::optional<BinaryComposition> binary_composition(const BinaryColumns& columns, const thermo::ChemicalSystem& system,
                                                    std::span<const double> totals) {
  if (!columns.water) return std::nullopt;
  BinaryComposition composition;
  double solute_mass = 0.0;
  for (std::size_t c = 0; c < totals.size(); ++c) {
    if (totals[c] == 0.0) continue;
    const double mass = totals[c] * system.component_molar_mass(c);
    composition.mass += mass;
    if (c == *columns.water) continue;
    const auto solute = std::ranges::find(columns.solutes, c, &BinaryColumns::Solute::column);
    if (solute == columns.solutes.end() || (composition.binary && *composition.binary != solute->binary)) return std::nullopt;
    composition.binary = solute->binary;
    solute_mass += mass;
  }
  composition.solute_fraction = composition.mass > 0.0 ? solute_mass / composition.mass : 0.0;
  return composition;
}

std::optional<BinaryComposition> binary_composition(const BinaryColumns& columns, const thermo::ChemicalSystem& system,
                                                    const unit::InletState& stream) {
  for (std::size_t row = 1; row * stream.component_count < stream.flows.size(); ++row) {
    for (const double flow : stream.phase(row)) {
      if (flow != 0.0) return std::nullopt;
    }
  }
  return binary_composition(columns, system, stream.phase(PFU_AQUEOUS_ROW));
}

double binary_enthalpy(thermo::ConcentratedBinary fallback, const BinaryComposition& composition, double temperature) {
  return thermo::binary_specific_enthalpy(composition.binary.value_or(fallback), temperature, composition.solute_fraction);
}

}  // namespace protonflow::units
