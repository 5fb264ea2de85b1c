#include "protonflow/thermo/pitzer_coverage.hpp"

#include <cmath>
#include <fmt/format.h>
#include <fmt/ranges.h>

#include "protonflow/thermo/activity_pitzer.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/pitzer_parameters.hpp"

namespace protonflow::thermo {

std::vector<std::string> describe_pitzer_coverage(const ChemicalSystem& system, const Speciation& state) {
  if (system.options().activity != ActivityModelKind::pitzer) return {};
  SoluteProperties p;
  for (const Solute& s : system.solutes()) {
    p.charge.push_back(s.charge);
    p.ion_size_angstrom.push_back(s.ion_size_angstrom);
    p.name.push_back(s.name);
  }
  const PitzerModel model(std::move(p), bundled_pitzer_parameters());
  std::vector<std::string> uncovered;
  for (const std::string& name : model.species_without_parameters())
    if (state.molality[system.index_of_solute(name)] >= 1e-4) uncovered.push_back(name);
  std::vector<std::string> lines;
  if (!uncovered.empty())
    lines.push_back(fmt::format("the Pitzer parameters do not cover {}: only the Debye-Hückel term acts on these ions "
                                "(neutral ones keep γ = 1)",
                                fmt::join(uncovered, ", ")));
  for (std::string& line : describe_pitzer_temperature_range(system, state)) lines.push_back(std::move(line));
  return lines;
}

namespace {

bool varies_with_temperature(const PitzerCoefficient& c) {
  return c.has_function || c.d_dT != 0.0 || c.d2_dT2 != 0.0 || c.d3_dT3 != 0.0;
}

}  // namespace

std::vector<std::string> describe_pitzer_temperature_range(const ChemicalSystem& system, const Speciation& state) {
  constexpr double major = 0.1;            // mol/kg: an ion that weighs in a brine's activities and heats
  constexpr double near_reference = 5.0;   // K: within this of 25 °C the 25 °C parameters serve
  const double t = state.temperature;
  if (system.options().activity != ActivityModelKind::pitzer || std::abs(t - constants::reference_temperature) <= near_reference) return {};
  const auto present = [&](const std::string& name) {
    for (std::size_t i = 0; i < system.solutes().size(); ++i)
      if (system.solutes()[i].name == name) return state.molality[i] >= major;
    return false;
  };
  std::vector<std::string> lines;
  for (const PitzerBinary& b : bundled_pitzer_parameters().binary) {
    if (!present(b.cation) || !present(b.anion)) continue;
    const bool varies = varies_with_temperature(b.beta0) || varies_with_temperature(b.beta1) ||
                        varies_with_temperature(b.beta2) || varies_with_temperature(b.c_phi);
    if (!varies)
      lines.push_back(fmt::format("the Pitzer parameters of {}–{} have no temperature dependence: at {:.0f} °C they are "
                                  "held at their 25 °C values, and its activity coefficients and heats of dilution carry "
                                  "an error that grows with the distance from 25 °C",
                                  b.cation, b.anion, t - 273.15));
    else if (t < b.minimum_temperature || t > b.maximum_temperature)
      lines.push_back(fmt::format("the Pitzer parameters of {}–{} were fitted from {:.0f} to {:.0f} °C: at {:.0f} °C they "
                                  "are held at their values at the nearer edge",
                                  b.cation, b.anion, b.minimum_temperature - 273.15, b.maximum_temperature - 273.15,
                                  t - 273.15));
  }
  return lines;
}

}  // namespace protonflow::thermo
