// The scrubber module, loaded as a host loads it: HCl into caustic against the stage-count bound,
// the balances of element, charge, mass and energy recomputed through protonflow_thermo, the
// typed errors and refusals. The column numerics alone: column_kremser_test.cpp.
#include <catch2/catch.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/constants.hpp>
#include <protonflow/thermo/database.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>

#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include "units_test_support.hpp"

using namespace units_test;
using host::ParameterValue;
namespace thermo = protonflow::thermo;

namespace {

const host::Module& scrubber_module() {
  static const host::Module module(UNITS_SCRUBBER_MODULE);
  return module;
}

struct Column {
  host::StreamState gas_out, liquor_out;
  host::Solution solution;
};

Column run(host::Instance& unit, const host::StreamState& gas, const host::StreamState& liquor) {
  host::StreamState no_reagent = liquor;  // reagent_in, unconnected: no flow
  std::ranges::fill(no_reagent.flows, 0.0);
  std::vector<host::StreamState> inlets{gas, liquor, no_reagent};
  std::vector<host::StreamState> outlets(2);
  Column c;
  c.solution = unit.solve(inlets, outlets);
  c.gas_out = outlets[0];
  c.liquor_out = outlets[1];
  return c;
}

const host::SeriesValues& series(const host::Instance& unit, const Column& c, const std::string& name) {
  const auto& declared = unit.unit_class().series;
  for (std::size_t i = 0; i < declared.size(); ++i)
    if (declared[i].name == name) return c.solution.series[i];
  throw std::logic_error("no series " + name);
}

double result(const host::Instance& unit, const Column& c, const std::string& name) {
  const auto& results = unit.unit_class().results;
  for (std::size_t r = 0; r < results.size(); ++r)
    if (results[r].name == name) return c.solution.results[r];
  throw std::logic_error("no result " + name);
}

const host::Slate caustic_slate{{"H2O", "CO2", "HCl", "NaOH"}, {}};

// A vent gas: CO2 as the carrier (the species data have no inert gas yet), a little water vapour
// and HCl; 1 atm, 25 °C.
host::StreamState vent_gas(double hcl, double temperature = 298.15) {
  host::StreamState gas = stream(caustic_slate, temperature, atmosphere);
  flow(gas, caustic_slate, PFU_GAS_ROW, "CO2") = 1.0;
  flow(gas, caustic_slate, PFU_GAS_ROW, "H2O") = 0.01;
  flow(gas, caustic_slate, PFU_GAS_ROW, "HCl") = hcl;
  return gas;
}

// kg_water kg/s of water with naoh mol/s of NaOH, 25 °C.
host::StreamState caustic(double kg_water, double naoh, double temperature = 298.15) {
  host::StreamState liquor = stream(caustic_slate, temperature, atmosphere);
  flow(liquor, caustic_slate, PFU_AQUEOUS_ROW, "H2O") = kg_water * mol_per_kg_water;
  flow(liquor, caustic_slate, PFU_AQUEOUS_ROW, "NaOH") = naoh;
  return liquor;
}

}  // namespace

TEST_CASE("scrubber: HCl into caustic leaves (1 - E)^N of itself, the bound of N stages of efficiency E", "[scrubber]") {
  // Over an alkaline liquor HCl has no back-pressure (p* ~ 1e-17 atm here), so each stage of
  // Murphree efficiency E takes the mole fraction to y_out = y_in + E (0 − y_in) = (1 − E) y_in,
  // and N stages to (1 − E)^N y_in: the most that N stages can do (Murphree 1925, the definition
  // of the efficiency). Mole fractions, not flows: the caustic takes up CO2 too, and the gas shrinks.
  for (const int stages : {1, 2, 3, 4}) {
    CAPTURE(stages);
    auto unit = scrubber_module().create(
        "scrubber", std::vector<ParameterValue>{{"stages", double(stages)}, {"efficiency_hcl", 0.5}}, caustic_slate);
    const Column c = run(unit, vent_gas(1e-3), caustic(1.0, 0.5));
    const double inlet_mole_fraction = 1e-3 / (1.0 + 0.01 + 1e-3);
    CHECK(result(unit, c, "outlet_hcl_ppmv") * 1e-6 / inlet_mole_fraction == Approx(std::pow(0.5, stages)).epsilon(1e-9));
    CHECK(result(unit, c, "liquor_outlet_ph") > 6.0);  // still alkaline enough to hold HCl
  }
  // Ideal stages: all of it, to below 1e-6 ppmv after two.
  auto ideal = scrubber_module().create("scrubber", std::vector<ParameterValue>{{"stages", 2.0}}, caustic_slate);
  const Column c = run(ideal, vent_gas(1e-3), caustic(1.0, 0.5));
  CHECK(result(ideal, c, "outlet_hcl_ppmv") < 1e-6);
  CHECK(result(ideal, c, "removal_hcl") == Approx(1.0).margin(1e-12));
}

