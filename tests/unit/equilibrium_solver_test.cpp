#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"
#include "protonflow/thermo/errors.hpp"

using namespace protonflow::thermo;

namespace {

const Database& database() {
  static const Database db = load_database(default_data_directory());
  return db;
}

constexpr double kilogram_of_water = 1.0 / constants::water_molar_mass;  // mol

}  // namespace

TEST_CASE("a warm start reproduces the cold answer in fewer iterations") {
  const ChemicalSystem system(database(), {"H2O", "H2SO4", "NaOH", "CaCl2", "Na2CO3"});
  EquilibriumSolver solver(system);
  const std::vector<double> amounts{kilogram_of_water, 0.05, 0.06, 0.01, 0.02};
  const Speciation cold = solver.solve(298.15, 101325.0, amounts);
  CHECK_FALSE(cold.warm_started);
  const Speciation warm = solver.solve(298.15, 101325.0, amounts);
  CHECK(warm.warm_started);
  CHECK(warm.iterations <= 1);
  CHECK(warm.ph == Approx(cold.ph).epsilon(1e-12));
  for (std::size_t i = 0; i < cold.molality.size(); ++i) CHECK(warm.molality[i] == Approx(cold.molality[i]).epsilon(1e-10));
}

TEST_CASE("a component that is absent leaves its species at zero") {
  const ChemicalSystem system(database(), {"H2O", "HCl", "Na2SO4"});
  EquilibriumSolver solver(system);
  const Speciation out = solver.solve(298.15, 101325.0, std::vector<double>{kilogram_of_water, 0.01, 0.0});
  CHECK(out.molality[system.index_of_solute("SO4^2-")] == 0.0);
  CHECK(out.molality[system.index_of_solute("HSO4^-")] == 0.0);
  CHECK(out.molality[system.index_of_solute("Na^+")] == 0.0);
  CHECK(out.molality[system.index_of_solute("Cl^-")] == Approx(0.01).epsilon(1e-6));
}

TEST_CASE("impossible inputs are typed errors with a plain message") {
  const ChemicalSystem system(database(), {"H2O", "HCl"});
  EquilibriumSolver solver(system);
  const auto kind_of = [&](double t, double p, std::vector<double> amounts) {
    try {
      solver.solve(t, p, amounts);
    } catch (const ThermoError& e) {
      return e.kind();
    }
    FAIL("no error thrown");
    return ErrorKind::bad_input;
  };
  CHECK(kind_of(298.15, 101325.0, {kilogram_of_water, -0.1}) == ErrorKind::bad_input);
  CHECK(kind_of(298.15, 101325.0, {kilogram_of_water, std::nan("")}) == ErrorKind::bad_input);
  CHECK(kind_of(298.15, 101325.0, {0.0, 0.1}) == ErrorKind::bad_input);
  CHECK(kind_of(298.15, 101325.0, {kilogram_of_water}) == ErrorKind::bad_input);
  CHECK(kind_of(400.0, 101325.0, {kilogram_of_water, 0.1}) == ErrorKind::out_of_range);
  CHECK(kind_of(260.0, 101325.0, {kilogram_of_water, 0.1}) == ErrorKind::out_of_range);
  CHECK(kind_of(298.15, -5.0, {kilogram_of_water, 0.1}) == ErrorKind::bad_input);
  CHECK_THROWS_WITH(solver.solve(400.0, 101325.0, std::vector<double>{kilogram_of_water, 0.1}),
                    Catch::Contains("outside the species data's range"));
  CHECK_THROWS_WITH(ChemicalSystem(database(), {"HCl"}), Catch::Contains("must include H2O"));
  CHECK_THROWS_WITH(ChemicalSystem(database(), {"H2O", "XeF2"}), Catch::Contains("unknown element"));
}

TEST_CASE("a solve that cannot converge says so with every residual") {
  SolverOptions tight;
  tight.max_iterations = 1;
  const ChemicalSystem system(database(), {"H2O", "H3PO4", "NaOH", "CaCl2"});
  EquilibriumSolver solver(system, tight);
  try {
    solver.solve(298.15, 101325.0, std::vector<double>{kilogram_of_water, 1.0, 2.9, 0.7});
    FAIL("a one-iteration solve of a phosphate system should not converge");
  } catch (const ConvergenceError& e) {
    CHECK(e.kind() == ErrorKind::not_converged);
    CHECK_THAT(e.what(), Catch::Contains("did not converge"));
    CHECK(e.residuals().size() == system.solutes().size() + 1);
    CHECK(e.residuals().front().equation == "charge balance");
  }
}

TEST_CASE("solutions at the ends of the temperature range converge") {
  const ChemicalSystem system(database(), {"H2O", "NH3", "CO2", "CH3COOH"});
  EquilibriumSolver solver(system);
  for (const double t : {273.15, 323.15, 373.15}) {
    const Speciation out = solver.solve(t, 101325.0, std::vector<double>{kilogram_of_water, 0.1, 0.05, 0.02});
    CHECK(out.residual_norm < 1e-10);
  }
}

