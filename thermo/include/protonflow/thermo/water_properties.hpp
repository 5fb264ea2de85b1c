// Properties of liquid water that the activity models and log K functions need.
#pragma once

namespace protonflow::thermo {

// Density of liquid water in kg/m³ at 101.325 kPa, Kell (1975), 0–150 °C. The pressure
// dependence (about 0.05 % per MPa) is neglected; the valid range is checked by the caller.
double water_density(double temperature);

// Static relative permittivity of water, IAPWS R8-97 (Fernández et al. 1997), given T (K) and
// density (kg/m³).
double water_relative_permittivity(double temperature, double density);

// −log10 Kw (molal scale), IAPWS R11-07 (Bandura & Lvov 2006), given T (K) and density (kg/m³).
double water_pkw(double temperature, double density);

// Saturation (vapour) pressure of water in Pa, Wagner & Pruss (1993), the IAPWS saturation-line
// equation, 273.16 K to the critical point.
double water_saturation_pressure(double temperature);

struct DebyeHuckelParameters {
  double a;  // A (log10 basis), kg^½ mol^-½
  double b;  // B, Å⁻¹ kg^½ mol^-½
};

// Debye–Hückel A and B from water's density and permittivity (Robinson & Stokes 1959, ch. 9).
DebyeHuckelParameters debye_huckel_parameters(double temperature, double pressure);

}  // namespace protonflow::thermo
