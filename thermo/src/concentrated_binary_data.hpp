// The tables and constants behind one concentrated solute–water binary (private to thermo/src).
// Each binary_*.cpp file fills one BinaryData with published values, each beside its source key
// (docs/references.md); concentrated_binary.cpp turns them into properties. The model:
// docs/concentrated-acids.md.
#pragma once

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "protonflow/thermo/concentrated_binary.hpp"
#include "smooth_table.hpp"

namespace protonflow::thermo::detail {

inline constexpr double kilojoule = 1e3;
inline constexpr double atmosphere = 101325.0;

struct BinaryData {
  BinaryDescription description;

  // Pure solute in its reference phase at 298.15 K: ΔfH° (J/mol) and Cp° (J/(mol K)), NBS convention.
  double solute_formation_enthalpy;
  double solute_heat_capacity;
  // The solute as an ideal gas (HCl(g), HNO3(g)); NaN for a binary whose solute is not volatile here.
  double vapour_formation_enthalpy;
  double vapour_heat_capacity;

  // Integral heat of solution at 298.15 K, J per mol of solute (the enthalpy of mixing per mole of
  // solute, against its pure reference phase), against the solute mole fraction x. It is monotone in
  // x, so its smooth table keeps the curvature of the data; the enthalpy of mixing per mole of
  // solution is x times it. Below the table's first x it continues along its tangent.
  SmoothTable heat_of_solution;
  // Specific heat capacity of the solution, J/(kg K), against solute mass fraction, at about 25 °C.
  SmoothTable heat_capacity;
  // β(w) = ∂Δcp/∂T, J/(kg K²): how the excess heat capacity (the table's cp less the unmixed
  // components, water's own change with T taken out) changes with temperature, against solute mass
  // fraction, zero at w = 0. Empty where no heat capacities away from 25 °C were read: Δcp is then
  // independent of T.
  std::optional<SmoothTable> heat_capacity_temperature_slope;
  // Density at 20 °C, kg/m³, against solute mass fraction.
  SmoothTable density;
  // v(T) − v(293.15 K) of the pure solute, m³/kg (its thermal expansion; zero for a gas or solid
  // reference, whose expansion in solution is not known here).
  std::function<double(double temperature)> solute_expansion;

  // The 298.15 K isotherm: ln a_w (mole-fraction scale, pure-water reference) against x, and ln of
  // the solute's partial pressure in Pa (−inf at x = 0; empty for a non-volatile solute).
  std::function<double(double x)> ln_water_activity;
  std::function<double(double x)> ln_solute_pressure;

  // Molality (mol/kg water) up to which the ionic engine's activity models are fitted, and the
  // statements the scope returns on either side of it.
  double largest_ionic_molality;
  std::string ionic_within;
  std::string ionic_beyond;
};

const BinaryData& sulfuric_acid_data();
const BinaryData& hydrochloric_acid_data();
const BinaryData& nitric_acid_data();
const BinaryData& sodium_hydroxide_data();

}  // namespace protonflow::thermo::detail
