#include <catch2/catch.hpp>

#include <cmath>
#include <random>

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
    CHECK(recovered.temperature == Approx(t).epsilon(0.0).margin(1e-6));
    CHECK(recovered.ph == Approx(state.ph).epsilon(0.0).margin(1e-8));
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
  CHECK_THROWS_WITH(solve_at_enthalpy(solver, h + 5e5, 101325.0, amounts, {}, out), Catch::Contains("above the temperatures where it exists"));
  CHECK_THROWS_WITH(solve_at_enthalpy(solver, h - 5e5, 101325.0, amounts, {}, out), Catch::Contains("below the temperatures where it exists"));
}

TEST_CASE("a present species without enthalpy data is named, not guessed") {
  // Citrate has no formation enthalpy in NBS 1982 (C1 and C2 substances only), so none in the data.
  const ChemicalSystem system(database(), {"H2O", "C6H8O7"});
  EquilibriumSolver solver(system);
  const Speciation state = solver.solve(298.15, 101325.0, std::vector<double>{kilogram_of_water, 0.01});
  CHECK_THROWS_WITH(state_enthalpy(system, state), Catch::Contains("no formation enthalpy"));
}

TEST_CASE("near boiling, the adiabatic solve brackets the temperatures where a liquid exists") {
  // Pure water at 1 atm boils at 373.12 K (IAPWS-95), just below the data's 373.15 K: the top of
  // the range has no liquid in a closed vessel, yet 99 °C must still be found.
  SystemOptions options;
  options.gas_phase = true;
  const ChemicalSystem system(database(), {"H2O", "NaCl"}, options);
  EquilibriumSolver solver(system);
  const std::vector<double> amounts{kilogram_of_water, 0.001};
  const Speciation at_99 = solver.solve(372.15, 101325.0, amounts);
  const double h = state_enthalpy(system, at_99);
  Speciation found;
  solve_at_enthalpy(solver, h, 101325.0, amounts, {}, found);
  CHECK(found.temperature == Approx(372.15).epsilon(0.0).margin(1e-6));
  // 1 MJ more boils off part of the water at the boiling point (latent heat 2.26 MJ/kg, IAPWS-95,
  // from memory); 3 MJ more than the whole kilogram can take as a liquid-bearing state.
  solve_at_enthalpy(solver, h + 1e6, 101325.0, amounts, {}, found);
  CHECK(found.gas_phase_present);
  CHECK(found.temperature == Approx(373.12).margin(0.05));
  CHECK(found.water_mass < 0.7);
  CHECK_THROWS_WITH(solve_at_enthalpy(solver, h + 3e6, 101325.0, amounts, {}, found), Catch::Contains("boils"));
}

TEST_CASE("from any estimate, the adiabatic solve finds the temperature the whole-range bracket finds") {
  // Random compositions, target temperatures, estimates anywhere in the data's range and heat
  // capacities off by up to a factor of 10 either way, or none: the search from the estimate must
  // land within the 1e-9 K bracket of the search over the whole range.
  const ChemicalSystem system(database(), {"H2O", "H2SO4", "NaOH", "NH3", "CO2"});
  EquilibriumSolver solver(system);
  std::mt19937 random(20261202);
  std::uniform_real_distribution<double> unit(0.0, 1.0);
  const double t_min = system.minimum_temperature(), t_max = system.maximum_temperature();
  for (int trial = 0; trial < 60; ++trial) {
    const std::vector<double> amounts{kilogram_of_water, 0.1 * unit(random), 0.1 * unit(random), 0.05 * unit(random),
                                      0.02 * unit(random)};
    const double target_t = 275.0 + 95.0 * unit(random);
    Speciation state;
    solver.solve(target_t, 101325.0, amounts, {}, state);
    const double h = state_enthalpy(system, state);
    Speciation whole, near;
    solve_at_enthalpy(solver, h, 101325.0, amounts, {}, whole);
    TemperatureEstimate estimate;
    estimate.temperature = t_min + (t_max - t_min) * unit(random);
    if (trial % 3 != 0) estimate.heat_capacity = 4180.0 * std::pow(10.0, 2.0 * unit(random) - 1.0);  // J/K, 1 kg of water
    solve_at_enthalpy(solver, h, 101325.0, amounts, {}, near, nullptr, estimate);
    INFO("trial " << trial << ": target " << target_t << " K, estimate " << estimate.temperature << " K");
    CHECK(whole.temperature == Approx(target_t).epsilon(0.0).margin(1e-6));
    CHECK(near.temperature == Approx(whole.temperature).epsilon(0.0).margin(2e-9));
  }
}
