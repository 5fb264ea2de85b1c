// The reduced form and the Schur-complement solve of the full form (docs/equilibrium.md, "Reduced
// form"): the same answers as the full form, and the reduced form's Jacobian checked by finite
// differences.
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
const std::vector<double> air{42.0};  // Pa, CO2 of air (about 415 ppm, from memory)

struct Case {
  const char* name;
  std::vector<std::string> components;
  std::vector<double> amounts;
  double temperature;
  bool solids_and_air;
  bool gas_phase;
};

// The benchmark's system dilute and as a brine, a solution saturated with gypsum and calcite under
// air, and a closed system that exsolves CO2.
const std::vector<Case>& cases() {
  static const std::vector<Case> all{
      {"dilute", {"H2O", "NaOH", "HCl", "H2SO4", "CO2", "NH3", "Ca(OH)2"}, {kilogram_of_water, 0.05, 0.03, 0.02, 0.01, 0.04, 0.005}, 298.15, false, false},
      {"brine", {"H2O", "NaOH", "HCl", "H2SO4", "CO2", "NH3", "Ca(OH)2"}, {kilogram_of_water, 3.0, 2.5, 0.4, 0.05, 0.1, 0.02}, 323.15, false, false},
      {"solids and air", {"H2O", "CaCl2", "Na2SO4", "NaOH"}, {kilogram_of_water, 0.2, 0.2, 0.1}, 298.15, true, false},
      {"gas phase", {"H2O", "NaHCO3", "HCl"}, {kilogram_of_water, 0.5, 0.5}, 298.15, false, true},
  };
  return all;
}

ChemicalSystem system_of(const Case& c, ActivityModelKind model) {
  SystemOptions options;
  options.activity = model;
  if (c.solids_and_air) {
    options.allowed_solids = {"gypsum", "calcite"};
    options.open_gases = {"CO2(g)"};
  }
  options.gas_phase = c.gas_phase;
  return ChemicalSystem(database(), c.components, options);
}

Speciation solve(EquilibriumSolver& solver, const Case& c, const std::vector<double>& amounts) {
  Speciation out;
  solver.solve(c.temperature, 101325.0, amounts, c.solids_and_air ? air : std::vector<double>{}, out);
  return out;
}

}  // namespace

// Central differences of F_reduced (each evaluation solving the secondary solutes afresh) with a
// step of 1e-6 agree with the Schur complement to about 1e-9 of a row's largest entry.
TEST_CASE("the reduced form's Jacobian matches finite differences of its residual") {
  constexpr double agreement = 1e-6;
  SolverOptions reduced;
  reduced.form = NewtonForm::reduced;
  for (const ActivityModelKind model : {ActivityModelKind::ideal, ActivityModelKind::davies, ActivityModelKind::b_dot,
                                         ActivityModelKind::pitzer}) {
    for (const Case& c : cases()) {
      INFO("activity model " << static_cast<int>(model) << ", " << c.name);
      const ChemicalSystem system = system_of(c, model);
      EquilibriumSolver solver(system, reduced);
      const Speciation s = solve(solver, c, c.amounts);
      if (c.solids_and_air) REQUIRE(std::any_of(s.solid_amount.begin(), s.solid_amount.end(), [](double n) { return n > 0.0; }));
      if (c.gas_phase) REQUIRE(s.gas_phase_present);
      CHECK(solver.jacobian_finite_difference_error() < agreement);
    }
  }
}

// The three forms solve the same equations to the same tolerance: cold and then warm (after a 1 %
// change of every amount), their molalities, solid amounts and gas amounts agree to 1e-9.
TEST_CASE("the reduced form and the Schur-complement solve reach the full form's answer") {
  const auto agree = [](const std::vector<double>& a, const std::vector<double>& b) {
    REQUIRE(a.size() == b.size());
    for (std::size_t i = 0; i < a.size(); ++i) CHECK(std::abs(a[i] - b[i]) <= 1e-9 * std::max(std::abs(a[i]), 1e-300) + 1e-300);
  };
  for (const ActivityModelKind model : {ActivityModelKind::davies, ActivityModelKind::pitzer}) {
    for (const Case& c : cases()) {
      const ChemicalSystem system = system_of(c, model);
      EquilibriumSolver full(system);
      for (const NewtonForm form : {NewtonForm::full_by_schur, NewtonForm::reduced}) {
        INFO("activity model " << static_cast<int>(model) << ", " << c.name << ", form " << static_cast<int>(form));
        SolverOptions options;
        options.form = form;
        EquilibriumSolver other(system, options);
        full.reset_warm_start();
        auto amounts = c.amounts;
        for (int pass = 0; pass < 2; ++pass) {
          const Speciation expected = solve(full, c, amounts);
          const Speciation actual = solve(other, c, amounts);
          CHECK(actual.warm_started == (pass == 1));
          CHECK(actual.residual_norm <= 1e-12);
          agree(actual.molality, expected.molality);
          agree(actual.solid_amount, expected.solid_amount);
          agree(actual.gas_amount, expected.gas_amount);
          for (std::size_t k = 1; k < amounts.size(); ++k) amounts[k] *= 1.01;
        }
      }
    }
  }
}

// 0.1085 mol Ca(OH)2 in 2.65 g of water (41 mol/kg, far beyond the Davies model) with traces of the
// other components, at 85.7 °C: a reduced Newton step from the cold start reaches a point whose
// residual is NaN. KINSOL's line search, given a NaN norm, never returns (without the reduced
// callback's NaN test this solve made 5 million residual calls in 10 s); with it the NaN is a
// recoverable failure, and the solve ends in the typed error with its residuals (the full form does
// not solve this input either). The solver then serves the next input as a fresh one.
TEST_CASE("a reduced-form solve that reaches a NaN residual ends in the typed error and the solver recovers") {
  const Case& dilute = cases().front();
  const ChemicalSystem system = system_of(dilute, ActivityModelKind::davies);
  SolverOptions options;
  options.form = NewtonForm::reduced;
  EquilibriumSolver reduced(system, options);
  const std::vector<double> caustic_paste{0.14722545198488754,     1.6074599944141515e-41, 1.2421707572207412e-84,
                                          1.0848900107300936e-125, 5.8907204855721807e-298, 1.935406916721951e-202,
                                          0.10852469714610535};
  Speciation s;
  try {
    reduced.solve(358.8642857142857, 101325.0, caustic_paste, s);
    FAIL("the solve returned an answer, pH " << s.ph);
  } catch (const ConvergenceError& error) {
    CHECK(error.residuals().size() == system.solutes().size() + 1);
  }
  EquilibriumSolver full(system);
  const Speciation expected = solve(full, dilute, dilute.amounts);
  const Speciation actual = solve(reduced, dilute, dilute.amounts);
  CHECK_FALSE(actual.warm_started);
  CHECK(actual.residual_norm <= 1e-12);
  for (std::size_t i = 0; i < expected.molality.size(); ++i)
    CHECK(std::abs(actual.molality[i] - expected.molality[i]) <= 1e-9 * expected.molality[i] + 1e-300);
}
