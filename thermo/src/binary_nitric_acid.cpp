// HNO3–H2O, 0–70 wt %: the published tables behind the concentrated-binary model. Why these sources,
// and how far each goes: docs/concentrated-acids.md. Keys resolve in docs/references.md.
#include <cmath>
#include <iterator>

#include "concentrated_binary_data.hpp"
#include "uni_univalent_isotherm.hpp"

namespace protonflow::thermo::detail {

namespace {

constexpr double molar_mass = 0.06301284;  // kg/mol, python3-periodictable (iupac-atomic-weights)
// HNO3(l) → H^+ + NO3^- at infinite dilution, J/mol: nbs-1982, −205.0 + 174.10 (from memory).
constexpr double solution_enthalpy_at_infinite_dilution = -30900.0;
// γ±² m(H^+) m(NO3^-) / p(HNO3) at 25 °C, mol² kg⁻² atm⁻¹: brimblecombe-clegg-1989 (from memory).
constexpr double henry_constant = 2.45e6;

// Apparent relative molal enthalpy L_φ at 25 °C, kJ/mol, against n = mol H2O per mol HNO3:
// parker-1965 as tabulated in the CRC Handbook, "Enthalpy of dilution of acids" (read). More dilute
// values were not read; there the table runs smoothly to L_φ = 0 at infinite dilution.
struct RelativeEnthalpy {
  double n, l_phi;
};
constexpr RelativeEnthalpy parker[] = {
    {1.0, 19.73},   {2.775, 9.498}, {3.700, 6.883}, {5.551, 3.933}, {6.167, 3.368}, {6.938, 2.791},
    {7.929, 2.251}, {9.251, 1.749}, {10.0, 1.540},  {11.10, 1.310}, {12.33, 1.109}, {13.88, 0.958},
    {15.86, 0.791}, {18.50, 0.665}, {22.20, 0.582}, {27.75, 0.527}, {37.00, 0.506}, {55.51, 0.506},
};

SmoothTable heat_of_solution_table() {
  std::vector<double> x{0.0}, h{solution_enthalpy_at_infinite_dilution};
  for (auto it = std::rbegin(parker); it != std::rend(parker); ++it) {
    x.push_back(1.0 / (1.0 + it->n));
    h.push_back(solution_enthalpy_at_infinite_dilution + it->l_phi * kilojoule);
  }
  return {x, h};
}

// Mean activity coefficients at 25 °C to 3 mol/kg: robinson-stokes-1959, appendix 8.10 (from
// memory). Beyond 3 mol/kg no values were read (the azeotrope lies at 34 mol/kg). There ln γ±
// leaves the table with its own slope (0.144 kg/mol at 3 mol/kg) and bends smoothly towards a final
// slope over a molality scale (UniUnivalentIsotherm::Continuation): two parameters, fitted so that
// the maximum-boiling azeotrope at 1 atm lies at 68.0 wt % and 120.5 °C (wikipedia-nitric-acid, read;
// the 25 °C isotherm carried there with Parker's heats). Fitted, not published: the azeotrope is
// then a calibration, not a check (docs/concentrated-acids.md). Water and acid activities still come
// from the one ln γ± curve, so Gibbs–Duhem holds whatever the parameters.
constexpr UniUnivalentIsotherm::Continuation beyond_3_molal{
    -0.00918,  // final slope of ln γ±, kg/mol: fitted (above)
    12.63,     // molality scale of the bend, mol/kg: fitted (above)
};

const UniUnivalentIsotherm& isotherm() {
  static const UniUnivalentIsotherm curve(40.0, {0.001, 0.01, 0.1, 0.2, 0.5, 1.0, 1.5, 2.0, 2.5, 3.0},
                                          {0.965, 0.902, 0.791, 0.754, 0.720, 0.724, 0.753, 0.793, 0.846, 0.909},
                                          beyond_3_molal);
  return curve;
}

// Specific heat capacity at 20 °C: perry-specific-heats, nitric acid (read; cal/(g °C) × 4184).
SmoothTable heat_capacity_table() {
  return {{0.0, 0.10, 0.20, 0.30, 0.40, 0.50, 0.60, 0.70, 0.80, 0.90},
          {4184.0, 3765.6, 3389.0, 3054.3, 2824.2, 2719.6, 2677.8, 2573.2, 2405.8, 2154.8}};
}

// Density at 20 °C, kg/m³: crc-concentrative-properties (read, in a stored copy of the table) to 40 wt %, from memory
// at 50, 60 and 70 wt %; pure water from IAPWS-95 (iapws-95).
SmoothTable density_table() {
  return {{0.0, 0.01, 0.05, 0.10, 0.20, 0.30, 0.40, 0.50, 0.60, 0.70},
          {998.21, 1003.7, 1025.7, 1054.3, 1115.0, 1180.1, 1246.6, 1310.0, 1366.7, 1413.4}};
}

// 100 % HNO3: 1512.9 kg/m³ at 20 °C and a cubic expansion coefficient of 1.24e-3 K⁻¹ (crc-concentrative-properties,
// from memory).
double solute_expansion(double temperature) { return 1.24e-3 * (temperature - 293.15) / 1512.9; }

BinaryData make_data() {
  return BinaryData{
      {"HNO3", molar_mass, "l", {0.0, 0.70, 273.15, 413.15}},
      -174100.0,  // ΔfH° HNO3(l), J/mol: nbs-1982 (from memory)
      109.87,     // Cp° HNO3(l), J/(mol K): nbs-1982 (from memory)
      -135060.0,  // ΔfH° HNO3(g), J/mol: nbs-1982 (from memory; chase-1998 gives −134.31, read)
      53.35,      // Cp° HNO3(g), J/(mol K): nbs-1982 (from memory)
      heat_of_solution_table(),
      heat_capacity_table(),
      std::nullopt,  // no heat capacities away from 25 °C read: Δcp independent of T
      density_table(),
      solute_expansion,
      [](double x) { return isotherm().ln_water_activity(x); },
      [](double x) { return isotherm().ln_solute_activity(x) - std::log(henry_constant) + std::log(atmosphere); },
      3.0,  // mol/kg: the range of the HNO3 ion-interaction parameters (pitzer-1991, from memory)
      // Molecular HNO3 from Raman spectra: pKa −1.55 at 25 °C (levanov-isaikina-lunin-2017).
      "water is the solvent and HNO3 is dissociated to H^+ and NO3^-; the ionic engine describes it and a pH is "
      "meaningful",
      "beyond 3 mol/kg (about 16 wt %) the ion-interaction parameters are not fitted and, increasingly, HNO3 is "
      "present as undissociated molecules (Raman spectra): no pH is given; this binary model gives enthalpy, heat "
      "capacity, density and the vapour pressures of water and HNO3"};
}

}  // namespace

const BinaryData& nitric_acid_data() {
  static const BinaryData data = make_data();
  return data;
}

}  // namespace protonflow::thermo::detail
