#include "protonflow/thermo/water_enthalpy.hpp"

#include "protonflow/thermo/constants.hpp"

namespace protonflow::thermo {

namespace {

// Shomate coefficients of H2O(l), Cp = A + B t + C t² + D t³ + E/t², t = T/1000 K, J/(mol K)
// (NIST Chemistry WebBook, after Chase 1998, NIST-JANAF Thermochemical Tables, 4th ed.; from
// memory; tests check Cp and H against IAPWS-95 through python3-iapws from 0 to 100 °C).
constexpr double a = -203.6060, b = 1523.290, c = -3196.413, d = 2474.455, e = 3.855326;

// ∫Cp dT in J/mol up to T, without its constant.
double enthalpy_integral(double temperature) {
  const double t = temperature / 1000.0;
  return 1000.0 * (a * t + b * t * t / 2.0 + c * t * t * t / 3.0 + d * t * t * t * t / 4.0 - e / t);
}

}  // namespace

double liquid_water_heat_capacity(double temperature) {
  const double t = temperature / 1000.0;
  return a + b * t + c * t * t + d * t * t * t + e / (t * t);
}

double liquid_water_enthalpy_change(double temperature) {
  return enthalpy_integral(temperature) - enthalpy_integral(constants::reference_temperature);
}

}  // namespace protonflow::thermo
