// Tableau method (Morel & Morgan 1972): a formula component as a combination of basis species.
#pragma once

#include <string_view>
#include <utility>
#include <vector>

#include "protonflow/thermo/database.hpp"

namespace protonflow::thermo {

// Basis species index (into the database) and stoichiometric coefficient.
using BasisCombination = std::vector<std::pair<std::size_t, double>>;

// Expresses a neutral formula (H2SO4, NaOH, CaSO4.2H2O, CH3COOH) as basis species plus H2O and
// H^+. A formula that names a database species uses that species' reaction; otherwise the
// combination with the fewest basis species wins, and a tie is an error (see docs/equilibrium.md).
// Throws ThermoError(unknown_species) for a formula no basis can express.
BasisCombination decompose(const Database& database, std::string_view component);

}  // namespace protonflow::thermo
