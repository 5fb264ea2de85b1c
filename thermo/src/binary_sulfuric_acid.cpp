// H2SO4–H2O, 0–100 wt %: the published tables behind the concentrated-binary model. Why these
// sources, and how far each goes: docs/concentrated-acids.md. Keys resolve in docs/references.md.
#include <cmath>
#include <limits>

#include "concentrated_binary_data.hpp"
#include "protonflow/thermo/constants.hpp"

namespace protonflow::thermo::detail {

namespace {

constexpr double molar_mass = 0.09807848;  // kg/mol, python3-periodictable (iupac-atomic-weights)

double mole_fraction(double w) { return (w / molar_mass) / (w / molar_mass + (1.0 - w) / constants::water_molar_mass); }

// Integral heat of solution of H2SO4(l) in n H2O at 25 °C, kJ per mol H2SO4, against n. The
// n = 2–5 values set L̄_w = dΔH_sol/dn of 60–75 wt % acid, and with it how fast the water activity
// rises with temperature, so the boiling points: the n = 3 and 4 values (NBS Circular 500, from
// memory) keep the interpolant from bridging n = 2–5 with one curve. Their steps from n = 2 and to
// n = 5 (−7.07, −5.07, −3.97 kJ/mol) agree within 0.01 kJ/mol with those of a public transcription
// of a handbook table of heats of solution (nbs-circular-500 in docs/references.md, note), whose
// values all lie 3.0 kJ/mol below these.
struct HeatOfSolution {
  double n, kilojoule_per_mole;
};
constexpr HeatOfSolution heats[] = {
    {0.10, -3.41},    // zeleznik-1991: computed from its Gibbs-energy model (see the water activities below)
    {0.25, -8.20},    // zeleznik-1991, computed likewise
    {0.50, -15.64},   // zeleznik-1991, computed likewise
    {1.0, -27.8},     // nbs-1982 (read)
    {2.0, -41.92},    // nbs-circular-500 (from memory, as reproduced in chemical-engineering texts)
    {3.0, -48.99},    // nbs-circular-500 (from memory; see above)
    {4.0, -54.06},    // nbs-circular-500 (from memory; see above)
    {5.0, -58.03},    // nbs-circular-500 (from memory)
    {10.0, -66.5},    // nbs-1982 (read)
    {25.0, -72.30},   // nbs-circular-500 (from memory)
    {50.0, -72.8},    // nbs-1982 (read)
    {100.0, -73.7},   // nbs-1982 (read)
    {1000.0, -78.3},  // nbs-1982 (read); beyond it the dissociation of HSO4^- adds its heat (docs)
};

SmoothTable heat_of_solution_table() {
  std::vector<double> x, h;
  for (auto it = std::rbegin(heats); it != std::rend(heats); ++it) {
    x.push_back(1.0 / (1.0 + it->n));
    h.push_back(it->kilojoule_per_mole * kilojoule);
  }
  x.push_back(1.0);  // pure H2SO4(l), the reference
  h.push_back(0.0);
  return {x, h};
}

// ln a_w at 298.15 K against mass fraction: Zeleznik's (1991) Gibbs-energy model, evaluated with
// the coefficients of his table 6 (zeleznik-1991; coefficients read from a public transcription,
// values computed, not recalled). Check: its water activity at 10 wt % gives φ = 0.72 at 1.13 mol/kg.
struct WaterActivity {
  double mass_fraction, ln_activity;
};
constexpr WaterActivity water_activities[] = {
    {0.02, -0.00783}, {0.05, -0.01947},  {0.10, -0.04402},  {0.15, -0.07944},  {0.20, -0.12977}, {0.25, -0.19902},
    {0.30, -0.29174}, {0.35, -0.41337},  {0.40, -0.57075},  {0.45, -0.77277},  {0.50, -1.03133}, {0.55, -1.36284},
    {0.60, -1.79047}, {0.65, -2.34751},  {0.70, -3.08174},  {0.75, -4.05962},  {0.80, -5.36279}, {0.85, -7.05049},
    {0.90, -9.01322}, {0.95, -10.75499}, {0.98, -12.23452}, {0.99, -13.59062},
};

SmoothTable water_activity_table() {
  std::vector<double> x{0.0}, l{0.0};
  for (const WaterActivity& a : water_activities) {
    x.push_back(mole_fraction(a.mass_fraction));
    l.push_back(a.ln_activity);
  }
  return {x, l};
}

// Specific heat capacity at 25 °C, J/(kg K), against mass fraction: from Zeleznik's model
// (zeleznik-1991, computed as ∂H/∂T of its mixing enthalpy plus the pure components' Cp), with pure
// water from IAPWS-95 (iapws-95, python3-iapws) and pure H2SO4(l) from nbs-1982 (138.91 J/(mol K),
// from memory). It agrees within 3 % with handbook values recalled from the International Critical
// Tables up to 70 wt % and lies 8–10 % above them at 80–90 wt % (docs/concentrated-acids.md).
SmoothTable heat_capacity_table() {
  return {{0.0, 0.10, 0.20, 0.30, 0.40, 0.50, 0.60, 0.70, 0.80, 0.90, 0.95, 0.98, 1.0},
          {4181.3, 3817, 3514, 3206, 2864, 2506, 2187, 1985, 1900, 1676, 1483, 1429, 1416.3}};
}

// Density at 20 °C, kg/m³: crc-concentrative-properties (read in
// a stored copy of the table), except 60 and 80 wt % (from
// memory); pure water from IAPWS-95 (iapws-95).
SmoothTable density_table() {
  return {
      {0.0, 0.01, 0.05, 0.10, 0.20, 0.30, 0.40, 0.50, 0.60, 0.70, 0.80, 0.90, 0.98, 1.0},
      {998.21, 1004.9, 1031.8, 1066.1, 1139.8, 1219.1, 1302.8, 1395.2, 1498.3, 1610.5, 1727.2, 1814.4, 1836.1, 1830.5}};
}

// Thermal expansion of 100 % H2SO4: V(t) = V(0 °C) (1 + A t + B t²), t in °C, A = 0.5758e-3,
// B = −0.432e-6 (flow-measurement-specific-volume, read), anchored at 1830.5 kg/m³ at 20 °C
// (crc-concentrative-properties).
double solute_expansion(double temperature) {
  constexpr double a = 0.5758e-3, b = -0.432e-6;
  const double t = temperature - 273.15;
  const double v0 = (1.0 / 1830.5) / (1.0 + 20.0 * a + 400.0 * b);
  return v0 * (a * (t - 20.0) + b * (t * t - 400.0));
}

BinaryData make_data() {
  const SmoothTable water_activity = water_activity_table();
  const double last_x = water_activity.last_x(), last_ln = water_activity(last_x);
  return BinaryData{
      {"H2SO4", molar_mass, "l", {0.0, 1.0, 273.15, 473.15}},
      -813989.0,                                 // ΔfH° H2SO4(l), J/mol: nbs-1982 (from memory)
      138.91,                                    // Cp° H2SO4(l), J/(mol K): nbs-1982 (from memory)
      std::numeric_limits<double>::quiet_NaN(),  // H2SO4 vapour is not modelled (docs)
      std::numeric_limits<double>::quiet_NaN(),
      heat_of_solution_table(),
      heat_capacity_table(),
      std::nullopt,  // no heat capacities away from 25 °C read: Δcp independent of T
      density_table(),
      solute_expansion,
      // Beyond 99 wt % the water left is dilute in the acid: a_w proportional to its mole fraction.
      [water_activity, last_x, last_ln](double x) {
        return x <= last_x ? water_activity(x) : last_ln + std::log((1.0 - x) / (1.0 - last_x));
      },
      {},
      6.1,  // mol/kg: the range of the H2SO4 ion-interaction parameters (clegg-rard-pitzer-1994, from memory)
      "water is the solvent and H2SO4 is present as H^+, HSO4^- and SO4^2-; the ionic engine (Pitzer, "
      "Clegg-Rard-Pitzer 1994 parameters) describes it and a pH is meaningful",
      "beyond 6.1 mol/kg (about 37 wt %) the ion-interaction parameters are not fitted, and above about 70 wt % "
      "(fewer than 2.3 mol H2O per mol H2SO4) too little water is left to hydrate the ions: there is no meaningful "
      "pH or speciation; this binary model gives enthalpy, heat capacity, density and vapour pressure"};
}

}  // namespace

const BinaryData& sulfuric_acid_data() {
  static const BinaryData data = make_data();
  return data;
}

}  // namespace protonflow::thermo::detail
