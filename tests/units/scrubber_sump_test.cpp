// The scrubber with its sump, loaded as a host loads it: the unit's balances of component, charge,
// mass and energy with recirculation, bleed, reagent make-up and fresh water; the pH setpoint
// held; an unreachable setpoint refused with the highest pH the reagent can hold; HCl removal
// rising with the recirculation; the refusals of the sump's parameters; the warm start and the
// outlets-only pass against a fresh unit.
#include <catch2/catch.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/constants.hpp>
#include <protonflow/thermo/database.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>

#include <array>
#include <cmath>
#include <cstdint>
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

const host::Slate sump_slate{{"H2O", "N2", "CO2", "HCl", "NaOH"}, {}};

struct Run {
  host::StreamState gas_out, bleed;
  host::Solution solution;
};

Run run(host::Instance& unit, const host::StreamState& gas, const host::StreamState& make_up, const host::StreamState& reagent) {
  std::vector<host::StreamState> inlets{gas, make_up, reagent};
  std::vector<host::StreamState> outlets(2);
  Run r;
  r.solution = unit.solve(inlets, outlets);
  r.gas_out = outlets[0];
  r.bleed = outlets[1];
  return r;
}

double result(const host::Instance& unit, const Run& r, const std::string& name) {
  const auto& results = unit.unit_class().results;
  for (std::size_t i = 0; i < results.size(); ++i)
    if (results[i].name == name) return r.solution.results[i];
  throw std::logic_error("no result " + name);
}

// A vent: nitrogen carrying water vapour, a little CO2 (about that of air) and HCl; 1 atm.
host::StreamState vent(double hcl, double temperature = 303.15) {
  host::StreamState gas = stream(sump_slate, temperature, atmosphere);
  flow(gas, sump_slate, PFU_GAS_ROW, "N2") = 1.0;
  flow(gas, sump_slate, PFU_GAS_ROW, "H2O") = 0.02;
  flow(gas, sump_slate, PFU_GAS_ROW, "CO2") = 4e-4;
  flow(gas, sump_slate, PFU_GAS_ROW, "HCl") = hcl;
  return gas;
}

// kg_water kg/s of water with naoh mol/s of NaOH at 20 °C.
host::StreamState liquor(double kg_water, double naoh, double temperature = 293.15) {
  host::StreamState s = stream(sump_slate, temperature, atmosphere);
  flow(s, sump_slate, PFU_AQUEOUS_ROW, "H2O") = kg_water * mol_per_kg_water;
  flow(s, sump_slate, PFU_AQUEOUS_ROW, "NaOH") = naoh;
  return s;
}

std::vector<ParameterValue> sump_parameters(double recirculation, double setpoint) {
  std::vector<ParameterValue> p{{"stages", 3.0}, {"efficiency", 0.6}, {"recirculation_rate", recirculation}, {"bleed_rate", 0.08}};
  if (!std::isnan(setpoint)) p.push_back({"sump_ph", setpoint});
  return p;
}

}  // namespace

