// From the amounts a user wrote in some basis to the moles of each formula component that the
// equilibrium solver takes, water included.
#pragma once

#include <string>
#include <vector>

#include "solution_file.hpp"

namespace protonflow::host {

// The slate of formula components and the amount of each, mol. Water ("H2O") is always present.
struct ComponentSlate {
  std::vector<std::string> names;
  std::vector<double> amounts;  // mol, same order as names
};

// The formula the solvent is written as in a slate.
inline constexpr std::string_view water_formula = "H2O";

// Converts the solution's components to moles. Molality: per water_mass (default 1 kg) of water.
// Mass fraction: per 1 kg of solution, with molar masses from the formulas. Throws InputError at
// the offending component (a formula that cannot be parsed, water where it may not be listed,
// fractions that add up to more than 1, and so on).
ComponentSlate to_component_slate(const SolutionInput& input);

}  // namespace protonflow::host
