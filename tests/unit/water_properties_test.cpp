#include <catch2/catch.hpp>

#include "protonflow/thermo/water_properties.hpp"

using namespace protonflow::thermo;

TEST_CASE("water's permittivity reproduces the IAPWS R8-97 check value") {
  // IAPWS R8-97, table of computer-program verification values: ε = 78.5907250 at 298.15 K,
  // ρ = 999.242866 kg/m³ (also the doctest of python3-iapws' _Dielectric).
  CHECK(water_relative_permittivity(298.15, 999.242866) == Approx(78.5907250).epsilon(1e-8));
}

TEST_CASE("water's ionization reproduces the IAPWS R11-07 check value") {
  // IAPWS R11-07, verification table: pKw = 13.906565 at 300 K, ρ = 1000 kg/m³
  // (also the doctest of python3-iapws' _Kw).
  CHECK(water_pkw(300.0, 1000.0) == Approx(13.906565).epsilon(1e-7));
}