TEST_CASE("scrubber sump: component, charge, mass and energy balances of the unit close, the setpoint is held",
          "[scrubber][sump]") {
  auto unit = scrubber_module().create("scrubber", sump_parameters(0.5, 8.0), sump_slate);
  const host::StreamState gas = vent(2e-3);
  const host::StreamState make_up = liquor(0.03, 0.0);
  const host::StreamState reagent = liquor(0.96, 1.0);  // 4 % NaOH, a template: its composition counts
  const Run r = run(unit, gas, make_up, reagent);

  const double ph = result(unit, r, "sump_ph");
  CHECK(ph == Approx(8.0).margin(1e-8));  // the dose search stops within 1e-9 pH of the setpoint
  CHECK(result(unit, r, "sump_residual") <= 1e-10);
  CHECK(result(unit, r, "bleed_flow") == Approx(0.08).epsilon(1e-12));

  // Molar masses through the species data, to turn the reported kg/s into flows.
  const thermo::Database database = thermo::load_database(thermo::default_data_directory());
  const thermo::ChemicalSystem liquid_system(database, sump_slate.components);
  std::vector<double> molar_mass(sump_slate.components.size());
  for (std::size_t k = 0; k < molar_mass.size(); ++k) molar_mass[k] = liquid_system.component_molar_mass(k);
  double reagent_mass = 0.0;
  for (std::size_t k = 0; k < molar_mass.size(); ++k) reagent_mass += column_total(reagent, sump_slate, k) * molar_mass[k];
  const double scale = result(unit, r, "reagent_flow") / reagent_mass;
  const double fresh_water = result(unit, r, "fresh_water");
  const std::size_t water = 0;
  REQUIRE(scale > 0.0);
  REQUIRE(fresh_water >= 0.0);
  // The dose is what neutralises the HCl and the CO2 the column takes up, near enough: 2 mmol/s
  // of HCl and a little carbonate, against 1 mol NaOH per kg/s of reagent of 1.96 kg/s.
  // Sodium in is what leaves with the absorbed gases: chloride, and the CO2 taken up, which at pH 8
  // is bicarbonate but for a few per cent of carbonic acid (pKa1 6.35, from memory of Harned &
  // Davis 1943): 1e-4 of the dose covers that share of a CO2 pickup of 5e-4 of it.
  const double hcl_absorbed = 2e-3 * result(unit, r, "removal_hcl");
  const double co2_absorbed = 4e-4 * result(unit, r, "removal_co2");
  CHECK(scale * 1.0 == Approx(hcl_absorbed + co2_absorbed).epsilon(1e-4));
  // The unit's own account: protons handed to the base, the CO2's share of them.
  CHECK(result(unit, r, "reagent_consumed") == Approx(scale * 1.0).epsilon(1e-4));
  CHECK(result(unit, r, "reagent_to_co2") == Approx(co2_absorbed).epsilon(0.05));

  // Each component: gas + make-up + dosed reagent + fresh water in, cleaned gas + bleed out. The
  // components are one element group each (water, N, C, Cl, Na), so this is the element balance.
  for (std::size_t k = 0; k < sump_slate.components.size(); ++k) {
    CAPTURE(sump_slate.components[k]);
    double in = column_total(gas, sump_slate, k) + column_total(make_up, sump_slate, k) + scale * column_total(reagent, sump_slate, k);
    if (k == water) in += fresh_water / molar_mass[water];
    const double out = column_total(r.gas_out, sump_slate, k) + column_total(r.bleed, sump_slate, k);
    CHECK(out == Approx(in).epsilon(1e-11));
  }

  // Charge: the bleed, speciated here, is neutral to round-off of its largest ion.
  thermo::EquilibriumSolver solver(liquid_system);
  const auto liquid_state = [&](const host::StreamState& s, double multiple = 1.0) {
    std::vector<double> amounts(sump_slate.components.size());
    for (std::size_t k = 0; k < amounts.size(); ++k) amounts[k] = multiple * s.flows[PFU_AQUEOUS_ROW * amounts.size() + k];
    return solver.solve(s.temperature, s.pressure, amounts);
  };
  const thermo::Speciation bleed_state = liquid_state(r.bleed);
  double charge = 0.0, largest = 0.0;
  for (std::size_t i = 0; i < bleed_state.molality.size(); ++i) {
    charge += liquid_system.solutes()[i].charge * bleed_state.molality[i];
    largest = std::max(largest, std::abs(liquid_system.solutes()[i].charge * bleed_state.molality[i]));
  }
  CHECK(std::abs(charge) <= 1e-12 * largest);
  // The bleed is the sump's liquor: its pH is the setpoint, to the steady state's tolerance.
  CHECK(bleed_state.ph == Approx(8.0).margin(1e-6));

  // Energy, recomputed here: liquids through the engine's equilibrium enthalpy, gases ideal from the
  // species data, each at its stream's temperature; the fresh water at fresh_water_temperature.
  thermo::SystemOptions with_gas;
  with_gas.gas_phase = true;
  const thermo::ChemicalSystem gas_system(database, sump_slate.components, with_gas);
  const auto liquid_enthalpy = [&](const host::StreamState& s, double multiple = 1.0) {
    return thermo::state_enthalpy(liquid_system, liquid_state(s, multiple));
  };
  const auto gas_enthalpy = [&](const host::StreamState& s) {
    double h = 0.0;
    for (const thermo::PhaseSpecies& g : gas_system.phase_gases()) {
      const std::string component = g.name.substr(0, g.name.size() - 3);  // "HCl(g)" → "HCl"
      h += flow(s, sump_slate, PFU_GAS_ROW, component) *
           (g.reference_enthalpy + g.heat_capacity * (s.temperature - thermo::constants::reference_temperature));
    }
    return h;
  };
  // The fresh water at the default fresh_water_temperature, in mol through the data's molar mass.
  host::StreamState fresh = stream(sump_slate, 293.15, atmosphere);
  flow(fresh, sump_slate, PFU_AQUEOUS_ROW, "H2O") = fresh_water / molar_mass[water];
  const double in = gas_enthalpy(gas) + liquid_enthalpy(make_up) + liquid_enthalpy(reagent, scale) + liquid_enthalpy(fresh);
  const double out = gas_enthalpy(r.gas_out) + liquid_enthalpy(r.bleed);
  // Enthalpy flows here are about 1e7 W (formation enthalpies); the steady state is converged to
  // 1e-10 of the recirculated liquor and 1e-6 K, the column's energy equations to about 1e-6 W:
  // the balance holds to 1e-10 of the flows.
  CHECK(std::abs(out - in) <= 1e-11 * std::abs(in));
  // The sump's liquor is warmer than the fresh water and cooler than the gas.
  CHECK(result(unit, r, "sump_temperature") > 290.0);
  CHECK(result(unit, r, "sump_temperature") < 303.15);
}

