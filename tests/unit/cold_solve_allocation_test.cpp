// A cold solve after the first must allocate nothing: the cold start's work arrays are sized once per
// solver and reused by every pass (docs/equilibrium.md, "First guess, revisited"). Every malloc of
// the process is counted while it runs.
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

namespace {

// Solves cold (no warm start) at `amounts` and returns the allocations counted, or −1 if the solve
// was not a cold one.
long cold_solve_allocations(protonflow::thermo::EquilibriumSolver& solver, const std::vector<double>& amounts,
                            const std::vector<double>& pressures, protonflow::thermo::Speciation& out) {
  solver.reset_warm_start();
  allocations = 0;
  counting_allocations = true;
  solver.solve(298.15, 101325.0, amounts, pressures, out);
  counting_allocations = false;
  return out.warm_started ? -1 : allocations;
}

}  // namespace

int main() {
  using namespace protonflow::thermo;
  const Database database = load_database(default_data_directory());
  int failures = 0;

  // The solution of the warm-solve test: three passes of the guess, then Newton.
  {
    const ChemicalSystem system(database, {"H2O", "NaCl", "H2SO4", "Na2CO3", "NH3", "CaCl2"});
    EquilibriumSolver solver(system);
    std::vector<double> amounts{1.0 / constants::water_molar_mass, 0.05, 0.02, 0.01, 0.03, 0.005};
    Speciation out;
    solver.solve(298.15, 101325.0, amounts, out);  // sizes every buffer
    amounts[2] *= 1.5;                             // another state, solved from the cold start again
    const long counted = cold_solve_allocations(solver, amounts, {}, out);
    std::printf("%ld allocations in a cold solve (%ld Newton iterations)\n", counted, out.iterations);
    failures += counted == 0 ? 0 : 1;
  }
  // Lime on sulfuric acid open to air with gypsum and calcite allowed: the guess swaps the open gas
  // and the present solids into its basis and solves for their amounts.
  {
    SystemOptions options;
    options.allowed_solids = {"gypsum", "calcite"};
    options.open_gases = {"CO2(g)"};
    const ChemicalSystem system(database, {"H2O", "H2SO4", "Ca(OH)2", "CO2"}, options);
    EquilibriumSolver solver(system);
    std::vector<double> amounts{1.0 / constants::water_molar_mass, 0.1, 0.15, 0.001};
    const std::vector<double> pressures{40.0};
    Speciation out;
    solver.solve(298.15, 101325.0, amounts, pressures, out);
    amounts[2] *= 1.2;
    const long counted = cold_solve_allocations(solver, amounts, pressures, out);
    std::size_t present = 0;
    for (double amount : out.solid_amount) present += amount > 0.0 ? 1 : 0;
    std::printf("%ld allocations in a cold solve with %zu solids present and a gas\n", counted, present);
    failures += counted == 0 && present > 0 ? 0 : 1;
  }
  return failures == 0 ? 0 : 1;
}
