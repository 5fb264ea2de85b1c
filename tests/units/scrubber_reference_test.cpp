// The scrubber against outside numbers, with nitrogen as the carrier: SO2 into caustic against a
// hand calculation, and the humidification of dry nitrogen against the adiabatic-saturation
// temperature computed from IAPWS-95 water properties (python3-iapws).
#include <catch2/catch.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/database.hpp>

#include <cmath>
#include <sstream>
#include <string>
#include <vector>

#include "units_test_support.hpp"

using namespace units_test;
using host::ParameterValue;

namespace {

const host::Module& scrubber_module() {
  static const host::Module module(UNITS_SCRUBBER_MODULE);
  return module;
}

double result(const host::Instance& unit, const host::Solution& solution, const std::string& name) {
  const auto& results = unit.unit_class().results;
  for (std::size_t r = 0; r < results.size(); ++r)
    if (results[r].name == name) return solution.results[r];
  throw std::logic_error("no result " + name);
}

}  // namespace

TEST_CASE("scrubber: SO2 into excess caustic on one stage, against a hand calculation", "[scrubber]") {
  // One ideal stage, 25 °C, 1 atm. Gas: 1 mol/s N2 with 1e-3 mol/s SO2 (about 1000 ppmv), already
  // saturated with water at 25 °C (y = 3.1699/101.325 kPa, IAPWS-95) so that little water moves.
  // Liquor: 1 kg/s of water with 0.1 mol/s NaOH.
  //
  // Hand calculation. SO2 + 2 OH^- → SO3^2- + H2O: at pH near 13 sulfite is the only S(IV) species
  // worth counting (pK2 7.17, goldberg-parker-1985: HSO3^- / SO3^2- = 10^(7.17 − 12.9) ≈ 2e-6), and
  // SO2 over it has p = m(SO2 aq) / KH with m(SO2 aq) / m(SO3^2-) = a(H^+)^2 / (K1 K2) ≈ 1e-17: the
  // stage takes all of it. So:
  //   reagent consumed = 2 × 1e-3 = 2e-3 mol/s (two protons per SO2 absorbed, sulfite);
  //   spent liquor: OH^- 0.1 − 0.002 = 0.098 mol/kg, SO3^2- 0.001, Na^+ 0.1;
  //   I = ½ (0.1 + 0.098 + 4 × 0.001) = 0.101 mol/kg;
  //   Davies (1962), A = 0.5100 at 25 °C (Robinson & Stokes 1959; from memory):
  //   log10 γ1 = −0.5100 (√0.101 / (1 + √0.101) − 0.3 × 0.101) = −0.5100 × (0.24115 − 0.0303) = −0.1075;
  //   pH = pKw + log10(γ1 m(OH^-)) = 13.9945 + log10(0.7807 × 0.098) = 13.9945 − 1.1167 = 12.878
  //   (pKw 13.9945 at 25 °C, IAPWS R11-07 through python3-iapws, bandura-lvov-2006).
  const host::Slate slate{{"H2O", "N2", "SO2", "NaOH"}, {}};
  auto unit = scrubber_module().create("scrubber", std::vector<ParameterValue>{{"stages", 1.0}}, slate);
  host::StreamState gas = stream(slate, 298.15, atmosphere);
  flow(gas, slate, PFU_GAS_ROW, "N2") = 1.0;
  flow(gas, slate, PFU_GAS_ROW, "SO2") = 1e-3;
  const double y_water = 3169.9 / atmosphere;  // IAPWS-95 at 25 °C through python3-iapws (iapws-95)
  flow(gas, slate, PFU_GAS_ROW, "H2O") = y_water / (1.0 - y_water) * 1.001;
  host::StreamState liquor = stream(slate, 298.15, atmosphere);
  flow(liquor, slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  flow(liquor, slate, PFU_AQUEOUS_ROW, "NaOH") = 0.1;
  const std::vector<host::StreamState> inlets{gas, liquor, stream(slate, 298.15, atmosphere)};  // no reagent_in
  std::vector<host::StreamState> outlets(2);
  const host::Solution solution = unit.solve(inlets, outlets);
  CHECK(result(unit, solution, "removal_so2") == Approx(1.0).margin(1e-9));          // hand calculation above
  CHECK(result(unit, solution, "reagent_consumed") == Approx(2e-3).epsilon(1e-4));   // hand calculation above
  CHECK(result(unit, solution, "liquor_outlet_ph") == Approx(12.878).margin(0.01));  // hand calculation above
  CHECK(result(unit, solution, "liquor_outlet_temperature") == Approx(298.15).margin(0.1));
}

TEST_CASE("scrubber: dry nitrogen leaves at the adiabatic-saturation temperature of IAPWS-95 water", "[scrubber]") {
  // Dry N2 at 60 °C meets water fed at the adiabatic-saturation temperature T_as: with liquid at
  // T_as the gas cools to T_as and leaves saturated, the water's temperature unchanged, where
  //   Cp(N2) (T_gas − T_as) = p_sat(T_as) / (P − p_sat(T_as)) · Δh_vap(T_as),
  // p_sat and Δh_vap from IAPWS-95 (python3-iapws), Cp(N2) = 29.125 J/(mol K) as in the species data
  // (nbs-1982; the carrier's property, the same on both sides).
  const double gas_temperature = 333.15;
  std::ostringstream script;
  script.precision(17);
  script << "from iapws import IAPWS95\n"
            "P = 101325.0; Tg = " << gas_temperature << "; cp = 29.125; M = 18.015268\n"
            "def f(T):\n"
            "    liquid = IAPWS95(T=T, x=0); vapour = IAPWS95(T=T, x=1)\n"
            "    p = liquid.P * 1e6\n"
            "    return cp * (Tg - T) - p / (P - p) * (vapour.h - liquid.h) * M\n"
            "lo, hi = 280.0, Tg\n"
            "for _ in range(60):\n"
            "    mid = 0.5 * (lo + hi)\n"
            "    if f(mid) > 0: lo = mid\n"
            "    else: hi = mid\n"
            "T = 0.5 * (lo + hi)\n"
            "print(T, IAPWS95(T=T, x=0).P * 1e6)\n";
  const std::vector<double> reference = run_python(script.str());
  REQUIRE(reference.size() == 2);
  const double t_as = reference[0], p_sat = reference[1];

  const host::Slate slate{{"H2O", "N2"}, {}};
  auto unit = scrubber_module().create("scrubber", std::vector<ParameterValue>{{"stages", 10.0}}, slate);
  host::StreamState gas = stream(slate, gas_temperature, atmosphere);
  flow(gas, slate, PFU_GAS_ROW, "N2") = 1.0;
  host::StreamState liquor = stream(slate, t_as, atmosphere);
  flow(liquor, slate, PFU_AQUEOUS_ROW, "H2O") = mol_per_kg_water;
  const std::vector<host::StreamState> inlets{gas, liquor, stream(slate, 298.15, atmosphere)};  // no reagent_in
  std::vector<host::StreamState> outlets(2);
  const host::Solution solution = unit.solve(inlets, outlets);
  // IAPWS-95 through python3-iapws: T_as to 0.05 K (the model's latent heat comes from NBS
  // enthalpies of formation and constant vapour Cp, 0.1 % from IAPWS-95 near 20 °C).
  CHECK(result(unit, solution, "gas_outlet_temperature") == Approx(t_as).margin(0.05));
  CHECK(result(unit, solution, "liquor_outlet_temperature") == Approx(t_as).margin(0.05));
  const double water_out = flow(outlets[0], slate, PFU_GAS_ROW, "H2O");
  const double y_out = water_out / (water_out + flow(outlets[0], slate, PFU_GAS_ROW, "N2"));
  CHECK(y_out == Approx(p_sat / atmosphere).epsilon(0.005));  // saturated at T_as, IAPWS-95
  CHECK(result(unit, solution, "water_evaporated") == Approx(water_out).epsilon(1e-12));
}

TEST_CASE("scrubber: outlet concentrations corrected to a reference oxygen content", "[scrubber]") {
  // C_ref = C (21 − O_ref) / (21 − O_gas), O in volume percent of dry gas (eu-ied-2010, Annex VI).
  const host::Slate slate{{"H2O", "N2", "O2", "HCl"}, {}};
  const auto outlet = [&](std::vector<ParameterValue> parameters, host::StreamState& gas_out) {
    auto unit = scrubber_module().create("scrubber", parameters, slate);
    host::StreamState gas = stream(slate, 298.15, atmosphere);
    flow(gas, slate, PFU_GAS_ROW, "N2") = 0.85;
    flow(gas, slate, PFU_GAS_ROW, "O2") = 0.15;
    flow(gas, slate, PFU_GAS_ROW, "HCl") = 1e-3;
    host::StreamState liquor = stream(slate, 298.15, atmosphere);
    flow(liquor, slate, PFU_AQUEOUS_ROW, "H2O") = 0.2 * mol_per_kg_water;
    const std::vector<host::StreamState> inlets{gas, liquor, stream(slate, 298.15, atmosphere)};  // no reagent_in
    std::vector<host::StreamState> outlets(2);
    const host::Solution solution = unit.solve(inlets, outlets);
    gas_out = outlets[0];
    return result(unit, solution, "outlet_hcl_concentration");
  };
  host::StreamState gas_out;
  const double as_measured = outlet({{"stages", 1.0}, {"efficiency", 0.5}}, gas_out);
  const double corrected = outlet({{"stages", 1.0}, {"efficiency", 0.5}, {"reference_oxygen", 0.11}}, gas_out);
  const double o2 = flow(gas_out, slate, PFU_GAS_ROW, "O2");
  const double dry = o2 + flow(gas_out, slate, PFU_GAS_ROW, "N2") + flow(gas_out, slate, PFU_GAS_ROW, "HCl");
  REQUIRE(as_measured > 0.0);
  CHECK(corrected / as_measured == Approx((0.21 - 0.11) / (0.21 - o2 / dry)).epsilon(1e-12));
}
