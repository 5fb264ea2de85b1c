// The heater module, loaded as a host loads it: descriptors, parameter rejection, the energy
// balance against IAPWS-95, round trips, a pre-mixed neutralised feed, phase bookkeeping of gases
// and solids with the mass balance, and the safety warnings.
#include <catch2/catch.hpp>

#include <cmath>
#include <filesystem>
#include <string>
#include <thread>
#include <vector>

#include "units_test_support.hpp"

using namespace units_test;
using host::ParameterValue;

namespace {

const host::Module& heater_module() {
  static const host::Module module(UNITS_HEATER_MODULE);
  return module;
}

host::Instance create_heater(const std::vector<ParameterValue>& parameters, const host::Slate& slate) {
  return heater_module().create("heater", parameters, slate);
}

// Result indices, in the declared order.
enum Result { duty = 0, outlet_temperature, outlet_ph, inlet_ph, gas_flow, solid_flow };

const host::Slate water_slate{{"H2O"}, {}};

// Δh of liquid water at 0.101325 MPa between two temperatures, kJ/kg, from IAPWS-95 (python3-iapws).
double iapws_enthalpy_rise(double from, double to) {
  const std::vector<double> h = run_python(
      "from iapws import IAPWS95\n"
      "a = IAPWS95(T=" + std::to_string(from) + ", P=0.101325)\n"
      "b = IAPWS95(T=" + std::to_string(to) + ", P=0.101325)\n"
      "print(repr(b.h - a.h))\n");
  REQUIRE(h.size() == 1);
  return h[0];
}

host::StreamState water_feed(double kg_per_s, double temperature) {
  host::StreamState feed = stream(water_slate, temperature, atmosphere);
  feed.flows[0] = kg_per_s * mol_per_kg_water;
  return feed;
}

struct Run {
  host::StreamState product;
  host::Solution solution;
};

Run run(host::Instance& unit, const host::StreamState& feed) {
  Run r;
  std::vector<host::StreamState> outlets(1);
  r.solution = unit.solve(std::span(&feed, 1), outlets);
  r.product = outlets[0];
  return r;
}

std::string create_error(const std::vector<ParameterValue>& parameters, const host::Slate& slate) {
  try {
    heater_module().create("heater", parameters, slate);
  } catch (const host::CreateError& error) {
    return error.what();
  }
  return "created";
}

// Every component's total over all phases is the feed's, to round-off.
void check_mass_balance(const host::StreamState& feed, const host::StreamState& product, const host::Slate& slate) {
  for (std::size_t c = 0; c < slate.components.size(); ++c) {
    INFO("component " << slate.components[c]);
    const double in = column_total(feed, slate, c);
    CHECK(column_total(product, slate, c) == Approx(in).epsilon(1e-14).margin(0.0));
  }
  for (const double f : product.flows) CHECK(f >= 0.0);
}

}  // namespace

TEST_CASE("heater: the module sits in the host's built-in directory and describes itself") {
  CHECK(std::filesystem::path(UNITS_HEATER_MODULE).parent_path() == std::filesystem::path(UNITS_BUILT_IN_DIRECTORY));
  const host::UnitClassInfo* info = heater_module().find("heater");
  REQUIRE(info != nullptr);
  REQUIRE(info->ports.size() == 2);
  CHECK(info->ports[0].name == "feed");
  CHECK(info->ports[0].inlet);
  CHECK(info->ports[1].name == "product");
  CHECK_FALSE(info->ports[1].inlet);
  CHECK(info->ports[0].phases == (PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID));
  const auto parameter = [&](const std::string& name) {
    const auto found = std::ranges::find(info->parameters, name, &host::ParameterInfo::name);
    REQUIRE(found != info->parameters.end());
    return *found;
  };
  CHECK(parameter("mode").choices == std::vector<std::string>{"to_temperature", "by_duty"});
  CHECK(parameter("mode").default_text == "to_temperature");
  CHECK(parameter("outlet_temperature").unit == "K");
  CHECK(parameter("outlet_temperature").lower == 273.15);
  CHECK(parameter("outlet_temperature").upper == 647.096);
  CHECK(parameter("duty").unit == "W");
  CHECK(parameter("duty").default_number == 0.0);
  CHECK(parameter("pressure_drop").unit == "Pa");
  CHECK(parameter("pressure_drop").lower == 0.0);
  CHECK(parameter("activity_model").choices == std::vector<std::string>{"davies", "b-dot", "pitzer"});
  REQUIRE(info->results.size() == 6);
  const std::vector<std::pair<std::string, std::string>> results{{"duty", "W"},    {"outlet_temperature", "K"},
                                                                 {"outlet_ph", "1"}, {"inlet_ph", "1"},
                                                                 {"gas_flow", "mol/s"}, {"solid_flow", "mol/s"}};
  for (std::size_t i = 0; i < results.size(); ++i) {
    CHECK(info->results[i].name == results[i].first);
    CHECK(info->results[i].unit == results[i].second);
  }
}