TEST_CASE("scrubber sump: a setpoint beyond the reagent names the highest pH it can hold", "[scrubber][sump]") {
  // Dilute caustic, 0.01 mol/kg NaOH (pH near 12): no dose of it brings the sump to pH 12.5.
  auto unit = scrubber_module().create("scrubber", sump_parameters(0.5, 12.5), sump_slate);
  try {
    run(unit, vent(2e-4), liquor(0.03, 0.0), liquor(1.0, 0.01));
    FAIL("an unreachable setpoint returned an answer");
  } catch (const host::SolveError& error) {
    const std::string message = error.what();
    CHECK(error.status() == PFU_INVALID_PARAMETER);
    CHECK_THAT(message, Catch::Matchers::Contains("unreachable"));
    const std::string lead = "the highest pH this reagent can hold in the sump at these flows is ";
    const auto at = message.find(lead);
    REQUIRE(at != std::string::npos);
    const double highest = std::stod(message.substr(at + lead.size()));
    // Below the reagent's own pH (0.01 mol/kg NaOH: pH ~12.0 at 25 °C with γ ~0.9, from
    // pKw 14.0) and above neutral.
    CHECK(highest < 12.1);
    CHECK(highest > 7.0);
    // Just below it, the setpoint is held ...
    auto near = scrubber_module().create("scrubber", sump_parameters(0.5, highest - 0.02), sump_slate);
    const Run r = run(near, vent(2e-4), liquor(0.03, 0.0), liquor(1.0, 0.01));
    CHECK(result(near, r, "sump_ph") == Approx(highest - 0.02).margin(1e-8));
    // ... with less reagent than the most the flows allow, which the message names. Near the top the
    // curve is flat: the excess caustic takes up the gas's CO2 and buffers the sump as carbonate.
    const std::string dose_lead = "replaced by ";
    const double most_dose = std::stod(message.substr(message.find(dose_lead) + dose_lead.size()));
    CHECK(result(near, r, "reagent_flow") < most_dose);
    CHECK(result(near, r, "fresh_water") > 0.0);
  }
}

