// Temperature dependence of log10 K for a formation reaction.
#pragma once

#include <array>
#include <string>

namespace protonflow::thermo {

struct TemperatureFunction {
  enum class Form {
    van_t_hoff,        // log K(T) = log K(T°) − ΔrH°/(R ln 10) (1/T − 1/T°), constant ΔrH°
    five_term,         // log K = constant + linear T + reciprocal/T + log10_T log10 T + reciprocal_square/T²
    water_ionization,  // H2O − H^+ → OH−: −pKw from Bandura & Lvov (2006)
    water_vapour,      // H2O(l) → H2O(g): log10(p_sat/1 atm), Wagner & Pruss (1993)
  };
  Form form = Form::van_t_hoff;
  double log_k_reference = 0.0;      // log K at 298.15 K (van 't Hoff form)
  double reaction_enthalpy = 0.0;    // J/mol (van 't Hoff form)
  // five-term form, in the order of the comment above: constant, linear (1/K), reciprocal (K),
  // log10_T, reciprocal_square (K²)
  std::array<double, 5> coefficients{};
};

// log10 K at temperature (K) and pressure (Pa); pressure enters only through water's density.
double log_k(const TemperatureFunction& function, double temperature, double pressure);

// ΔrH° (J/mol) that the function implies, R ln10 T² d(log K)/dT (van 't Hoff equation): the stated
// enthalpy for the van 't Hoff form, the analytic derivative for the analytic form, a central
// difference of the published function for water's ionization and vapour pressure.
double reaction_enthalpy(const TemperatureFunction& function, double temperature, double pressure);

}  // namespace protonflow::thermo