TEST_CASE("heater: parameters and slates it cannot work with are refused at create, with the reason") {
  CHECK_THAT(create_error({}, water_slate), Catch::Contains("mode to_temperature needs parameter 'outlet_temperature'"));
  CHECK_THAT(create_error({{"outlet_temperature", 320.0}, {"duty", 1.0}}, water_slate),
             Catch::Contains("'duty' does not apply with mode to_temperature"));
  CHECK_THAT(create_error({{"mode", std::string("by_duty")}, {"outlet_temperature", 320.0}}, water_slate),
             Catch::Contains("'outlet_temperature' does not apply with mode by_duty"));
  CHECK_THAT(create_error({{"outlet_temperature", 200.0}}, water_slate), Catch::Contains("outside [273.15, 647.096] K"));
  CHECK_THAT(create_error({{"mode", std::string("boil")}}, water_slate), Catch::Contains("allowed: 'to_temperature', 'by_duty'"));
  CHECK_THAT(create_error({{"outlet_temperature", 320.0}}, host::Slate{{"HCl"}, {}}), Catch::Contains("must include H2O"));
  CHECK_THAT(create_error({{"outlet_temperature", 320.0}}, host::Slate{{"H2O", "Unobtainium"}, {}}),
             Catch::Contains("the slate cannot be used"));
  CHECK_THAT(create_error({{"outlet_temperature", 320.0}}, host::Slate{{"H2O"}, {"kryptonite"}}),
             Catch::Contains("slate solid phase 'kryptonite' is not a solid of the species data"));
  CHECK(create_error({{"mode", std::string("by_duty")}}, water_slate) == "created");  // duty defaults to 0 W
}

TEST_CASE("heater: heating 1 kg/s of water from 25 to 35 °C takes 41.8 kW, as IAPWS-95 says") {
  auto unit = create_heater({{"outlet_temperature", 308.15}}, water_slate);
  const host::StreamState feed = water_feed(1.0, 298.15);
  const Run r = run(unit, feed);
  // 1 kg/s × c_p 4.18 kJ/(kg K) × 10 K (c_p of liquid water near 30 °C, a common engineering
  // value, from memory) = 41.8 kW, ±0.5 %. (The brief says "4.18 kW"; that is per kelvin.)
  CHECK(r.solution.results[duty] == Approx(41.8e3).epsilon(0.005));
  // IAPWS-95 (Wagner & Pruss 2002) through python3-iapws: Δh of liquid water at 0.101325 MPa.
  const double iapws = iapws_enthalpy_rise(298.15, 308.15) * 1e3;  // J/kg, so W for 1 kg/s
  CHECK(r.solution.results[duty] == Approx(iapws).epsilon(0.002));
  CHECK(r.solution.results[outlet_temperature] == 308.15);
  CHECK(r.product.temperature == 308.15);
  CHECK(r.product.pressure == atmosphere);
  CHECK(r.product.flows[0] == feed.flows[0]);  // all of it still liquid: p_sat(35 °C) ≈ 5.6 kPa < 1 atm
  CHECK(r.solution.results[gas_flow] == 0.0);
  CHECK(r.solution.results[solid_flow] == 0.0);
  // Pure water is neutral: pH = pKw/2 at both ends (pKw 13.9945 at 25 °C, IAPWS R11-07 through
  // python3-iapws, bandura-lvov-2006), and lower when warmer.
  CHECK(r.solution.results[inlet_ph] == Approx(13.9945 / 2).margin(0.01));
  CHECK(r.solution.results[outlet_ph] < r.solution.results[inlet_ph]);
  CHECK(r.solution.warnings.empty());

  // The duty scales with the flow: ten times the water, ten times the duty (to round-off of H).
  const Run ten = run(unit, water_feed(10.0, 298.15));
  CHECK(ten.solution.results[duty] == Approx(10.0 * r.solution.results[duty]).epsilon(1e-10));
}

