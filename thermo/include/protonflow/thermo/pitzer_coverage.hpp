// What a result solved with the Pitzer model must say about the species the parameters miss.
#pragma once

#include <string>
#include <vector>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"

namespace protonflow::thermo {

// For a system solved with ActivityModelKind::pitzer: one warning line naming the solutes present
// above 1e-4 mol/kg that the bundled parameters do not cover (below that they weigh nothing in a
// brine's balances; HCl(aq) near 1e-6 mol/kg in an acid brine is typical). Away from 25 °C, one more
// line per cation–anion pair, both ions above 0.1 mol/kg, whose parameters have no temperature
// dependence in the file (held at 25 °C) or are held at the edge of the range they were fitted over.
// Empty otherwise.
std::vector<std::string> describe_pitzer_coverage(const ChemicalSystem& system, const Speciation& state);

// The temperature lines alone (part of describe_pitzer_coverage).
std::vector<std::string> describe_pitzer_temperature_range(const ChemicalSystem& system, const Speciation& state);

}  // namespace protonflow::thermo
