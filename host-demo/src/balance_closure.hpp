// How well an answer closes the balances it was solved for, measured independently of the
// solver's own residual, from the reported molalities and the input amounts.
#pragma once

#include <span>
#include <string>
#include <vector>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"

namespace protonflow::host {

struct BalanceResidual {
  std::string quantity;  // a basis solute's name, or "H2O"
  double relative;       // (found − given) / (sum of the magnitudes of both sides' terms)
};

struct BalanceClosure {
  std::vector<BalanceResidual> mass;  // one per basis solute, then water
  double charge = 0.0;                // Σ z m / Σ |z| m
};

// amounts: mol of each component, in the order of system.components().
BalanceClosure measure_closure(const thermo::ChemicalSystem& system, std::span<const double> amounts,
                               const thermo::Speciation& speciation);

}  // namespace protonflow::host