TEST_CASE("heater: heating by a duty and cooling by the same duty returns the feed temperature") {
  const host::StreamState feed = water_feed(1.0, 298.15);
  const double q = 50.0e3;  // W
  auto heat = create_heater({{"mode", std::string("by_duty")}, {"duty", q}}, water_slate);
  auto cool = create_heater({{"mode", std::string("by_duty")}, {"duty", -q}}, water_slate);
  const Run hot = run(heat, feed);
  // The reported duty is H_out − H_in as computed; it meets the set duty to far better than 1 µK
  // of the stream's heat capacity (about 4.2 mW here).
  CHECK(hot.solution.results[duty] == Approx(q).margin(1e-6));
  CHECK(hot.product.temperature == hot.solution.results[outlet_temperature]);
  // 50 kW into 1 kg/s is close to 12 K (c_p 4.18 kJ/(kg K), common value, from memory).
  CHECK(hot.product.temperature - 298.15 == Approx(50.0 / 4.18).epsilon(0.005));
  const Run back = run(cool, hot.product);
  CHECK(back.product.temperature == Approx(298.15).margin(1e-6));
  CHECK(back.solution.results[duty] == Approx(-q).margin(1e-6));
  check_mass_balance(feed, back.product, water_slate);

  // The duty to_temperature reports, given back by_duty, lands on the same temperature.
  auto to_t = create_heater({{"outlet_temperature", 340.0}}, water_slate);
  const double needed = run(to_t, feed).solution.results[duty];
  auto by_q = create_heater({{"mode", std::string("by_duty")}, {"duty", needed}}, water_slate);
  CHECK(run(by_q, feed).product.temperature == Approx(340.0).margin(1e-6));
}

