// A warm solve must allocate nothing: every malloc of the process is counted while it runs.
#include <cstdio>
#include <cstdlib>
#include <vector>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"

#include "../support/malloc_counter.hpp"

using protonflow::test_support::allocations;
using protonflow::test_support::counting_allocations;

int main() {
  using namespace protonflow::thermo;
  const Database database = load_database(default_data_directory());
  const ChemicalSystem system(database, {"H2O", "NaCl", "H2SO4", "Na2CO3", "NH3", "CaCl2"});
  // Every Newton form (docs/equilibrium.md, "Reduced form").
  int failures = 0;
  for (const NewtonForm form : {NewtonForm::full, NewtonForm::full_by_schur, NewtonForm::reduced}) {
    SolverOptions options;
    options.form = form;
    EquilibriumSolver solver(system, options);
    std::vector<double> amounts{1.0 / constants::water_molar_mass, 0.05, 0.02, 0.01, 0.03, 0.005};
    Speciation out;
    solver.solve(298.15, 101325.0, amounts, out);  // cold: sizes every buffer
    amounts[2] *= 1.01;                            // a nearby state, as in a flowsheet iteration
    allocations = 0;
    counting_allocations = true;
    solver.solve(298.15, 101325.0, amounts, out);
    counting_allocations = false;
    if (!out.warm_started) {
      std::printf("FAILED: the second solve of form %d did not warm-start\n", static_cast<int>(form));
      return 1;
    }
    std::printf("form %d: %ld allocations in a warm solve (%ld Newton iterations)\n", static_cast<int>(form), allocations,
                out.iterations);
    failures += allocations == 0 ? 0 : 1;
  }
  return failures == 0 ? 0 : 1;
}
