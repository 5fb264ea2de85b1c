// The published side of the freezing-point rows of reference_cases.cpp: the osmotic coefficients of
// NaCl and KCl at their freezing points, from the CRC Handbook's freezing-point depressions (concentrative
// properties of aqueous solutions, read) and the Gibbs energies of ice Ih (IAPWS R10-06) and liquid
// water (IAPWS-95) of python3-iapws, ln a_w = (g_ice − g_liquid)/(R T) at 0.101325 MPa.
#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <string>
#include <tuple>
#include <utility>

#include "python_reference.hpp"
#include "reference_cases.hpp"

namespace {

using protonflow::reference::reference_cases;
using protonflow::reference::run_python;

// The row "φ SALT m mol/kg at its freezing point, −ΔT °C" holds, as its published value, the φ that
// python3-iapws gives from that depression: ln a_w = −ν M_w m φ.
void check_row_against_iapws(const char* salt, int ions, double molality, double depression) {
  const auto values = run_python(fmt::format(
      "import warnings\nwarnings.simplefilter('ignore')\n"
      "from iapws._iapws import _Ice\nfrom iapws import IAPWS95\n"
      "T = 273.15 - {1}\nw = IAPWS95(T=T, P=0.101325)\n"
      "ln_aw = (_Ice(T, 0.101325)['g'] - (w.h - T * w.s)) / (0.46151805 * T)\n"
      "print(-ln_aw / ({2} * 0.018015268 * {0}))\n",
      molality, depression, ions));
  REQUIRE(values.size() == 1);
  const std::string quantity = fmt::format("φ {} {:g} mol/kg at its freezing point, −{:g} °C", salt, molality, depression);
  bool found = false;
  for (const auto& c : reference_cases())
    if (c.quantity == quantity) {
      found = true;
      CHECK(c.published == Approx(values[0]).epsilon(2e-5));
    }
  CHECK(found);
}

TEST_CASE("φ of NaCl and KCl at their freezing points: the rows' published values are what python3-iapws gives") {
  // (salt, mol/kg, depression in K): CRC Handbook, concentrative properties, NaCl 5–25 wt %, KCl 5–13 wt %
  for (const auto& [salt, molality, depression] :
       {std::tuple{"NaCl", 0.901, 3.05}, std::tuple{"NaCl", 1.901, 6.56}, std::tuple{"NaCl", 3.02, 10.89},
        std::tuple{"NaCl", 4.278, 16.46}, std::tuple{"NaCl", 5.111, 20.67}, std::tuple{"KCl", 0.706, 2.32},
        std::tuple{"KCl", 1.49, 4.81}, std::tuple{"KCl", 2.004, 6.45}}) {
    check_row_against_iapws(salt, 2, molality, depression);
  }
}

TEST_CASE("φ of CaCl2, MgCl2 and MgSO4 at their freezing points: the rows' published values are what python3-iapws gives") {
  // (salt, ions per formula, mol/kg, depression in K): CRC Handbook, concentrative properties
  for (const auto& [salt, ions, molality, depression] :
       {std::tuple{"CaCl2", 3, 0.375, 1.82}, std::tuple{"CaCl2", 3, 0.575, 2.93}, std::tuple{"CaCl2", 3, 1.001, 5.86},
        std::tuple{"CaCl2", 3, 1.467, 9.83}, std::tuple{"CaCl2", 3, 1.716, 12.28}, std::tuple{"CaCl2", 3, 2.253, 18.3},
        std::tuple{"MgCl2", 3, 0.325, 1.65}, std::tuple{"MgCl2", 3, 0.438, 2.3}, std::tuple{"MgCl2", 3, 0.553, 3.01},
        std::tuple{"MgSO4", 2, 0.437, 0.87}, std::tuple{"MgSO4", 2, 0.923, 1.85}, std::tuple{"MgSO4", 2, 1.352, 2.86},
        std::tuple{"MgSO4", 2, 1.582, 3.67}}) {
    check_row_against_iapws(salt, ions, molality, depression);
  }
}

}  // namespace
