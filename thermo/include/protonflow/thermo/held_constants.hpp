// What a result away from 25 °C must say about the species whose constants do not move with temperature.
#pragma once

#include <string>
#include <vector>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"
#include "protonflow/thermo/temperature_function.hpp"

namespace protonflow::thermo {

// True where log K does not vary with temperature: the van 't Hoff form with a reaction enthalpy of
// zero, which the data write for a reaction whose enthalpy no source searched gives
// (docs/species-data.md, "How log K(T) is computed").
bool held_at_reference_temperature(const TemperatureFunction& function) noexcept;

// For a state 5 K or more away from 298.15 K: one warning line naming the species whose constants are
// held at their 25 °C values and that matter in it: a solute holding at least 1 % of the dissolved
// amount of one of its basis species (H^+ aside), a solid present. Empty otherwise.
std::vector<std::string> describe_held_constants(const ChemicalSystem& system, const Speciation& state);

}  // namespace protonflow::thermo