TEST_CASE("scrubber: stage profiles come out as series, top stage first", "[scrubber]") {
  auto unit = scrubber_module().create(
      "scrubber", std::vector<ParameterValue>{{"stages", 4.0}, {"efficiency_hcl", 0.5}}, caustic_slate);
  const Column c = run(unit, vent_gas(1e-3), caustic(1.0, 0.5));
  const host::SeriesValues& temperature = series(unit, c, "stage_temperature");
  REQUIRE(temperature.x.size() == 4);
  CHECK(temperature.x.front() == 1.0);
  CHECK(temperature.y.back() == Approx(result(unit, c, "liquor_outlet_temperature")).epsilon(1e-15));
  // The HCl in the gas halves from stage to stage on the way up (E = 0.5, no back-pressure).
  const host::SeriesValues& hcl = series(unit, c, "stage_gas_hcl");
  REQUIRE(hcl.y.size() == 4);
  for (std::size_t j = 0; j + 1 < 4; ++j) CHECK(hcl.y[j] / hcl.y[j + 1] == Approx(0.5).epsilon(1e-9));
  CHECK(hcl.y.front() == Approx(result(unit, c, "outlet_hcl_ppmv") * 1e-6).epsilon(1e-12));
  CHECK(series(unit, c, "stage_ph").y.size() == 4);
  CHECK(series(unit, c, "stage_liquid_hcl").y.size() == 4);
  CHECK(series(unit, c, "stage_gas_so2").y.empty());  // SO2 is not on the slate
}

