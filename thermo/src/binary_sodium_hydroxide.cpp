// NaOH–H2O, 0–50 wt %: the published correlations behind the concentrated-binary model. Why these
// sources, and how far each goes: docs/concentrated-acids.md. Keys resolve in docs/references.md.
#include <cmath>
#include <limits>

#include "concentrated_binary_data.hpp"
#include "protonflow/thermo/constants.hpp"

namespace protonflow::thermo::detail {

namespace {

constexpr double molar_mass = 0.03999711;  // kg/mol, python3-periodictable (iupac-atomic-weights)
// NaOH(s) → Na^+ + OH^- at infinite dilution, J/mol: nbs-1982, derived from the ΔfH° of NaOH(s), Na^+ and OH^- (from memory).
constexpr double solution_enthalpy_at_infinite_dilution = -44510.0;

double mole_fraction(double w) { return (w / molar_mass) / (w / molar_mass + (1.0 - w) / constants::water_molar_mass); }

// The 25 °C isotherm, evaluated from the correlations of olsson-1997 (their enthalpy, vapour-pressure
// and density equations; coefficients read from a public transcription, values computed here):
// mass fraction; heat of solution less its infinite-dilution value, kJ/mol (from the enthalpy
// correlation, its slope at zero concentration taken as infinite dilution); water activity, the
// correlation's vapour pressure over its own pure-water value; Cp, J/(kg K), ∂h/∂T of the same
// enthalpy correlation; density at 20 °C, kg/m³.
struct Isotherm {
  double mass_fraction, relative_heat, water_activity, heat_capacity, density;
};
constexpr Isotherm olsson[] = {
    {0.05, 0.181, 0.95468, 4017.8, 1053.0},  {0.10, 0.138, 0.90170, 3865.4, 1108.2},
    {0.15, 0.300, 0.82380, 3764.9, 1163.1},  {0.20, 0.982, 0.71632, 3697.7, 1217.8},
    {0.25, 2.425, 0.58640, 3650.0, 1271.9},  {0.30, 4.772, 0.44743, 3606.4, 1325.3},
    {0.35, 8.020, 0.31485, 3550.7, 1377.7},  {0.40, 11.987, 0.20365, 3470.9, 1428.5},
    {0.45, 16.345, 0.12389, 3362.7, 1477.1}, {0.50, 20.732, 0.07545, 3232.1, 1522.9},
};

SmoothTable heat_of_solution_table() {
  std::vector<double> x{0.0}, h{solution_enthalpy_at_infinite_dilution};
  for (const Isotherm& p : olsson) {
    if (p.mass_fraction < 0.15) continue;  // below 15 wt % the correlation's heats scatter by 0.2 kJ/mol
    x.push_back(mole_fraction(p.mass_fraction));
    h.push_back(solution_enthalpy_at_infinite_dilution + p.relative_heat * kilojoule);
  }
  return {x, h};
}

// One column of the isotherm against mass fraction, or its logarithm against mole fraction; at_zero
// is the pure-water value of the column itself (its logarithm is taken like every other value's).
SmoothTable column(double Isotherm::*field, double at_zero, bool as_log_of_mole_fraction) {
  std::vector<double> x{0.0}, y{as_log_of_mole_fraction ? std::log(at_zero) : at_zero};
  for (const Isotherm& p : olsson) {
    x.push_back(as_log_of_mole_fraction ? mole_fraction(p.mass_fraction) : p.mass_fraction);
    y.push_back(as_log_of_mole_fraction ? std::log(p.*field) : p.*field);
  }
  return {x, y};
}

BinaryData make_data() {
  const SmoothTable ln_water_activity = column(&Isotherm::water_activity, 1.0, true);
  return BinaryData{
      {"NaOH", molar_mass, "s", {0.0, 0.50, 273.15, 473.15}},
      -425609.0,                                 // ΔfH° NaOH(s), J/mol: nbs-1982 (from memory)
      59.54,                                     // Cp° NaOH(s), J/(mol K): nbs-1982 (from memory)
      std::numeric_limits<double>::quiet_NaN(),  // NaOH is not volatile
      std::numeric_limits<double>::quiet_NaN(),
      heat_of_solution_table(),
      // Pure water 4181.3 J/(kg K) from IAPWS-95 (iapws-95): the correlation is 2 % high there.
      column(&Isotherm::heat_capacity, 4181.3, false),
      std::nullopt,  // Δcp taken independent of T (the correlation's own T-dependence is not used)
      column(&Isotherm::density, 998.21, false),  // pure water from IAPWS-95 (iapws-95)
      [](double) { return 0.0; },                 // a solid reference: water's expansion alone
      [ln_water_activity](double x) { return ln_water_activity(x); },
      {},
      6.0,  // mol/kg: the range of the NaOH ion-interaction parameters (pitzer-1991, from memory)
      "water is the solvent and NaOH is dissociated to Na^+ and OH^-; the ionic engine describes it and a pH is "
      "meaningful",
      "beyond 6 mol/kg (about 19 wt %) the ion-interaction parameters are not fitted and at 50 wt % fewer than "
      "2.3 mol H2O per mol NaOH remain: the ionic speciation is not meaningful; this binary model gives enthalpy, "
      "heat capacity, density and the vapour pressure of water"};
}

}  // namespace

const BinaryData& sodium_hydroxide_data() {
  static const BinaryData data = make_data();
  return data;
}

}  // namespace protonflow::thermo::detail
