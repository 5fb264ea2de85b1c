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
    case Form::analytic: {
      const auto& a = function.coefficients;
      const double t = temperature;
      return a[0] + a[1] * t + a[2] / t + a[3] * std::log10(t) + a[4] / (t * t);
    }
    case Form::water_ionization:
      return -water_pkw(temperature, water_density(temperature));
  }
  return 0.0;  // unreachable: every form is handled above
}

}  // namespace protonflow::thermo
