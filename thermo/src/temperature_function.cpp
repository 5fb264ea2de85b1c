#include "protonflow/thermo/temperature_function.hpp"

#include <cmath>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/water_properties.hpp"

namespace protonflow::thermo {

double log_k(const TemperatureFunction& function, double temperature, double /*pressure*/) {
  using Form = TemperatureFunction::Form;
  switch (function.form) {
    case Form::van_t_hoff:
      // van 't Hoff with constant ΔrH° (e.g. Stumm & Morgan 1996, Aquatic Chemistry, §2.9).
      return function.log_k_reference - function.reaction_enthalpy / (constants::gas_constant * constants::ln10) *
                                            (1.0 / temperature - 1.0 / constants::reference_temperature);
    case Form::five_term: {
      const auto& a = function.coefficients;
      const double t = temperature;
      return a[0] + a[1] * t + a[2] / t + a[3] * std::log10(t) + a[4] / (t * t);
    }
    case Form::water_ionization:
      return -water_pkw(temperature, water_density(temperature));
    case Form::water_vapour:
      return std::log10(water_saturation_pressure(temperature) / constants::standard_atmosphere);
  }
  return 0.0;  // unreachable: every form is handled above
}

double reaction_enthalpy(const TemperatureFunction& function, double temperature, double pressure) {
  using Form = TemperatureFunction::Form;
  const double rt2 = constants::gas_constant * constants::ln10 * temperature * temperature;
  switch (function.form) {
    case Form::van_t_hoff:
      return function.reaction_enthalpy;
    case Form::five_term: {
      const auto& a = function.coefficients;
      const double t = temperature;
      return rt2 * (a[1] - a[2] / (t * t) + a[3] / (t * constants::ln10) - 2.0 * a[4] / (t * t * t));
    }
    case Form::water_ionization:
    case Form::water_vapour: {
      const double h = 1e-3;  // K; the functions are smooth, and this step balances truncation and round-off
      return rt2 * (log_k(function, temperature + h, pressure) - log_k(function, temperature - h, pressure)) / (2.0 * h);
    }
  }
  return 0.0;  // unreachable: every form is handled above
}

}  // namespace protonflow::thermo
