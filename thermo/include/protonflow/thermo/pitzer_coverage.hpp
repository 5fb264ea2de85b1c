// What a result solved with the Pitzer model must say about the species the parameters miss.
#pragma once

#include <string>
#include <vector>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"

namespace protonflow::thermo {

// For a system solved with ActivityModelKind::pitzer: one warning line naming the solutes present
// above 1e-4 mol/kg that the bundled parameters do not cover (below that they weigh nothing in a
// brine's balances; HCl(aq) near 1e-6 mol/kg in an acid brine is typical). Empty otherwise.
std::vector<std::string> describe_pitzer_coverage(const ChemicalSystem& system, const Speciation& state);

}  // namespace protonflow::thermo
