#include "protonflow/thermo/held_constants.hpp"

#include <cmath>
#include <cstddef>

#include <fmt/format.h>
#include <fmt/ranges.h>

#include "protonflow/thermo/constants.hpp"

namespace protonflow::thermo {

namespace {

// Below 5 K from 25 °C a missing enthalpy of 50 kJ/mol, typical of a hydrolysis step, moves log K by
// less than 0.15; beyond it the held constant is the larger error (common practice).
constexpr double temperature_margin = 5.0;        // K
// A species holding less than 1 % of its metal changes the dissolved total by less than 1 %.
constexpr double share_that_matters = 0.01;
// ZnOH^+ 56.1, NiOH^+ 52.0, AlOH^2+ 48.1 kJ/mol in the data (Baes & Mesmer 1976; Nordstrom et al. 1990).
constexpr double typical_hydrolysis_enthalpy = 50e3;  // J/mol

}  // namespace

bool held_at_reference_temperature(const TemperatureFunction& function) noexcept {
  return function.form == TemperatureFunction::Form::van_t_hoff && function.reaction_enthalpy == 0.0;
}

std::vector<std::string> describe_held_constants(const ChemicalSystem& system, const Speciation& state) {
  if (!(std::abs(state.temperature - constants::reference_temperature) >= temperature_margin)) return {};
  const auto& solutes = system.solutes();
  // Dissolved amount of each basis species over every solute it forms (mol/kg); index 0 is H^+.
  std::vector<double> dissolved(solutes.size(), 0.0);
  for (std::size_t i = 0; i < solutes.size(); ++i)
    for (std::size_t b = 1; b < solutes[i].stoichiometry.size(); ++b)
      if (solutes[i].stoichiometry[b] > 0.0) dissolved[b] += solutes[i].stoichiometry[b] * state.molality[i];
  std::vector<std::string> held;
  for (std::size_t i = 0; i < solutes.size(); ++i) {
    if (solutes[i].is_basis || !held_at_reference_temperature(solutes[i].log_k)) continue;
    double largest = 0.0;
    std::size_t of = 0;
    for (std::size_t b = 1; b < solutes[i].stoichiometry.size(); ++b) {
      if (!(solutes[i].stoichiometry[b] > 0.0 && dissolved[b] > 0.0)) continue;
      const double share = solutes[i].stoichiometry[b] * state.molality[i] / dissolved[b];
      if (share > largest) {
        largest = share;
        of = b;
      }
    }
    if (largest >= share_that_matters)
      held.push_back(fmt::format("{} ({:.3g} % of the dissolved {})", solutes[i].name, 100.0 * largest, solutes[of].name));
  }
  const auto& solids = system.solids();
  for (std::size_t s = 0; s < solids.size(); ++s)
    if (state.solid_amount[s] > 0.0 && held_at_reference_temperature(solids[s].log_k))
      held.push_back(solids[s].name + " (precipitated)");
  if (held.empty()) return {};
  // What a typical hydrolysis enthalpy would have moved log K by between 25 °C and this temperature.
  const double typical_shift = typical_hydrolysis_enthalpy / (constants::gas_constant * std::log(10.0)) *
                               std::abs(1.0 / state.temperature - 1.0 / constants::reference_temperature);
  return {fmt::format("at {:.1f} °C the constants of {} are held at their 25 °C values (no published reaction enthalpy "
                      "was found for them; docs/species-data.md): the dissolved amounts and solids they govern do not "
                      "follow the temperature (a reaction enthalpy of 50 kJ/mol, typical of a metal's first hydrolysis "
                      "step, would have moved log K by {:.2f} here)",
                      state.temperature - 273.15, fmt::join(held, ", "), typical_shift)};
}

}  // namespace protonflow::thermo
