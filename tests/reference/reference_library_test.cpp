// Checks against reference libraries from Debian's packages, called live.
#include <catch2/catch.hpp>

#include <fmt/format.h>
#include <regex>

#include "protonflow/thermo/formula.hpp"
#include "protonflow/thermo/temperature_function.hpp"
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
    CHECK(-reference::formation_log_k("OH-", t) == Approx(values[1]).margin(1e-3));
    CHECK(thermo::water_relative_permittivity(t, values[0]) == Approx(values[2]).epsilon(1e-9));
  }
}

TEST_CASE("molar masses of every data formula match python3-periodictable") {
  // periodictable reads hydrates as "A+nB" and knows no charges (an electron's mass is below its rounding).
  std::string script = "import periodictable\n";
  std::vector<const thermo::Species*> species;
  for (const thermo::Species& s : reference::bundled_database().species()) {
    const std::string text = std::regex_replace(s.name.find('(') != std::string::npos && s.name.ends_with("(aq)")
                                                    ? to_string(s.formula)
                                                    : s.name,
                                                std::regex("[+-][0-9]*$"), "");
    script += fmt::format("print(periodictable.formula('{}').mass)\n", std::regex_replace(text, std::regex(":"), "+"));
    species.push_back(&s);
  }
  script += "print(periodictable.formula('CaSO4+2H2O').mass)\n";
  const auto masses = run_python(script);
  REQUIRE(masses.size() == species.size() + 1);
  for (std::size_t i = 0; i < species.size(); ++i) {
    INFO(species[i]->name);
    CHECK(1e3 * thermo::molar_mass(species[i]->formula) == Approx(masses[i]).epsilon(1e-9));  // python3-periodictable
  }
  CHECK(1e3 * thermo::molar_mass(thermo::parse_formula("CaSO4:2H2O")) == Approx(masses.back()).epsilon(1e-9));
}
