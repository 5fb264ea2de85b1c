// Temperature dependence of log10 K for a formation reaction.
#pragma once

#include <array>
#include <string>

namespace protonflow::thermo {

struct TemperatureFunction {
  enum class Form {
    van_t_hoff,        // log K(T) = log K(T°) − ΔrH°/(R ln 10) (1/T − 1/T°), constant ΔrH°
    analytic,          // log K = a1 + a2 T + a3/T + a4 log10 T + a5/T²
    water_ionization,  // H2O − H+ → OH−: −pKw from Bandura & Lvov (2006)
  };
  Form form = Form::van_t_hoff;
  double log_k_reference = 0.0;      // log K at 298.15 K (van 't Hoff form)
  double reaction_enthalpy = 0.0;    // J/mol (van 't Hoff form)
  std::array<double, 5> coefficients{};  // analytic form
};

// log10 K at temperature (K) and pressure (Pa); pressure enters only through water's density.
double log_k(const TemperatureFunction& function, double temperature, double pressure);

}  // namespace protonflow::thermo