TEST_CASE("scrubber sump: HCl removal rises with the recirculation rate", "[scrubber][sump]") {
  // Water alone in the sump (no reagent): the sump liquor is dilute hydrochloric acid whose HCl
  // back-pressure the top stage sees; more liquor over the column (a larger absorption factor)
  // leaves less HCl in the gas (Kremser 1930: the unabsorbed fraction falls with A).
  double last_removal = 0.0;
  for (const double recirculation : {0.05, 0.2, 0.8}) {
    CAPTURE(recirculation);
    auto unit = scrubber_module().create("scrubber", sump_parameters(recirculation, std::nan("")), sump_slate);
    host::StreamState gas = vent(0.02, 333.15);
    const Run r = run(unit, gas, liquor(0.03, 0.0), liquor(0.0, 0.0));
    const double removal = result(unit, r, "removal_hcl");
    CHECK(removal > last_removal);
    CHECK(result(unit, r, "reagent_flow") == 0.0);
    last_removal = removal;
  }
}

TEST_CASE("scrubber sump: refusals name the parameter", "[scrubber][sump]") {
  const auto refusal = [](const std::vector<ParameterValue>& parameters) {
    try {
      (void)scrubber_module().create("scrubber", parameters, sump_slate);
    } catch (const host::CreateError& error) {
      return std::string(error.what());
    }
    return std::string("created");
  };
  CHECK_THAT(refusal({{"recirculation_rate", 1.0}}), Catch::Matchers::Contains("needs a bleed"));
  CHECK_THAT(refusal({{"recirculation_rate", 1.0}, {"bleed_rate", 0.1}, {"bleed_fraction", 0.1}}),
             Catch::Matchers::Contains("not both"));
  CHECK_THAT(refusal({{"sump_ph", 8.0}}), Catch::Matchers::Contains("no sump"));
  // A setpoint with no reagent flowing is refused at solve.
  auto unit = scrubber_module().create("scrubber", sump_parameters(0.5, 8.0), sump_slate);
  CHECK_THROWS_WITH(run(unit, vent(2e-3), liquor(0.03, 0.0), liquor(0.0, 0.0)), Catch::Matchers::Contains("reagent_in"));
  // More make-up than the bleed takes: the sump overflows.
  auto small_bleed = scrubber_module().create("scrubber", sump_parameters(0.5, std::nan("")), sump_slate);
  CHECK_THROWS_WITH(run(small_bleed, vent(2e-3), liquor(0.5, 0.0), liquor(0.0, 0.0)), Catch::Matchers::Contains("overflows"));
}

TEST_CASE("scrubber sump: a scaling salt in the sump's liquor is warned about by its saturation index", "[scrubber][sump]") {
  // Hard make-up water (calcium as Ca(OH)2) and a vent with CO2, held at pH 9.5 by caustic: calcite
  // forms in the sump's liquor beyond saturation (log10 Ksp -8.48, Plummer & Busenberg 1982, from
  // the species data), which the column does not precipitate; the unit says so.
  const host::Slate hard_slate{{"H2O", "N2", "CO2", "HCl", "NaOH", "Ca(OH)2"}, {}};
  auto unit = scrubber_module().create("scrubber", sump_parameters(0.5, 9.5), hard_slate);
  host::StreamState gas = stream(hard_slate, 303.15, atmosphere);
  flow(gas, hard_slate, PFU_GAS_ROW, "N2") = 1.0;
  flow(gas, hard_slate, PFU_GAS_ROW, "H2O") = 0.02;
  flow(gas, hard_slate, PFU_GAS_ROW, "CO2") = 4e-3;
  flow(gas, hard_slate, PFU_GAS_ROW, "HCl") = 1e-3;
  host::StreamState make_up = stream(hard_slate, 293.15, atmosphere);
  flow(make_up, hard_slate, PFU_AQUEOUS_ROW, "H2O") = 0.03 * mol_per_kg_water;
  flow(make_up, hard_slate, PFU_AQUEOUS_ROW, "Ca(OH)2") = 3e-4;  // 10 mmol/kg
  host::StreamState reagent = stream(hard_slate, 293.15, atmosphere);
  flow(reagent, hard_slate, PFU_AQUEOUS_ROW, "H2O") = 0.96 * mol_per_kg_water;
  flow(reagent, hard_slate, PFU_AQUEOUS_ROW, "NaOH") = 1.0;
  std::vector<host::StreamState> inlets{gas, make_up, reagent};
  std::vector<host::StreamState> outlets(2);
  const host::Solution solution = unit.solve(inlets, outlets);
  CHECK(warned(solution, "calcite"));
  CHECK(warned(solution, "saturation index"));
}

