#include <catch2/catch.hpp>

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
