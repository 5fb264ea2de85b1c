#include "mixture_density.hpp"

#include <protonflow/thermo/errors.hpp>
#include <protonflow/thermo/formula.hpp>
#include <protonflow/thermo/water_properties.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <string_view>
#include <utility>

namespace protonflow::units {

namespace {

constexpr double cubic_centimetre = 1e-6;  // m³

// Molar mass of a solute from its name ("SO4^2-", "CO2(aq)"), kg/mol; 0 for a name that is not a
// formula (its mass is then in the liquid's total, at water's density, all the same).
double solute_molar_mass(std::string_view name) {
  if (name.ends_with("(aq)")) name.remove_suffix(4);
  try {
    return thermo::molar_mass(thermo::parse_formula(name));
  } catch (const thermo::ThermoError&) {
    return 0.0;
  }
}

// Partial molar volumes of ions at infinite dilution in water at 25 °C, cm³/mol, on the conventional
// scale V°(H^+) = 0: millero-1972 (from memory). Sums reproduce the salts' own V°: NaCl 16.62, HCl
// 17.83, NaOH −5.25, H2SO4 13.98, CaCl2 17.81 cm³/mol.
constexpr std::array<std::pair<std::string_view, double>, 15> ionic_volumes{{
    {"H^+", 0.0},      {"Na^+", -1.21},  {"K^+", 9.02},     {"NH4^+", 17.86},  {"Mg^2+", -21.17},
    {"Ca^2+", -17.85}, {"Fe^2+", -24.7}, {"Cl^-", 17.83},   {"NO3^-", 29.0},   {"OH^-", -4.04},
    {"SO4^2-", 13.98}, {"HSO4^-", 35.2}, {"HCO3^-", 24.29}, {"CO3^2-", -6.06}, {"F^-", -1.16},
}};

}  // namespace

double infinite_dilution_volume(const std::string& solute) {
  const auto* entry = std::ranges::find(ionic_volumes, std::string_view(solute), &std::pair<std::string_view, double>::first);
  return entry == ionic_volumes.end() ? std::numeric_limits<double>::quiet_NaN() : entry->second * cubic_centimetre;
}

MixtureDensity mixture_density(const thermo::ChemicalSystem& system, const thermo::Speciation& state, double liquid_mass) {
  MixtureDensity result;
  const double water_volume_per_kg = 1.0 / thermo::water_density(state.temperature);
  double tabulated_volume = 0.0, tabulated_mass = 0.0;
  const auto& solutes = system.solutes();
  for (std::size_t i = 0; i < solutes.size(); ++i) {
    const double amount = state.molality[i] * state.water_mass;
    if (!(amount > 0.0)) continue;
    const double volume = infinite_dilution_volume(solutes[i].name);
    const double mass = amount * solute_molar_mass(solutes[i].name);
    if (std::isnan(volume)) {
      result.without_volume.push_back(solutes[i].name);
      result.without_volume_mass_fraction += mass / liquid_mass;
      continue;
    }
    tabulated_volume += amount * volume;
    tabulated_mass += mass;
  }
  // The water and every solute without a volume: at the density of water.
  const double volume = (liquid_mass - tabulated_mass) * water_volume_per_kg + tabulated_volume;
  result.density = liquid_mass / volume;
  return result;
}

}  // namespace protonflow::units