TEST_CASE("heater: a pre-mixed HCl + NaOH feed is the neutralised NaCl solution it equilibrates to") {
  // 0.1 mol/kg HCl + 0.1 mol/kg NaOH in 1 kg/s of water, and the same elements written as NaCl:
  // HCl + NaOH = NaCl + H2O.
  const host::Slate mixed_slate{{"H2O", "HCl", "NaOH"}, {}};
  const host::Slate salt_slate{{"H2O", "NaCl"}, {}};
  host::StreamState mixed = stream(mixed_slate, 298.15, atmosphere);
  flow(mixed, mixed_slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  flow(mixed, mixed_slate, PFU_AQUEOUS_ROW, "HCl") = 0.1;
  flow(mixed, mixed_slate, PFU_AQUEOUS_ROW, "NaOH") = 0.1;
  host::StreamState salt = stream(salt_slate, 298.15, atmosphere);
  flow(salt, salt_slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water + 0.1;
  flow(salt, salt_slate, PFU_AQUEOUS_ROW, "NaCl") = 0.1;

  auto heat_mixed = create_heater({{"outlet_temperature", 308.15}}, mixed_slate);
  auto heat_salt = create_heater({{"outlet_temperature", 308.15}}, salt_slate);
  const Run m = run(heat_mixed, mixed);
  const Run s = run(heat_salt, salt);
  // Same elements, same equilibrium, same duty: what a stream means does not depend on how its
  // components are written.
  CHECK(m.solution.results[duty] == Approx(s.solution.results[duty]).epsilon(1e-9));
  CHECK(m.solution.results[outlet_ph] == Approx(s.solution.results[outlet_ph]).margin(1e-9));
  // Strong acid + strong base at exact equivalence, 25 °C: pH 7.00 ± 0.01 (worked example, derived
  // from the ion product, bandura-lvov-2006; common practice).
  CHECK(m.solution.results[inlet_ph] == Approx(7.00).margin(0.01));
  // The feed is at equilibrium already, so the heat of neutralisation (55.84 kJ/mol × 0.1 mol/s =
  // 5.6 kW, nbs-1982, derived, from memory, 13 % of the duty) is not in the duty: what is left is
  // the sensible heat of a dilute salt solution, within 1 % of that of its water (IAPWS-95 through
  // python3-iapws; 0.1 mol/kg NaCl lowers c_p per kg of water by about 0.2 %, from memory).
  const double iapws = iapws_enthalpy_rise(298.15, 308.15) * 1e3 * (1.0 + 0.1 / mol_per_kg_water);
  CHECK(m.solution.results[duty] == Approx(iapws).epsilon(0.01));
  CHECK(m.solution.results[duty] < iapws);  // the ions' heat capacity is negative (NBS 1982 Cp° of Na^+ + Cl^-)
  check_mass_balance(mixed, m.product, mixed_slate);
  CHECK(m.solution.warnings.empty());

  // No duty, no change: the feed does not heat itself up, because it is already neutralised.
  auto adiabatic = create_heater({{"mode", std::string("by_duty")}}, mixed_slate);
  const Run a = run(adiabatic, mixed);
  CHECK(a.product.temperature == Approx(298.15).margin(1e-6));
  CHECK(a.solution.results[duty] == Approx(0.0).margin(1e-6));
}

TEST_CASE("heater: degassing an acid carbonate liquor puts CO2 and vapour in the gas row and warns") {
  const host::Slate slate{{"H2O", "HCl", "CO2"}, {}};
  host::StreamState feed = stream(slate, 298.15, atmosphere);
  flow(feed, slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  flow(feed, slate, PFU_AQUEOUS_ROW, "HCl") = 0.2;
  // Below CO2's solubility under 1 atm of CO2 at 25 °C (K_H 0.0340 mol/(kg atm), Plummer & Busenberg
  // 1982, plummer-busenberg-1982), so the feed holds it all; at 82 °C it does not.
  flow(feed, slate, PFU_AQUEOUS_ROW, "CO2") = 0.02;
  auto unit = create_heater({{"outlet_temperature", 355.0}}, slate);
  const Run r = run(unit, feed);
  check_mass_balance(feed, r.product, slate);
  const double gas_co2 = flow(r.product, slate, PFU_GAS_ROW, "CO2");
  const double vapour = flow(r.product, slate, PFU_GAS_ROW, "H2O");
  CHECK(gas_co2 > 0.01);  // most of it leaves the liquor
  CHECK(vapour > 0.0);
  CHECK(flow(r.product, slate, PFU_AQUEOUS_ROW, "CO2") == Approx(0.02 - gas_co2).epsilon(1e-12));
  double gas_row = 0.0;
  for (std::size_t c = 0; c < slate.components.size(); ++c) gas_row += r.product.flows[PFU_GAS_ROW * slate.components.size() + c];
  CHECK(r.solution.results[gas_flow] == Approx(gas_row).epsilon(1e-12));
  CHECK(warned(r.solution, "a gas phase forms in the product"));
  CHECK(warned(r.solution, "CO2(g)"));
  CHECK(warned(r.solution, "boiling or degassing"));
  // 82 °C and pH about 0.7: hot corrosive liquor.
  CHECK(r.solution.results[outlet_ph] < 2.0);
  CHECK(warned(r.solution, "hot corrosive liquor"));
  CHECK(warned(r.solution, "local codes"));

  // The same liquor at 50 °C: below the hot-liquor limit, so no corrosion warning.
  auto warm = create_heater({{"outlet_temperature", 323.15}}, slate);
  CHECK_FALSE(warned(run(warm, feed).solution, "hot corrosive liquor"));
}

TEST_CASE("heater: hot caustic is a hot corrosive liquor, hot water is not") {
  const host::Slate slate{{"H2O", "NaOH"}, {}};
  host::StreamState feed = stream(slate, 298.15, atmosphere);
  flow(feed, slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  flow(feed, slate, PFU_AQUEOUS_ROW, "NaOH") = 1.0;
  auto unit = create_heater({{"outlet_temperature", 343.15}}, slate);
  const Run r = run(unit, feed);
  CHECK(r.solution.results[outlet_ph] > 12.0);
  CHECK(warned(r.solution, "hot corrosive liquor"));
  CHECK_FALSE(warned(r.solution, "gas phase"));

  auto water = create_heater({{"outlet_temperature", 343.15}}, water_slate);
  CHECK(run(water, water_feed(1.0, 298.15)).solution.warnings.empty());
}

TEST_CASE("heater: zincate liquor heated to 60 °C says which constants stay at their 25 °C values") {
  // Zn(OH)3^- and Zn(OH)4^2- carry no reaction enthalpy in the data (none could be read:
  // docs/species-data.md), and hold the zinc of a caustic liquor: hot, the product must say so.
  const host::Slate slate{{"H2O", "ZnCl2", "NaOH"}, {}};
  host::StreamState feed = stream(slate, 298.15, atmosphere);
  flow(feed, slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  flow(feed, slate, PFU_AQUEOUS_ROW, "ZnCl2") = 1e-3;
  flow(feed, slate, PFU_AQUEOUS_ROW, "NaOH") = 0.1;
  auto hot = create_heater({{"outlet_temperature", 333.15}}, slate);
  const Run r = run(hot, feed);
  CHECK(warned(r.solution, "held at their 25 °C values"));
  CHECK(warned(r.solution, "Zn(OH)4^2-"));
  // Within 5 K of 25 °C the held constants are no larger an error than the rest: no warning.
  auto mild = create_heater({{"outlet_temperature", 300.15}}, slate);
  CHECK_FALSE(warned(run(mild, feed).solution, "held at their 25 °C values"));
}

TEST_CASE("heater: gypsum that precipitates goes to the gypsum row, written on the slate's components") {
  const host::Slate slate{{"H2O", "H2SO4", "Ca(OH)2"}, {"gypsum"}};
  host::StreamState feed = stream(slate, 298.15, atmosphere);
  flow(feed, slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  flow(feed, slate, PFU_AQUEOUS_ROW, "H2SO4") = 0.1;
  flow(feed, slate, PFU_AQUEOUS_ROW, "Ca(OH)2") = 0.1;
  auto unit = create_heater({{"outlet_temperature", 313.15}}, slate);
  const Run r = run(unit, feed);
  check_mass_balance(feed, r.product, slate);
  // CaSO4·2H2O = Ca(OH)2 + H2SO4 in elements, so the solid row carries one of each per mol of gypsum.
  const double solid_ca = flow(r.product, slate, PFU_FIRST_SOLID_ROW, "Ca(OH)2");
  CHECK(solid_ca > 0.05);  // gypsum dissolves to only about 15 mmol/kg (common knowledge, from memory)
  CHECK(flow(r.product, slate, PFU_FIRST_SOLID_ROW, "H2SO4") == solid_ca);
  CHECK(flow(r.product, slate, PFU_FIRST_SOLID_ROW, "H2O") == 0.0);
  CHECK(r.solution.results[solid_flow] == Approx(solid_ca).epsilon(1e-14));
  CHECK(warned(r.solution, "solids precipitate in the product: gypsum"));

  // Where the slate has a component of the solid's own formula, the solid row uses that one alone.
  const host::Slate own{{"H2O", "CaSO4.2H2O"}, {"gypsum"}};
  host::StreamState saturated = stream(own, 298.15, atmosphere);
  flow(saturated, own, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  flow(saturated, own, PFU_AQUEOUS_ROW, "CaSO4.2H2O") = 0.05;
  auto own_unit = create_heater({{"outlet_temperature", 313.15}}, own);
  const Run o = run(own_unit, saturated);
  check_mass_balance(saturated, o.product, own);
  CHECK(flow(o.product, own, PFU_FIRST_SOLID_ROW, "CaSO4.2H2O") == Approx(o.solution.results[solid_flow]).epsilon(1e-14));
  CHECK(flow(o.product, own, PFU_FIRST_SOLID_ROW, "H2O") == 0.0);
  CHECK(flow(o.product, own, PFU_AQUEOUS_ROW, "CaSO4.2H2O") > 0.0);

  // A slate without a gypsum row keeps it in the aqueous row, and says so.
  const host::Slate no_row{{"H2O", "H2SO4", "Ca(OH)2"}, {}};
  host::StreamState same = stream(no_row, 298.15, atmosphere);
  same.flows = std::vector<double>(feed.flows.begin(), feed.flows.begin() + static_cast<std::ptrdiff_t>(2 * 3));
  auto no_row_unit = create_heater({{"outlet_temperature", 313.15}}, no_row);
  const Run n = run(no_row_unit, same);
  for (std::size_t c = 0; c < 3; ++c) CHECK(n.product.flows[c] == same.flows[c]);
  CHECK(n.solution.results[solid_flow] == Approx(solid_ca).epsilon(1e-9));
  CHECK(warned(n.solution, "the slate has no solid phase 'gypsum'"));
  CHECK(warned(n.solution, "carried in the aqueous row"));
  // The energy balance does not depend on the bookkeeping: the same equilibrium, the same duty.
  CHECK(n.solution.results[duty] == Approx(r.solution.results[duty]).epsilon(1e-9));
}

TEST_CASE("heater: what cannot be solved is an error with its reason, never a number") {
  const host::StreamState feed = water_feed(1.0, 298.15);
  const auto status_and_message = [&](host::Instance& unit, const host::StreamState& in) {
    try {
      run(unit, in);
    } catch (const host::SolveError& error) {
      return std::pair<pfu_status, std::string>(error.status(), error.what());
    }
    return std::pair<pfu_status, std::string>(PFU_OK, "");
  };

  auto drop = create_heater({{"outlet_temperature", 310.0}, {"pressure_drop", 2e5}}, water_slate);
  const auto [drop_status, drop_message] = status_and_message(drop, feed);
  CHECK(drop_status == PFU_INVALID_PARAMETER);
  CHECK_THAT(drop_message, Catch::Contains("pressure_drop 200000 Pa is not less than the feed pressure 101325 Pa"));

  // Calcite's data end at 90 °C (Plummer & Busenberg 1982), so a slate reaching it ends there too.
  const host::Slate lime{{"H2O", "CO2", "Ca(OH)2"}, {}};
  host::StreamState limewater = stream(lime, 298.15, atmosphere);
  flow(limewater, lime, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  flow(limewater, lime, PFU_AQUEOUS_ROW, "Ca(OH)2") = 0.01;
  auto too_hot = create_heater({{"outlet_temperature", 368.15}}, lime);
  const auto [hot_status, hot_message] = status_and_message(too_hot, limewater);
  CHECK(hot_status == PFU_INVALID_PARAMETER);
  CHECK_THAT(hot_message, Catch::Contains("outside the species data's range") && Catch::Contains("363.15"));

  // 10 MW into 1 kg/s of water at 1 atm would boil it all (about 2.6 MW would; IAPWS-95 latent heat,
  // from memory): no liquid state exists above the boiling point (373.12 K at 1 atm, IAPWS-95),
  // and the duty is refused with that reason.
  auto huge = create_heater({{"mode", std::string("by_duty")}, {"duty", 1e7}}, water_slate);
  const auto [huge_status, huge_message] = status_and_message(huge, feed);
  CHECK(huge_status == PFU_INVALID_PARAMETER);
  CHECK_THAT(huge_message, Catch::Contains("duty of 1e+07 W") && Catch::Contains("boils away"));
  // Under 3 bar water boils near 134 °C (IAPWS-95), beyond the data's 100 °C: the duty is out of range.
  host::StreamState pressed = feed;
  pressed.pressure = 3e5;
  const auto [range_status, range_message] = status_and_message(huge, pressed);
  CHECK(range_status == PFU_INVALID_PARAMETER);
  CHECK_THAT(range_message, Catch::Contains("duty of 1e+07 W") && Catch::Contains("above the temperatures where it exists"));

  // Water at 1 atm boils at 373.12 K (IAPWS-95): above it the engine's closed gas phase cannot hold
  // all the water, the speciation fails, and the unit says so with the engine's residuals.
  auto boiling = create_heater({{"outlet_temperature", 373.14}}, water_slate);
  const auto [boil_status, boil_message] = status_and_message(boiling, feed);
  CHECK(boil_status == PFU_NOT_CONVERGED);
  CHECK_THAT(boil_message, Catch::Contains("speciation did not converge at 373.14 K") &&
                               Catch::Contains("largest scaled residuals"));

  // A dry gas row that is no gas of the species data is refused, naming the component.
  const host::Slate salt{{"H2O", "NaCl"}, {}};
  host::StreamState dry = stream(salt, 298.15, atmosphere);
  flow(dry, salt, PFU_GAS_ROW, "NaCl") = 1.0;
  auto dry_unit = create_heater({{"outlet_temperature", 310.0}}, salt);
  const auto [dry_status, dry_message] = status_and_message(dry_unit, dry);
  CHECK(dry_status == PFU_BAD_INLET);
  CHECK_THAT(dry_message, Catch::Contains("NaCl, which is no gas"));
}

TEST_CASE("heater: a dry gas is heated as it is, with the gas's heat capacity, and by duty back again") {
  // 1 mol/s of dry CO2 from 25 to 75 °C: 50 K × c_p. The data's c_p of CO2(g) is NBS's 37.11 J/(mol K)
  // at 298 K, held constant; the ideal-gas c_p rises to about 39.4 J/(mol K) at 350 K (NIST-JANAF,
  // from memory), a mean of about 38.3 over the range: the duty within 5 % of 50 × 38.3 W.
  const host::Slate gas_slate{{"H2O", "CO2"}, {}};
  host::StreamState co2 = stream(gas_slate, 298.15, atmosphere);
  flow(co2, gas_slate, PFU_GAS_ROW, "CO2") = 1.0;
  auto unit = create_heater({{"outlet_temperature", 348.15}}, gas_slate);
  const Run heated = run(unit, co2);
  CHECK(heated.product.temperature == 348.15);
  CHECK(heated.product.flows == co2.flows);  // no water, no reaction, no phase change
  CHECK(heated.solution.results[duty] == Approx(50.0 * 38.3).epsilon(0.05));
  CHECK(heated.solution.results[duty] == Approx(50.0 * 37.11).epsilon(1e-9));  // the data's own c_p, exactly
  // By duty: the same duty takes it to the same temperature.
  auto by_duty = create_heater({{"mode", std::string("by_duty")}, {"duty", heated.solution.results[duty]}}, gas_slate);
  const Run back = run(by_duty, co2);
  CHECK(back.product.temperature == Approx(348.15).epsilon(0.0).margin(1e-6));
}

TEST_CASE("heater: no flow in gives no flow out, and the pressure drop is applied") {
  auto unit = create_heater({{"outlet_temperature", 320.0}, {"pressure_drop", 5e4}}, water_slate);
  const Run none = run(unit, stream(water_slate, 298.15, 2e5));
  CHECK(none.product.flows == std::vector<double>(none.product.flows.size(), 0.0));
  CHECK(none.product.temperature == 320.0);
  CHECK(none.product.pressure == 1.5e5);
  CHECK(none.solution.results[duty] == 0.0);
  CHECK(std::isnan(none.solution.results[outlet_ph]));

  host::StreamState feed = water_feed(1.0, 298.15);
  feed.pressure = 2e5;
  const Run r = run(unit, feed);
  CHECK(r.product.pressure == 1.5e5);
  check_mass_balance(feed, r.product, water_slate);

  auto push = create_heater({{"mode", std::string("by_duty")}, {"duty", 1e3}}, water_slate);
  CHECK_THROWS_WITH(run(push, stream(water_slate, 298.15, 2e5)), Catch::Contains("the feed has no flow"));
}

TEST_CASE("heater: two instances in two threads give the answers each gives alone") {
  // docs/unit-abi.md §8: instances share nothing mutable, and the module carries the engine inside.
  const host::Slate slate{{"H2O", "HCl", "NaOH", "CO2"}, {}};
  const auto feed_for = [&](double acid) {
    host::StreamState feed = stream(slate, 298.15, atmosphere);
    flow(feed, slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
    flow(feed, slate, PFU_AQUEOUS_ROW, "HCl") = acid;
    flow(feed, slate, PFU_AQUEOUS_ROW, "NaOH") = 0.05;
    flow(feed, slate, PFU_AQUEOUS_ROW, "CO2") = 0.01;
    return feed;
  };
  const std::vector<ParameterValue> heat{{"outlet_temperature", 340.0}};
  const std::vector<ParameterValue> cool{{"mode", std::string("by_duty")}, {"duty", -2.0e4}};
  const auto series = [&](host::Instance& unit, double acid) {
    std::vector<double> out;
    for (int i = 0; i < 40; ++i) {
      const Run r = run(unit, feed_for(acid + 1e-3 * (i % 7)));
      out.insert(out.end(), r.solution.results.begin(), r.solution.results.end());
    }
    return out;
  };
  auto alone_a = create_heater(heat, slate);
  auto alone_b = create_heater(cool, slate);
  const std::vector<double> expected_a = series(alone_a, 0.02);
  const std::vector<double> expected_b = series(alone_b, 0.08);

  auto a = create_heater(heat, slate);
  auto b = create_heater(cool, slate);
  std::vector<double> got_a, got_b;
  std::thread first([&] { got_a = series(a, 0.02); });
  std::thread second([&] { got_b = series(b, 0.08); });
  first.join();
  second.join();
  REQUIRE(got_a.size() == expected_a.size());
  REQUIRE(got_b.size() == expected_b.size());
  for (std::size_t i = 0; i < got_a.size(); ++i) CHECK(got_a[i] == Approx(expected_a[i]).epsilon(1e-10).margin(1e-9));
  for (std::size_t i = 0; i < got_b.size(); ++i) CHECK(got_b[i] == Approx(expected_b[i]).epsilon(1e-10).margin(1e-9));
}