TEST_CASE("scrubber: element, charge, mass and energy balances close to round-off", "[scrubber]") {
  auto unit = scrubber_module().create("scrubber", std::vector<ParameterValue>{{"stages", 6.0}, {"efficiency", 0.7}},
                                       caustic_slate);
  const host::StreamState gas = vent_gas(2e-3, 313.15);
  const host::StreamState liquor = caustic(0.8, 0.2, 293.15);
  const Column c = run(unit, gas, liquor);

  // Each component column in = out (the column carries the slate's components, which here are
  // each one element group: H2O, C, Cl, Na).
  for (std::size_t k = 0; k < caustic_slate.components.size(); ++k) {
    CAPTURE(caustic_slate.components[k]);
    const double in = column_total(gas, caustic_slate, k) + column_total(liquor, caustic_slate, k);
    const double out = column_total(c.gas_out, caustic_slate, k) + column_total(c.liquor_out, caustic_slate, k);
    CHECK(out == Approx(in).epsilon(1e-11));
  }
  // Outlets in their own phases only.
  CHECK(flow(c.gas_out, caustic_slate, PFU_AQUEOUS_ROW, "H2O") == 0.0);
  CHECK(flow(c.liquor_out, caustic_slate, PFU_GAS_ROW, "CO2") == 0.0);

  // Energy, recomputed here: the liquids through the engine's equilibrium enthalpy, the gases as
  // ideal gases from the species data (ΔfH°, Cp), each at its stream's temperature.
  const thermo::Database database = thermo::load_database(thermo::default_data_directory());
  const thermo::ChemicalSystem liquid_system(database, caustic_slate.components);
  thermo::SystemOptions with_gas;
  with_gas.gas_phase = true;
  const thermo::ChemicalSystem gas_system(database, caustic_slate.components, with_gas);
  thermo::EquilibriumSolver solver(liquid_system);
  const auto liquid_enthalpy = [&](const host::StreamState& s) {
    std::vector<double> amounts(caustic_slate.components.size());
    for (std::size_t k = 0; k < amounts.size(); ++k) amounts[k] = s.flows[PFU_AQUEOUS_ROW * amounts.size() + k];
    const thermo::Speciation state = solver.solve(s.temperature, s.pressure, amounts);
    // Charge balance of the speciated liquor: Σ z m = 0 to round-off of the largest ion.
    double charge = 0.0, largest = 0.0;
    for (std::size_t i = 0; i < state.molality.size(); ++i) {
      charge += liquid_system.solutes()[i].charge * state.molality[i];
      largest = std::max(largest, std::abs(liquid_system.solutes()[i].charge * state.molality[i]));
    }
    CHECK(std::abs(charge) <= 1e-12 * largest);
    return thermo::state_enthalpy(liquid_system, state);
  };
  const auto gas_enthalpy = [&](const host::StreamState& s) {
    double h = 0.0;
    for (const thermo::PhaseSpecies& g : gas_system.phase_gases()) {
      const std::string component = g.name.substr(0, g.name.size() - 3);  // "HCl(g)" → "HCl"
      h += flow(s, caustic_slate, PFU_GAS_ROW, component) *
           (g.reference_enthalpy + g.heat_capacity * (s.temperature - thermo::constants::reference_temperature));
    }
    return h;
  };
  const double in = liquid_enthalpy(liquor) + gas_enthalpy(gas);
  const double out = liquid_enthalpy(c.liquor_out) + gas_enthalpy(c.gas_out);
  // Round-off of enthalpy flows of about 1.3e7 W; the column's energy residuals are solved to
  // 1e-10 of its throughput times 75 J/(mol K), about 4e-7 W.
  CHECK(std::abs(out - in) < 1e-6);
  // The gas left warmer than the liquor it met at the top, cooler than it came: the stages between.
  CHECK(result(unit, c, "gas_outlet_temperature") > 293.0);
  CHECK(result(unit, c, "gas_outlet_temperature") < 313.15);
}

TEST_CASE("scrubber: a column that cannot converge is a typed error with its residuals, not an answer", "[scrubber]") {
  // A trickle of liquor, far hotter than boiling at the column pressure, meeting a hot gas: the
  // gas can carry all of the water away, and no stage keeps a liquid.
  auto unit = scrubber_module().create("scrubber", std::vector<ParameterValue>{{"stages", 3.0}}, caustic_slate);
  host::StreamState liquor = caustic(0.001, 1e-4, 372.0);
  host::StreamState gas = vent_gas(1e-3, 372.0);
  gas.pressure = 0.2 * atmosphere;  // water boils near 60 °C here
  try {
    run(unit, gas, liquor);
    FAIL("the column returned an answer");
  } catch (const host::SolveError& error) {
    CHECK((error.status() == PFU_NOT_CONVERGED || error.status() == PFU_BAD_INLET));
    CHECK_THAT(std::string(error.what()), Catch::Matchers::Contains("scrubber"));
  }
}

TEST_CASE("scrubber: refusals name what is wrong", "[scrubber]") {
  const auto refusal = [](const std::vector<ParameterValue>& parameters, const host::Slate& slate) {
    try {
      (void)scrubber_module().create("scrubber", parameters, slate);
    } catch (const host::CreateError& error) {
      return std::string(error.what());
    }
    return std::string("created");
  };
  CHECK_THAT(refusal({{"stages", 2.5}}, caustic_slate), Catch::Matchers::Contains("whole number"));
  CHECK_THAT(refusal({{"limit_gas", std::string("so2")}, {"emission_limit", 1e-5}}, caustic_slate),
             Catch::Matchers::Contains("not a gas of the slate"));
  CHECK_THAT(refusal({{"limit_gas", std::string("hcl")}}, caustic_slate), Catch::Matchers::Contains("needs emission_limit"));
  // Sodium only as the carbonate, with CO2 also on the slate: no component carries Na alone.
  CHECK_THAT(refusal({}, host::Slate{{"H2O", "CO2", "HCl", "Na2CO3"}, {}}), Catch::Matchers::Contains("alone"));
}