TEST_CASE("scrubber sump: a bleed given as a fraction, the reagent dosed as it comes", "[scrubber][sump]") {
  // bleed_fraction f of the sump's outflow: B = f R / (1 - f); no setpoint: the whole reagent inlet
  // goes in, and the fresh water makes up the rest of the outflow.
  auto unit = scrubber_module().create(
      "scrubber",
      std::vector<ParameterValue>{{"stages", 3.0}, {"efficiency", 0.6}, {"recirculation_rate", 0.5}, {"bleed_fraction", 0.1}},
      sump_slate);
  const host::StreamState reagent = liquor(0.01, 0.003);  // 10 g/s of 0.3 mol/kg NaOH
  const Run r = run(unit, vent(2e-3), liquor(0.02, 0.0), reagent);
  CHECK(result(unit, r, "bleed_flow") == Approx(0.1 * 0.5 / 0.9).epsilon(1e-12));
  const thermo::Database database = thermo::load_database(thermo::default_data_directory());
  const thermo::ChemicalSystem liquid_system(database, sump_slate.components);
  double reagent_mass = 0.0;
  for (std::size_t k = 0; k < sump_slate.components.size(); ++k)
    reagent_mass += column_total(reagent, sump_slate, k) * liquid_system.component_molar_mass(k);
  CHECK(result(unit, r, "reagent_flow") == Approx(reagent_mass).epsilon(1e-14));
  // 3 mmol/s of NaOH against 1.87 mmol/s of HCl taken up: the sump stays alkaline.
  CHECK(result(unit, r, "sump_ph") > 9.0);
  CHECK(result(unit, r, "sump_residual") <= 1e-10);
}

TEST_CASE("scrubber sump: warm from its last answer, and on an outlets-only pass, it gives a fresh unit's outlets",
          "[scrubber][sump]") {
  const host::StreamState make_up = liquor(0.03, 0.0);
  const host::StreamState reagent = liquor(0.96, 1.0);
  auto warm = scrubber_module().create("scrubber", sump_parameters(0.5, 8.0), sump_slate);
  (void)run(warm, vent(2e-3), make_up, reagent);  // its last answer: another gas load

  // A recycle's pass (unit ABI 1.4): outlets only, no results, no profiles.
  const std::vector<host::StreamState> inlets{vent(2.2e-3), make_up, reagent};
  std::vector<host::StreamState> pass_outlets(2);
  const std::array<std::uint32_t, 3> one_each_in{1, 1, 1};
  const std::array<std::uint32_t, 2> one_each_out{1, 1};
  REQUIRE(warm.unit_class().outlets_only);
  const host::Solution pass = warm.solve(inlets, one_each_in, pass_outlets, one_each_out, true);
  CHECK(std::isnan(result(warm, Run{{}, {}, pass}, "sump_ph")));
  CHECK(pass.series.front().x.empty());

  const Run again = run(warm, inlets[0], make_up, reagent);
  auto fresh = scrubber_module().create("scrubber", sump_parameters(0.5, 8.0), sump_slate);
  const Run cold = run(fresh, inlets[0], make_up, reagent);
  // Each answer is the steady recirculation to 1e-10 of itself and the setpoint to 1e-9 pH: the
  // outlets agree far inside 1e-7.
  for (std::size_t k = 0; k < cold.bleed.flows.size(); ++k) {
    CAPTURE(k);
    CHECK(again.bleed.flows[k] == Approx(cold.bleed.flows[k]).epsilon(1e-7).margin(1e-14));
    CHECK(pass_outlets[1].flows[k] == Approx(cold.bleed.flows[k]).epsilon(1e-7).margin(1e-14));
    CHECK(again.gas_out.flows[k] == Approx(cold.gas_out.flows[k]).epsilon(1e-7).margin(1e-14));
    CHECK(pass_outlets[0].flows[k] == Approx(cold.gas_out.flows[k]).epsilon(1e-7).margin(1e-14));
  }
  CHECK(again.bleed.temperature == Approx(cold.bleed.temperature).margin(1e-6));
  CHECK(result(warm, again, "sump_ph") == Approx(8.0).margin(1e-8));
  CHECK(result(warm, again, "reagent_flow") == Approx(result(fresh, cold, "reagent_flow")).epsilon(1e-7));
  // The warm start is what it is for: fewer column-and-sump passes.
  CHECK(result(warm, again, "sump_iterations") < result(fresh, cold, "sump_iterations"));
}

