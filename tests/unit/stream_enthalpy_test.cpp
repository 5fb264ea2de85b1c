#include <catch2/catch.hpp>

#include <cmath>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/stream_enthalpy.hpp"

using namespace protonflow::thermo;

namespace {

const Database& database() {
  static const Database db = load_database(default_data_directory());
  return db;
}

constexpr double kilogram_of_water = 1.0 / constants::water_molar_mass;

}  // namespace

TEST_CASE("energy round trip: the temperature of a state's own enthalpy is the state's temperature") {
  const ChemicalSystem system(database(), {"H2O", "H2SO4", "NaOH", "NH3", "CO2"});
  EquilibriumSolver solver(system);
  const std::vector<double> amounts{kilogram_of_water, 0.05, 0.07, 0.02, 0.01};
  for (const double t : {278.15, 298.15, 331.7, 365.0}) {
    Speciation state;
    solver.solve(t, 101325.0, amounts, {}, state);
    const double h = state_enthalpy(system, state);
    Speciation recovered;
    solver.reset_warm_start();
    solve_at_enthalpy(solver, h, 101325.0, amounts, {}, recovered);
    CHECK(recovered.temperature == Approx(t).margin(1e-6));
    CHECK(recovered.ph == Approx(state.ph).margin(1e-8));
  }
}

TEST_CASE("the enthalpy of a state rises with temperature by about its heat capacity") {
  const ChemicalSystem system(database(), {"H2O", "NaCl"});
  EquilibriumSolver solver(system);
  const std::vector<double> amounts{kilogram_of_water, 0.01};
  const Speciation cold = solver.solve(298.15, 101325.0, amounts);
  const Speciation warm = solver.solve(299.15, 101325.0, amounts);
  // 1 kg of water: Cp ≈ 4.18 kJ/K (NIST-JANAF via the Shomate form; the 0.01 mol of salt adds little).
  CHECK(state_enthalpy(system, warm) - state_enthalpy(system, cold) == Approx(4180.0).epsilon(0.01));
}

TEST_CASE("an enthalpy beyond the data's temperature range is a typed error") {
  const ChemicalSystem system(database(), {"H2O", "NaCl"});
  EquilibriumSolver solver(system);
  const std::vector<double> amounts{kilogram_of_water, 0.01};
  const Speciation state = solver.solve(298.15, 101325.0, amounts);
  const double h = state_enthalpy(system, state);
  Speciation out;
  CHECK_THROWS_WITH(solve_at_enthalpy(solver, h + 5e5, 101325.0, amounts, {}, out), Catch::Contains("above the data's range"));
  CHECK_THROWS_WITH(solve_at_enthalpy(solver, h - 5e5, 101325.0, amounts, {}, out), Catch::Contains("below the data's range"));
}

TEST_CASE("a present species without enthalpy data is named, not guessed") {
  // Citrate has no formation enthalpy in NBS 1982 (C1 and C2 substances only), so none in the data.
  const ChemicalSystem system(database(), {"H2O", "C6H8O7"});
  EquilibriumSolver solver(system);
  const Speciation state = solver.solve(298.15, 101325.0, std::vector<double>{kilogram_of_water, 0.01});
  CHECK_THROWS_WITH(state_enthalpy(system, state), Catch::Contains("no formation enthalpy"));
}