// The analytic Jacobian (docs/equilibrium.md, "Jacobian") against central finite differences of
// the residual, off the solution, for every activity model and every kind of row: mass action,
// balances, saturation of a present solid, an open gas, a closed gas phase. Central differences
// with a step of 1e-6 agree to about 1e-9 of a row's largest entry; 1e-6 leaves room.
TEST_CASE("the analytic Jacobian matches finite differences of the residual") {
  constexpr double agreement = 1e-6;
  for (const ActivityModelKind model : {ActivityModelKind::ideal, ActivityModelKind::davies, ActivityModelKind::b_dot,
                                         ActivityModelKind::pitzer}) {
    INFO("activity model " << static_cast<int>(model));
    SystemOptions options;
    options.activity = model;
    {
      const ChemicalSystem system(database(), {"H2O", "NaOH", "HCl", "H2SO4", "CO2", "NH3", "Ca(OH)2"}, options);
      EquilibriumSolver solver(system);
      solver.solve(298.15, 101325.0, std::vector<double>{kilogram_of_water, 0.05, 0.03, 0.02, 0.01, 0.04, 0.005});
      CHECK(solver.jacobian_finite_difference_error() < agreement);
      // A concentrated brine, where the activity terms dominate the mass-action rows.
      solver.solve(323.15, 101325.0, std::vector<double>{kilogram_of_water, 3.0, 2.5, 0.4, 0.05, 0.1, 0.02});
      CHECK(solver.jacobian_finite_difference_error() < agreement);
    }
    {
      SystemOptions with_solids = options;
      with_solids.allowed_solids = {"gypsum", "calcite"};
      with_solids.open_gases = {"CO2(g)"};
      const ChemicalSystem system(database(), {"H2O", "CaCl2", "Na2SO4", "NaOH"}, with_solids);
      EquilibriumSolver solver(system);
      const std::vector<double> air{42.0};  // Pa, CO2 of air (about 415 ppm, from memory)
      Speciation s;
      solver.solve(298.15, 101325.0, std::vector<double>{kilogram_of_water, 0.2, 0.2, 0.1}, air, s);
      REQUIRE(std::any_of(s.solid_amount.begin(), s.solid_amount.end(), [](double n) { return n > 0.0; }));
      CHECK(solver.jacobian_finite_difference_error() < agreement);
    }
    {
      SystemOptions closed = options;
      closed.gas_phase = true;
      const ChemicalSystem system(database(), {"H2O", "NaHCO3", "HCl"}, closed);
      EquilibriumSolver solver(system);
      const Speciation s = solver.solve(298.15, 101325.0, std::vector<double>{kilogram_of_water, 0.5, 0.5});
      REQUIRE(s.gas_phase_present);
      CHECK(solver.jacobian_finite_difference_error() < agreement);
    }
  }
}

// A warm solve starts its first Newton step on the previous answer's LU (docs/equilibrium.md,
// "Solving with KINSOL"); its answer must be the cold answer, whether the phase set stays, changes,
// or the temperature moves.
TEST_CASE("warm solves from a nearby state reach the cold answer, solids and gas included") {
  SystemOptions options;
  options.activity = ActivityModelKind::b_dot;
  options.allowed_solids = {"gypsum", "calcite"};
  options.open_gases = {"CO2(g)"};
  const ChemicalSystem system(database(), {"H2O", "CaCl2", "Na2SO4", "NaOH"}, options);
  EquilibriumSolver warm_solver(system);
  const std::vector<double> air{42.0};  // Pa, CO2 of air (about 415 ppm, from memory)
  Speciation warm, cold;
  // Calcium from below to above gypsum saturation and back, 25 then 40 °C: steps of 1 % and a change
  // of phase set on the way.
  for (const double temperature : {298.15, 313.15}) {
    for (double calcium = 0.01; calcium < 0.4; calcium *= 1.3) {
      const std::vector<double> amounts{kilogram_of_water, calcium, 0.1, 0.02};
      INFO("T " << temperature << " K, CaCl2 " << calcium << " mol");
      for (const double step : {1.0, 1.01}) {
        std::vector<double> nearby = amounts;
        for (std::size_t c = 1; c < nearby.size(); ++c) nearby[c] *= step;
        warm_solver.solve(temperature, 101325.0, nearby, air, warm);
        EquilibriumSolver cold_solver(system);
        cold_solver.solve(temperature, 101325.0, nearby, air, cold);
        REQUIRE_FALSE(cold.warm_started);
        for (std::size_t i = 0; i < cold.molality.size(); ++i)
          CHECK(warm.molality[i] == Approx(cold.molality[i]).epsilon(1e-9).margin(1e-300));
        for (std::size_t p = 0; p < cold.solid_amount.size(); ++p)
          CHECK(warm.solid_amount[p] == Approx(cold.solid_amount[p]).epsilon(1e-9).margin(1e-15));
        CHECK(warm.gas_uptake[0] == Approx(cold.gas_uptake[0]).epsilon(1e-9).margin(1e-15));
      }
    }
  }
}
