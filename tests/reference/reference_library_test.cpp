// Checks against reference libraries from Debian's packages, called live.
#include <catch2/catch.hpp>

#include <fmt/format.h>
#include <regex>

#include "protonflow/thermo/formula.hpp"
#include "protonflow/thermo/temperature_function.hpp"
#include "protonflow/thermo/water_enthalpy.hpp"
#include "protonflow/thermo/water_properties.hpp"
#include "python_reference.hpp"
#include "solution_probe.hpp"

using namespace protonflow;
using reference::run_python;

namespace {

// Liquid water at 0.101325 MPa from IAPWS-95; at 100 °C, just above the boiling point at that
// pressure, the saturated liquid instead (the engine's water is liquid throughout 0–100 °C).
const char* iapws_water = R"(
from iapws import IAPWS95
from iapws._iapws import _Kw, _Dielectric
def liquid(T):
    if T < 373.12:
        return IAPWS95(T=T, P=0.101325)
    return IAPWS95(T=T, x=0)
)";

}  // namespace

TEST_CASE("Kw(T) matches IAPWS R11-07 through python3-iapws from 0 to 100 °C") {
  for (const double celsius : {0.0, 25.0, 50.0, 75.0, 100.0}) {
    const double t = 273.15 + celsius;
    const auto values = run_python(fmt::format("{}\nw = liquid({})\nprint(w.rho, _Kw(w.rho, {}), _Dielectric(w.rho, {}))\n",
                                               iapws_water, t, t, t));
    REQUIRE(values.size() == 3);
    INFO("T = " << celsius << " °C");
    // Source: python3-iapws (IAPWS-95 density, IAPWS R11-07 pKw, IAPWS R8-97 permittivity).
    CHECK(thermo::water_density(t) == Approx(values[0]).epsilon(5e-5));
    CHECK(-reference::formation_log_k("OH^-", t) == Approx(values[1]).margin(1e-3));
    CHECK(thermo::water_relative_permittivity(t, values[0]) == Approx(values[2]).epsilon(1e-9));
  }
}

TEST_CASE("molar masses of every data formula match python3-periodictable") {
  // periodictable knows no charges (an electron's mass is below its rounding); hydrates it reads as
  // "A+nB", checked once on gypsum below.
  std::string script = "import periodictable\n";
  std::vector<const thermo::Species*> species;
  for (const thermo::Species& s : reference::bundled_database().species()) {
    // The Hill-order text of the parsed formula: names like "gypsum" are not formulas.
    const std::string text = std::regex_replace(to_string(s.formula), std::regex("\\^[0-9]*[+-]$"), "");
    script += fmt::format("print(periodictable.formula('{}').mass)\n", text);
    species.push_back(&s);
  }
  script += "print(periodictable.formula('CaSO4+2H2O').mass)\n";
  const auto masses = run_python(script);
  REQUIRE(masses.size() == species.size() + 1);
  for (std::size_t i = 0; i < species.size(); ++i) {
    INFO(species[i]->name);
    CHECK(1e3 * thermo::molar_mass(species[i]->formula) == Approx(masses[i]).epsilon(1e-9));  // python3-periodictable
  }
  CHECK(1e3 * thermo::molar_mass(thermo::parse_formula("CaSO4.2H2O")) == Approx(masses.back()).epsilon(1e-9));
}

TEST_CASE("liquid water's heat capacity and enthalpy match IAPWS-95 through python3-iapws from 0 to 100 °C") {
  const auto reference = run_python(fmt::format(
      "{}\nM = 18.015268\nh0 = IAPWS95(T=298.15, P=0.101325).h\n"
      "for T in (273.16, 298.15, 323.15, 348.15, 373.15):\n"
      "    w = liquid(T)\n    print(w.cp * M, (w.h - h0) * M)\n",
      iapws_water));
  REQUIRE(reference.size() == 10);
  const double temperatures[] = {273.16, 298.15, 323.15, 348.15, 373.15};
  for (int k = 0; k < 5; ++k) {
    INFO("T = " << temperatures[k] << " K");
    // Source: python3-iapws (IAPWS-95), J/(mol K) and J/mol relative to 298.15 K.
    CHECK(thermo::liquid_water_heat_capacity(temperatures[k]) == Approx(reference[2 * k]).epsilon(2e-3));
    CHECK(thermo::liquid_water_enthalpy_change(temperatures[k]) == Approx(reference[2 * k + 1]).margin(10.0));
  }
}

TEST_CASE("water's vapour pressure matches IAPWS-95 through python3-iapws from 0 to 100 °C") {
  const auto reference = run_python(
      "from iapws import IAPWS95\n"
      "for T in (273.16, 283.15, 298.15, 313.15, 333.15, 353.15, 373.15):\n"
      "    print(IAPWS95(T=T, x=0).P * 1e6)\n");
  REQUIRE(reference.size() == 7);
  const double temperatures[] = {273.16, 283.15, 298.15, 313.15, 333.15, 353.15, 373.15};
  for (int k = 0; k < 7; ++k) {
    INFO("T = " << temperatures[k] << " K");
    // Source: python3-iapws (IAPWS-95 saturation), Pa.
    CHECK(thermo::water_saturation_pressure(temperatures[k]) == Approx(reference[k]).epsilon(1e-4));
  }
}
