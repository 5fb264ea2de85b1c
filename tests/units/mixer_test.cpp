// The mixer of the heater module, loaded as a host loads it: descriptors (two required and two
// optional inlets), water of two temperatures against IAPWS-95, the heat of neutralisation of HCl
// meeting NaOH, mass and energy balances (the energy balance recomputed through protonflow_thermo),
// CO2 from acid meeting carbonate, precipitation and hot liquor warnings, an unconnected optional
// inlet, the pressure rule and the errors.
#include <catch2/catch.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/database.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <string>
#include <utility>
#include <vector>

#include "units_test_support.hpp"

using namespace units_test;
using host::ParameterValue;
namespace thermo = protonflow::thermo;

namespace {

const host::Module& heater_module() {
  static const host::Module module(UNITS_HEATER_MODULE);
  return module;
}

host::Instance create_mixer(const std::vector<ParameterValue>& parameters, const host::Slate& slate) {
  return heater_module().create("mixer", parameters, slate);
}

// Result indices, in the declared order.
enum Result { duty = 0, outlet_temperature, outlet_ph, gas_flow, solid_flow };

constexpr std::size_t mixer_inlets = 4;

const host::Slate water_slate{{"H2O"}, {}};

host::StreamState water(double kg_per_s, double temperature) {
  host::StreamState feed = stream(water_slate, temperature, atmosphere);
  feed.flows[0] = kg_per_s * mol_per_kg_water;
  return feed;
}

// 1 kg/s of water carrying the given solutes (mol/s each), aqueous, at 1 atm.
host::StreamState solution(const host::Slate& slate, double temperature, const std::vector<std::pair<std::string, double>>& solutes) {
  host::StreamState feed = stream(slate, temperature, atmosphere);
  flow(feed, slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  for (const auto& [name, amount] : solutes) flow(feed, slate, PFU_AQUEOUS_ROW, name) = amount;
  return feed;
}

struct Mix {
  std::vector<host::StreamState> inlets;  // all four, as solved
  host::StreamState product;
  host::Solution solution;
};

// Solves the given inlets; the ports not given are passed as a host passes an unconnected optional
// inlet: no flow, at the temperature and pressure of the first inlet (docs/unit-abi.md §4, pfu_port).
Mix run(host::Instance& unit, std::vector<host::StreamState> inlets, const host::Slate& slate) {
  Mix m;
  while (inlets.size() < mixer_inlets) inlets.push_back(stream(slate, inlets[0].temperature, inlets[0].pressure));
  m.inlets = std::move(inlets);
  std::vector<host::StreamState> outlets(1);
  m.solution = unit.solve(m.inlets, outlets);
  m.product = outlets[0];
  return m;
}

std::pair<pfu_status, std::string> failure(host::Instance& unit, const std::vector<host::StreamState>& inlets,
                                           const host::Slate& slate) {
  try {
    run(unit, inlets, slate);
  } catch (const host::SolveError& error) {
    return {error.status(), error.what()};
  }
  return {PFU_OK, ""};
}

std::string create_error(const std::vector<ParameterValue>& parameters, const host::Slate& slate) {
  try {
    create_mixer(parameters, slate);
  } catch (const host::CreateError& error) {
    return error.what();
  }
  return "created";
}

// Mass balance: every component's total over all phases of the product is the sum of the inlets',
// to round-off; no flow is negative.
void check_mass_balance(const Mix& m, const host::Slate& slate) {
  for (std::size_t c = 0; c < slate.components.size(); ++c) {
    INFO("component " << slate.components[c]);
    double in = 0.0;
    for (const host::StreamState& inlet : m.inlets) in += column_total(inlet, slate, c);
    CHECK(column_total(m.product, slate, c) == Approx(in).epsilon(1e-14).margin(0.0));
  }
  for (const double f : m.product.flows) CHECK(f >= 0.0);
}

const thermo::Database& database() {
  static const thermo::Database loaded = thermo::load_database(thermo::default_data_directory());
  return loaded;
}

// The equilibrium enthalpy (J, so W per second of flow) of a stream's totals at its own T and P,
// recomputed here through protonflow_thermo with the system docs/units.md gives the mixer: every
// solid the slate reaches allowed, a closed gas phase.
double equilibrium_enthalpy(const host::Slate& slate, const host::StreamState& state) {
  thermo::SystemOptions options;
  options.gas_phase = true;
  const thermo::ChemicalSystem reach(database(), slate.components, options);
  for (const thermo::PhaseSpecies& solid : reach.solids()) options.allowed_solids.push_back(solid.name);
  const thermo::ChemicalSystem system(database(), slate.components, options);
  std::vector<double> totals(slate.components.size());
  for (std::size_t c = 0; c < totals.size(); ++c) totals[c] = column_total(state, slate, c);
  thermo::EquilibriumSolver solver(system);
  thermo::Speciation equilibrium;
  solver.solve(state.temperature, state.pressure, totals, {}, equilibrium);
  return thermo::state_enthalpy(system, equilibrium);
}

// Energy balance: Σ H_in + duty = H_out, each H an equilibrium enthalpy recomputed independently of
// the module (an inlet without flow has none). Round-off: H is about −16 MW per kg/s of water, so
// 1e-13 of it is a few µW.
void check_energy_balance(const Mix& m, const host::Slate& slate) {
  double h_in = 0.0;
  for (const host::StreamState& inlet : m.inlets) {
    if (total_flow(inlet) > 0.0) h_in += equilibrium_enthalpy(slate, inlet);
  }
  const double h_out = equilibrium_enthalpy(slate, m.product);
  CHECK(h_in + m.solution.results[duty] == Approx(h_out).epsilon(1e-13).margin(0.0));
}

}  // namespace

TEST_CASE("mixer: the heater module offers it, with two required and two optional inlets") {
  const host::UnitClassInfo* info = heater_module().find("mixer");
  REQUIRE(info != nullptr);
  CHECK(heater_module().find("heater") != nullptr);  // one module, both classes
  REQUIRE(info->ports.size() == 5);
  const std::vector<std::string> names{"feed_1", "feed_2", "feed_3", "feed_4", "product"};
  for (std::size_t i = 0; i < names.size(); ++i) {
    INFO("port " << names[i]);
    CHECK(info->ports[i].name == names[i]);
    CHECK(info->ports[i].inlet == (i < 4));
    CHECK(info->ports[i].optional == (i == 2 || i == 3));
    CHECK(info->ports[i].phases == (PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID));
  }
  CHECK(info->inlet_count() == 4);
  CHECK(info->outlet_count() == 1);
  const auto parameter = [&](const std::string& name) {
    const auto found = std::ranges::find(info->parameters, name, &host::ParameterInfo::name);
    REQUIRE(found != info->parameters.end());
    return *found;
  };
  REQUIRE(info->parameters.size() == 3);
  CHECK(parameter("duty").unit == "W");
  CHECK(parameter("duty").default_number == 0.0);  // adiabatic mixing
  CHECK(parameter("duty").lower == -HUGE_VAL);
  CHECK(parameter("pressure_drop").unit == "Pa");
  CHECK(parameter("pressure_drop").default_number == 0.0);
  CHECK(parameter("pressure_drop").lower == 0.0);
  CHECK(parameter("activity_model").choices == std::vector<std::string>{"davies", "b-dot", "pitzer"});
  CHECK(parameter("activity_model").default_text == "davies");
  const std::vector<std::pair<std::string, std::string>> results{
      {"duty", "W"}, {"outlet_temperature", "K"}, {"outlet_ph", "1"}, {"gas_flow", "mol/s"}, {"solid_flow", "mol/s"}};
  REQUIRE(info->results.size() == results.size());
  for (std::size_t i = 0; i < results.size(); ++i) {
    CHECK(info->results[i].name == results[i].first);
    CHECK(info->results[i].unit == results[i].second);
  }

  CHECK(create_error({}, water_slate) == "created");
  CHECK_THAT(create_error({}, host::Slate{{"HCl"}, {}}), Catch::Contains("unit 'mixer': the slate must include H2O"));
  CHECK_THAT(create_error({}, host::Slate{{"H2O"}, {"kryptonite"}}),
             Catch::Contains("slate solid phase 'kryptonite' is not a solid of the species data"));
  CHECK_THAT(create_error({{"pressure_drop", -1.0}}, water_slate), Catch::Contains("outside [0, inf] Pa"));
  CHECK_THAT(create_error({{"mode", std::string("by_duty")}}, water_slate), Catch::Contains("unknown parameter 'mode'"));
}

TEST_CASE("mixer: water at 20 and 60 °C mixes to where IAPWS-95 puts the mean enthalpy") {
  auto unit = create_mixer({}, water_slate);
  const Mix m = run(unit, {water(1.0, 293.15), water(1.0, 333.15)}, water_slate);
  // IAPWS-95 (Wagner & Pruss 2002) through python3-iapws, liquid water at 0.101325 MPa: the
  // temperature whose h is the mean of the inlets' h, by bisection (313.1528 K when written).
  const std::vector<double> iapws = run_python(
      "from iapws import IAPWS95\n"
      "h = lambda t: IAPWS95(T=t, P=0.101325).h\n"
      "target = (h(293.15) + h(333.15)) / 2\n"
      "lo, hi = 293.15, 333.15\n"
      "for _ in range(60):\n"
      "    mid = (lo + hi) / 2\n"
      "    lo, hi = (mid, hi) if h(mid) < target else (lo, mid)\n"
      "print(repr((lo + hi) / 2))\n");
  REQUIRE(iapws.size() == 1);
  CHECK(m.product.temperature == Approx(iapws[0]).epsilon(0.0).margin(0.05));
  CHECK(m.product.temperature == Approx(313.15).epsilon(0.0).margin(0.1));  // about 40 °C: c_p of liquid water barely varies
  CHECK(m.solution.results[outlet_temperature] == m.product.temperature);
  CHECK(m.solution.results[duty] == Approx(0.0).epsilon(0.0).margin(1e-6));  // adiabatic, to round-off of H
  CHECK(m.product.pressure == atmosphere);
  CHECK(m.product.flows[0] == 2.0 * mol_per_kg_water);
  CHECK(m.solution.results[gas_flow] == 0.0);
  CHECK(m.solution.results[solid_flow] == 0.0);
  CHECK(m.solution.warnings.empty());
  check_mass_balance(m, water_slate);
  check_energy_balance(m, water_slate);

  // Three inlets, 1, 2 and 0.5 kg/s at 20, 60 and 80 °C: the flow-weighted mean enthalpy, IAPWS-95
  // as above.
  const Mix three = run(unit, {water(1.0, 293.15), water(2.0, 333.15), water(0.5, 353.15)}, water_slate);
  const std::vector<double> weighted = run_python(
      "from iapws import IAPWS95\n"
      "h = lambda t: IAPWS95(T=t, P=0.101325).h\n"
      "target = (1.0 * h(293.15) + 2.0 * h(333.15) + 0.5 * h(353.15)) / 3.5\n"
      "lo, hi = 293.15, 353.15\n"
      "for _ in range(60):\n"
      "    mid = (lo + hi) / 2\n"
      "    lo, hi = (mid, hi) if h(mid) < target else (lo, mid)\n"
      "print(repr((lo + hi) / 2))\n");
  REQUIRE(weighted.size() == 1);
  CHECK(three.product.temperature == Approx(weighted[0]).epsilon(0.0).margin(0.05));
  check_mass_balance(three, water_slate);
  check_energy_balance(three, water_slate);

  // With a duty: 20 kW more into the same 2 kg/s, met to round-off, and the balance still closes.
  auto heated = create_mixer({{"duty", 2.0e4}}, water_slate);
  const Mix h = run(heated, {water(1.0, 293.15), water(1.0, 333.15)}, water_slate);
  CHECK(h.solution.results[duty] == Approx(2.0e4).epsilon(0.0).margin(1e-6));
  // 20 kW / (2 kg/s × c_p 4.18 kJ/(kg K), a common value, from memory) ≈ 2.4 K warmer.
  CHECK(h.product.temperature - m.product.temperature == Approx(20.0 / (2.0 * 4.18)).epsilon(0.01));
  check_energy_balance(h, water_slate);
}

TEST_CASE("mixer: 0.1 mol/kg HCl meeting 0.1 mol/kg NaOH warms by the heat of neutralisation") {
  const host::Slate slate{{"H2O", "HCl", "NaOH"}, {}};
  auto unit = create_mixer({}, slate);
  const Mix m = run(unit, {solution(slate, 298.15, {{"HCl", 0.1}}), solution(slate, 298.15, {{"NaOH", 0.1}})}, slate);
  // H^+ + OH^- -> H2O(l): -55.84 kJ/mol (NBS tables, Wagman et al. 1982, REFERENCE-VALUES.md), so
  // 0.1 mol/s releases 5.584 kW into 2 kg/s of dilute solution with c_p about 4.18 kJ/(kg K) (a
  // common value, from memory): ΔT ≈ 0.668 K, within 3 %.
  const double rise = 0.1 * 55.84e3 / (2.0 * 4.18e3);
  CHECK(m.product.temperature - 298.15 == Approx(rise).epsilon(0.03));
  // Exact equivalence: neutral, pH = pKw/2 at the product's temperature. pKw from IAPWS R11-07
  // (Bandura & Lvov 2006) through python3-iapws' _Kw, REFERENCE-VALUES.md; about 6.99, so also "pH 7.00"
  // of the worked example (strong acid + strong base at 25 °C, REFERENCE-VALUES.md) to 0.02, the
  // product being 0.67 K warmer.
  const std::vector<double> pkw = run_python(
      "from iapws import IAPWS95\n"
      "from iapws._iapws import _Kw\n"
      "t = " + std::to_string(m.product.temperature) + "\n"
      "print(repr(_Kw(IAPWS95(T=t, P=0.101325).rho, t)))\n");  // _Kw gives pKw itself
  REQUIRE(pkw.size() == 1);
  CHECK(m.solution.results[outlet_ph] == Approx(pkw[0] / 2.0).epsilon(0.0).margin(0.01));
  CHECK(m.solution.results[outlet_ph] == Approx(7.00).epsilon(0.0).margin(0.02));
  CHECK(m.solution.results[duty] == Approx(0.0).epsilon(0.0).margin(1e-6));
  CHECK(m.solution.results[gas_flow] == 0.0);
  CHECK(m.solution.warnings.empty());
  check_mass_balance(m, slate);
  check_energy_balance(m, slate);
  // The heat came from the reaction, not from the water: the same two streams of pure water do not warm.
  auto plain = create_mixer({}, water_slate);
  CHECK(run(plain, {water(1.0, 298.15), water(1.0, 298.15)}, water_slate).product.temperature == Approx(298.15).epsilon(0.0).margin(1e-6));
}

TEST_CASE("mixer: acid meeting carbonate evolves CO2 into the gas row, and the mixer warns") {
  // Soda ash, 0.2 mol/kg Na2CO3, written as 2 NaOH + CO2 (the same elements), meets 0.5 mol/kg HCl:
  // 0.2 mol/s of CO2 in 2 kg/s of water is some three times its solubility under 1 atm of CO2 at
  // 25 °C (K_H 0.0340 mol/(kg atm), Plummer & Busenberg 1982 via REFERENCE-VALUES.md), so most of it
  // leaves as gas.
  const host::Slate slate{{"H2O", "HCl", "NaOH", "CO2"}, {}};
  const host::StreamState acid = solution(slate, 298.15, {{"HCl", 0.5}});
  const host::StreamState soda_ash = solution(slate, 298.15, {{"NaOH", 0.4}, {"CO2", 0.2}});
  auto unit = create_mixer({}, slate);
  const Mix m = run(unit, {acid, soda_ash}, slate);
  check_mass_balance(m, slate);
  check_energy_balance(m, slate);
  const double gas_co2 = flow(m.product, slate, PFU_GAS_ROW, "CO2");
  CHECK(gas_co2 > 0.1);
  CHECK(gas_co2 < 0.2);
  CHECK(flow(m.product, slate, PFU_GAS_ROW, "H2O") > 0.0);  // saturated with water vapour
  CHECK(flow(m.product, slate, PFU_AQUEOUS_ROW, "CO2") == Approx(0.2 - gas_co2).epsilon(1e-12));
  CHECK(flow(m.product, slate, PFU_GAS_ROW, "HCl") == Approx(0.0).epsilon(0.0).margin(1e-9));
  double gas_row = 0.0;
  for (std::size_t c = 0; c < slate.components.size(); ++c) gas_row += m.product.flows[PFU_GAS_ROW * slate.components.size() + c];
  CHECK(m.solution.results[gas_flow] == Approx(gas_row).epsilon(1e-12));
  CHECK(m.solution.results[outlet_ph] < 2.0);  // 0.1 mol/s HCl left over in 2 kg/s
  CHECK(warned(m.solution, "unit 'mixer': a gas phase forms in the product"));
  CHECK(warned(m.solution, "CO2(g)"));
  CHECK(warned(m.solution, "the inlets at equilibrium had 0 mol/s"));
  CHECK(warned(m.solution, "boiling or degassing"));
  CHECK(warned(m.solution, "the mixer, its vent and its relief"));
  CHECK(warned(m.solution, "local codes"));
  CHECK_FALSE(warned(m.solution, "hot corrosive liquor"));  // near 25 °C

  // The same soda ash written as Na2CO3 on a slate without CO2: the gas still forms and is warned
  // of, but the slate cannot write it as a gas-row flow, so it stays in the aqueous row and the
  // mixer says so (docs/units.md, phase bookkeeping rule 5).
  const host::Slate no_co2{{"H2O", "HCl", "Na2CO3"}, {}};
  auto written = create_mixer({}, no_co2);
  // 2 NaOH + CO2 = Na2CO3 + H2O: the same elements need 0.2 mol/s more water beside the Na2CO3.
  host::StreamState soda = solution(no_co2, 298.15, {{"Na2CO3", 0.2}});
  flow(soda, no_co2, PFU_AQUEOUS_ROW, "H2O") += 0.2;
  const Mix n = run(written, {solution(no_co2, 298.15, {{"HCl", 0.5}}), soda}, no_co2);
  check_mass_balance(n, no_co2);
  CHECK(warned(n.solution, "a gas phase forms in the product"));
  CHECK(warned(n.solution, "CO2(g)"));
  CHECK(warned(n.solution, "carried in the aqueous row"));
  CHECK(n.product.temperature == Approx(m.product.temperature).epsilon(0.0).margin(1e-6));  // same elements, same heat
}

TEST_CASE("mixer: hot caustic is warned of, and so is gypsum precipitating from two clear liquors") {
  const host::Slate caustic{{"H2O", "NaOH"}, {}};
  auto hot = create_mixer({}, caustic);
  host::StreamState hot_water = stream(caustic, 353.15, atmosphere);
  flow(hot_water, caustic, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  const Mix c = run(hot, {hot_water, solution(caustic, 343.15, {{"NaOH", 1.0}})}, caustic);
  CHECK(c.product.temperature > 333.15);
  CHECK(c.solution.results[outlet_ph] > 12.0);
  CHECK(warned(c.solution, "unit 'mixer': hot corrosive liquor"));
  CHECK(warned(c.solution, "local codes"));
  check_mass_balance(c, caustic);
  check_energy_balance(c, caustic);

  // 0.1 mol/kg CaCl2 (as Ca(OH)2 + 2 HCl) meets 0.1 mol/kg Na2SO4 (as 2 NaOH + H2SO4): 0.05 mol/kg of
  // each after mixing, well above gypsum's solubility of about 15 mmol/kg (common knowledge, from
  // memory), so gypsum goes to its row, written as Ca(OH)2 + H2SO4.
  const host::Slate slate{{"H2O", "Ca(OH)2", "HCl", "NaOH", "H2SO4"}, {"gypsum"}};
  auto unit = create_mixer({}, slate);
  const Mix g = run(unit, {solution(slate, 298.15, {{"Ca(OH)2", 0.1}, {"HCl", 0.2}}),
                           solution(slate, 298.15, {{"NaOH", 0.2}, {"H2SO4", 0.1}})},
                    slate);
  check_mass_balance(g, slate);
  check_energy_balance(g, slate);
  const double solid_ca = flow(g.product, slate, PFU_FIRST_SOLID_ROW, "Ca(OH)2");
  CHECK(solid_ca > 0.02);
  CHECK(flow(g.product, slate, PFU_FIRST_SOLID_ROW, "H2SO4") == solid_ca);
  CHECK(g.solution.results[solid_flow] == Approx(solid_ca).epsilon(1e-14));
  CHECK(warned(g.solution, "unit 'mixer': solids precipitate in the product: gypsum"));
  CHECK(warned(g.solution, "inlets at equilibrium 0)"));
}

TEST_CASE("mixer: an unconnected optional inlet is the same as a connected one without flow") {
  const host::Slate slate{{"H2O", "HCl", "NaOH", "CO2"}, {}};
  host::StreamState first = solution(slate, 298.15, {{"HCl", 0.05}, {"CO2", 0.01}});
  first.pressure = 2.0e5;
  host::StreamState second = solution(slate, 318.15, {{"NaOH", 0.08}});
  second.pressure = 1.5e5;
  const std::vector<ParameterValue> parameters{{"duty", -5.0e3}, {"pressure_drop", 2.0e4}};

  // feed_3 and feed_4 unconnected: the host passes them without flow at feed_1's T and P.
  auto two = create_mixer(parameters, slate);
  const Mix unconnected = run(two, {first, second}, slate);
  // feed_3 connected to a stream that carries no flow, at its own temperature and pressure (lower
  // than every other: an inlet without flow enters nothing and sets no pressure); feed_4 unconnected.
  host::StreamState empty = stream(slate, 350.0, 0.5e5);
  auto three = create_mixer(parameters, slate);
  const Mix connected = run(three, {first, second, empty}, slate);

  CHECK(connected.product.flows == unconnected.product.flows);
  CHECK(connected.product.temperature == unconnected.product.temperature);
  CHECK(connected.product.pressure == unconnected.product.pressure);
  CHECK(connected.solution.results == unconnected.solution.results);
  CHECK(connected.solution.warnings == unconnected.solution.warnings);
  // The lowest pressure of the inlets with flow, less the drop.
  CHECK(unconnected.product.pressure == 1.5e5 - 2.0e4);
  CHECK(unconnected.solution.results[duty] == Approx(-5.0e3).epsilon(0.0).margin(1e-6));
  check_mass_balance(unconnected, slate);
  check_energy_balance(connected, slate);
  // The same mix with its inlets in other ports gives the same product, to round-off.
  auto swapped = create_mixer(parameters, slate);
  const Mix other = run(swapped, {stream(slate, 298.15, 2.0e5), second, host::StreamState(first)}, slate);
  CHECK(other.product.temperature == Approx(unconnected.product.temperature).epsilon(0.0).margin(1e-9));
  CHECK(other.solution.results[outlet_ph] == Approx(unconnected.solution.results[outlet_ph]).epsilon(0.0).margin(1e-9));
}

TEST_CASE("mixer: what cannot be solved is an error with its reason, and no flow gives no flow") {
  auto drop = create_mixer({{"pressure_drop", 1.2e5}}, water_slate);
  host::StreamState high = water(1.0, 298.15);
  high.pressure = 3.0e5;
  const auto [drop_status, drop_message] = failure(drop, {high, water(1.0, 298.15)}, water_slate);
  CHECK(drop_status == PFU_INVALID_PARAMETER);
  CHECK_THAT(drop_message, Catch::Contains("pressure_drop 120000 Pa is not less than the lowest inlet pressure 101325 Pa, "
                                           "of inlet 'feed_2'"));

  // An inlet of dry HCl gas has no water to equilibrate in: it is refused, naming the port.
  const host::Slate acid{{"H2O", "HCl"}, {}};
  host::StreamState gas = stream(acid, 298.15, atmosphere);
  flow(gas, acid, PFU_GAS_ROW, "HCl") = 0.1;
  auto dry = create_mixer({}, acid);
  const auto [dry_status, dry_message] = failure(dry, {solution(acid, 298.15, {}), gas}, acid);
  CHECK(dry_status == PFU_BAD_INLET);
  CHECK_THAT(dry_message, Catch::Contains("inlet 'feed_2'") && Catch::Contains("no water"));

  // 10 MW into 2 kg/s of water would boil it all away at 1 atm (IAPWS-95 latent heat about
  // 2.26 MJ/kg, from memory): refused with that reason.
  auto huge = create_mixer({{"duty", 1e7}}, water_slate);
  const auto [huge_status, huge_message] = failure(huge, {water(1.0, 298.15), water(1.0, 298.15)}, water_slate);
  CHECK(huge_status == PFU_INVALID_PARAMETER);
  CHECK_THAT(huge_message, Catch::Contains("duty of 1e+07 W") && Catch::Contains("boils away"));

  // Boiling on mixing: 3 mol/kg HCl meeting 3 mol/kg NaOH at 90 °C releases enough heat to take the
  // mix past the species data's 100 °C; adiabatic, so it is the inlets' doing, refused with the reason.
  const host::Slate neutral{{"H2O", "HCl", "NaOH"}, {}};
  auto strong = create_mixer({}, neutral);
  const auto [boil_status, boil_message] =
      failure(strong, {solution(neutral, 363.15, {{"HCl", 3.0}}), solution(neutral, 363.15, {{"NaOH", 3.0}})}, neutral);
  CHECK(boil_status == PFU_BAD_INLET);
  CHECK_THAT(boil_message, Catch::Contains("(adiabatic mixing)") && Catch::Contains("above the temperatures where it exists"));

  // No flow at all: no flow out, at feed_1's temperature, pH NaN; a duty into nothing is refused.
  auto none = create_mixer({{"pressure_drop", 1e3}}, water_slate);
  const Mix empty = run(none, {stream(water_slate, 300.0, 2e5), stream(water_slate, 310.0, 1.5e5)}, water_slate);
  CHECK(empty.product.flows == std::vector<double>(empty.product.flows.size(), 0.0));
  CHECK(empty.product.temperature == 300.0);
  CHECK(empty.product.pressure == 1.5e5 - 1e3);
  CHECK(empty.solution.results[duty] == 0.0);
  CHECK(std::isnan(empty.solution.results[outlet_ph]));
  auto push = create_mixer({{"duty", 1e3}}, water_slate);
  CHECK_THROWS_WITH(run(push, {stream(water_slate, 300.0, 2e5), stream(water_slate, 300.0, 2e5)}, water_slate),
                    Catch::Contains("no inlet has flow"));

  // One inlet with flow: the product is that stream, at its temperature (the empty one sets nothing).
  auto single = create_mixer({}, water_slate);
  const Mix one = run(single, {stream(water_slate, 350.0, 0.8e5), water(1.0, 310.0)}, water_slate);
  CHECK(one.product.temperature == Approx(310.0).epsilon(0.0).margin(1e-6));
  CHECK(one.product.pressure == atmosphere);
}

TEST_CASE("mixer: with the Pitzer model, diluting 6 mol/kg HCl to 1 mol/kg releases Parker's heat of dilution") {
  const host::Slate slate{{"H2O", "HCl"}, {}};
  // 1 kg/s of water with 6 mol/s HCl meets 5 kg/s of water, both at 25 °C: 1 mol/kg HCl results.
  const std::vector<host::StreamState> inlets{solution(slate, 298.15, {{"HCl", 6.0}}), [&] {
                                                host::StreamState w = stream(slate, 298.15, atmosphere);
                                                flow(w, slate, PFU_AQUEOUS_ROW, "H2O") = 5.0 * mol_per_kg_water;
                                                return w;
                                              }()};
  auto pitzer = create_mixer({{"activity_model", std::string("pitzer")}}, slate);
  const Mix m = run(pitzer, inlets, slate);
  // Parker 1965 (NSRDS-NBS 2, CRC Handbook, read; REFERENCE-VALUES.md): L_φ of HCl is 6.268 kJ/mol
  // at 6 mol/kg and 1.695 kJ/mol at 1 mol/kg, so 6 mol/s release 27.44 kW. The product's heat
  // capacity: 6 kg/s of water at 4.18 kJ/(kg K) (common value, from memory) and Cp° of Cl- −136.4
  // J/(mol K) (NBS tables, as in the species data): 24.26 kW/K, so a rise of 1.13 K, within 10 %.
  const double rise = 6.0 * (6.268 - 1.695) / (6.0 * 4.18 - 6.0 * 0.1364);
  CHECK(m.product.temperature - 298.15 == Approx(rise).epsilon(0.10));
  check_mass_balance(m, slate);
  // A dilute-solution model has no heat of dilution: the same mix stays at 25 °C within 0.05 K.
  auto davies = create_mixer({}, slate);
  const Mix d = run(davies, inlets, slate);
  CHECK(d.product.temperature - 298.15 == Approx(0.0).epsilon(0.0).margin(0.05));
}

TEST_CASE("mixer: with the Pitzer model, the product names the ions the parameters miss") {
  const host::Slate slate{{"H2O", "NaCl", "ZnCl2"}, {}};
  auto unit = create_mixer({{"activity_model", std::string("pitzer")}}, slate);
  const Mix m = run(unit, {solution(slate, 298.15, {{"NaCl", 1.0}}), solution(slate, 298.15, {{"ZnCl2", 0.2}})}, slate);
  // thermo/data/pitzer/ion-interaction.yaml has no zinc: Zn^2+ keeps the Debye–Hückel term alone.
  const bool named = std::any_of(m.solution.warnings.begin(), m.solution.warnings.end(), [](const std::string& w) {
    return w.find("do not cover") != std::string::npos && w.find("Zn^2+") != std::string::npos;
  });
  CHECK(named);
  check_mass_balance(m, slate);
}