TEST_CASE("scrubber sump: a component the make-up stops bringing leaves the liquor, warm as cold", "[scrubber][sump]") {
  // A recycle's first pass after a solve: the make-up turns from treated water (calcium, a trace
  // of iron) to plain water, as when a flowsheet is solved again from its estimates (the demo
  // plant's flows, invented). The sump's passes take calcium and iron out of the recirculated
  // liquor; their Wegstein steps cancel to round-off of the last amounts, which must count as none
  // rather than a trace tens of decades down. The answer must be the fresh unit's.
  const host::Slate slate{{"H2O", "N2", "O2", "CO2", "HCl", "NaOH", "Ca(OH)2", "FeO"}, {}};
  host::StreamState gas = stream(slate, 303.15, 105000.0);
  flow(gas, slate, PFU_GAS_ROW, "N2") = 19.3;
  flow(gas, slate, PFU_GAS_ROW, "O2") = 5.1;
  flow(gas, slate, PFU_GAS_ROW, "H2O") = 0.5;
  flow(gas, slate, PFU_GAS_ROW, "CO2") = 0.01;
  flow(gas, slate, PFU_GAS_ROW, "HCl") = 0.0124;
  host::StreamState treated = stream(slate, 294.4, 105000.0);
  flow(treated, slate, PFU_AQUEOUS_ROW, "H2O") = 0.246 * mol_per_kg_water;
  flow(treated, slate, PFU_AQUEOUS_ROW, "Ca(OH)2") = 6.3e-3;
  flow(treated, slate, PFU_AQUEOUS_ROW, "FeO") = 5.6e-6;
  host::StreamState plain = treated;
  flow(plain, slate, PFU_AQUEOUS_ROW, "Ca(OH)2") = 0.0;
  flow(plain, slate, PFU_AQUEOUS_ROW, "FeO") = 0.0;
  host::StreamState reagent = stream(slate, 293.15, 105000.0);
  flow(reagent, slate, PFU_AQUEOUS_ROW, "H2O") = 0.96 * mol_per_kg_water;
  flow(reagent, slate, PFU_AQUEOUS_ROW, "NaOH") = 1.0;
  const std::vector<ParameterValue> parameters{{"stages", 6.0},         {"efficiency", 0.7}, {"recirculation_rate", 1.111},
                                               {"bleed_rate", 0.3333}, {"sump_ph", 8.5}};
  auto warm = scrubber_module().create("scrubber", parameters, slate);
  (void)run(warm, gas, treated, reagent);
  const Run again = run(warm, gas, plain, reagent);
  auto fresh = scrubber_module().create("scrubber", parameters, slate);
  const Run cold = run(fresh, gas, plain, reagent);
  CHECK(flow(again.bleed, slate, PFU_AQUEOUS_ROW, "Ca(OH)2") == 0.0);
  CHECK(flow(again.bleed, slate, PFU_AQUEOUS_ROW, "FeO") == 0.0);
  for (std::size_t k = 0; k < cold.bleed.flows.size(); ++k) {
    CAPTURE(k);
    CHECK(again.bleed.flows[k] == Approx(cold.bleed.flows[k]).epsilon(1e-7).margin(1e-14));
    CHECK(again.gas_out.flows[k] == Approx(cold.gas_out.flows[k]).epsilon(1e-7).margin(1e-14));
  }
  CHECK(result(warm, again, "sump_ph") == Approx(8.5).margin(1e-8));
}