TEST_CASE("scrubber: a column started from its previous answer finds the cold column's answer", "[scrubber]") {
  // The instance keeps its last profile and starts Newton from it (docs/units.md, "Warm start"):
  // the answer at the new feeds must be the one a fresh instance finds from its cold start, to
  // the column's tolerance, and the warm solve must have started from that profile: at the same
  // feeds once more it is already the answer (at most one Newton iteration, where the cold start
  // needs several).
  const auto parameters = std::vector<ParameterValue>{{"stages", 8.0}, {"efficiency", 0.7}};
  auto warm = scrubber_module().create("scrubber", parameters, caustic_slate);
  (void)run(warm, vent_gas(1e-3), caustic(1.0, 0.05));
  const Column again = run(warm, vent_gas(1.05e-3), caustic(1.02, 0.05));
  auto cold = scrubber_module().create("scrubber", parameters, caustic_slate);
  const Column fresh = run(cold, vent_gas(1.05e-3), caustic(1.02, 0.05));
  const Column repeated = run(warm, vent_gas(1.05e-3), caustic(1.02, 0.05));
  CHECK(result(warm, repeated, "newton_iterations") <= 1.0);
  CHECK(result(cold, fresh, "newton_iterations") > 1.0);
  for (std::size_t i = 0; i < fresh.gas_out.flows.size(); ++i) {
    CAPTURE(i);
    CHECK(again.gas_out.flows[i] == Approx(fresh.gas_out.flows[i]).epsilon(1e-8).margin(1e-25));
    CHECK(again.liquor_out.flows[i] == Approx(fresh.liquor_out.flows[i]).epsilon(1e-8).margin(1e-25));
  }
  CHECK(again.liquor_out.temperature == Approx(fresh.liquor_out.temperature).margin(1e-6));
  CHECK(result(warm, again, "outlet_hcl_ppmv") == Approx(result(cold, fresh, "outlet_hcl_ppmv")).epsilon(1e-7));
}

TEST_CASE("scrubber: stages_for_limit is the fewest stages whose own cold column meets the limit", "[scrubber]") {
  // The search solves other stage counts from the nearest column it has solved (docs/units.md,
  // "Stages for a limit"); its answer must be the N at which a fresh instance of N stages, solved
  // from its cold start, meets the limit and one of N − 1 stages does not. Limits met by fewer
  // stages than the column has, and by more.
  const auto cold_concentration = [](double stages) {
    auto unit = scrubber_module().create("scrubber", std::vector<ParameterValue>{{"stages", stages}, {"efficiency", 0.7}}, caustic_slate);
    return result(unit, run(unit, vent_gas(1e-3), caustic(1.0, 0.05)), "outlet_hcl_concentration");
  };
  for (const double limit : {200e-6, 10e-6, 1e-9}) {  // kg per normal m³: 200 and 10 mg/m³, 1 µg/m³
    CAPTURE(limit);
    auto unit = scrubber_module().create(
        "scrubber",
        std::vector<ParameterValue>{{"stages", 6.0}, {"efficiency", 0.7}, {"limit_gas", std::string("hcl")}, {"emission_limit", limit}},
        caustic_slate);
    const Column column = run(unit, vent_gas(1e-3), caustic(1.0, 0.05));
    const double fewest = result(unit, column, "stages_for_limit");
    REQUIRE(fewest >= 1.0);
    CHECK(cold_concentration(fewest) <= limit);
    if (fewest > 1.0) CHECK(cold_concentration(fewest - 1.0) > limit);
    // The reported column is still the six-stage one, its profiles its own.
    CHECK(series(unit, column, "stage_ph").y.size() == 6);
    CHECK(result(unit, column, "outlet_hcl_concentration") == Approx(cold_concentration(6.0)).epsilon(1e-7));
  }
}
