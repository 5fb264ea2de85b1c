// Enthalpy and heat capacity of liquid water between 0 and 100 °C at about 1 atm.
#pragma once

namespace protonflow::thermo {

// Cp of liquid water, J/(mol K): the Shomate form of the NIST-JANAF tables (Chase 1998) for H2O(l).
double liquid_water_heat_capacity(double temperature);

// H(T) − H(298.15 K) of liquid water, J/mol, the integral of the same form.
double liquid_water_enthalpy_change(double temperature);

}  // namespace protonflow::thermo
