// HCl–H2O, 0–38 wt %: the published tables behind the concentrated-binary model. Why these sources,
// and how far each goes: docs/concentrated-acids.md. Keys resolve in docs/references.md.
#include <cmath>
#include <iterator>

#include "concentrated_binary_data.hpp"
#include "uni_univalent_isotherm.hpp"

namespace protonflow::thermo::detail {

namespace {

constexpr double molar_mass = 0.03646094;        // kg/mol, python3-periodictable (iupac-atomic-weights)
constexpr double formation_enthalpy = -92307.0;  // ΔfH° HCl(g), J/mol: nbs-1982 (from memory)
constexpr double heat_capacity_gas = 29.12;      // Cp° HCl(g), J/(mol K): nbs-1982 (from memory)
// HCl(g) → H^+ + Cl^- at infinite dilution, J/mol: nbs-1982, −167.159 + 92.307 (derived; from memory).
constexpr double solution_enthalpy_at_infinite_dilution = -74852.0;
// γ±² m(H^+) m(Cl^-) / p(HCl) at 25 °C, mol² kg⁻² atm⁻¹: brimblecombe-clegg-1988 (from memory), the
// value clegg-brimblecombe-1988-hcl (read) finds their measured HCl pressures over concentrated
// solutions to agree with.
constexpr double henry_constant = 2.04e6;

// Apparent relative molal enthalpy L_φ at 25 °C, kJ/mol, against n = mol H2O per mol HCl:
// parker-1965 as tabulated in the CRC Handbook, "Enthalpy of dilution of acids" (read).
struct RelativeEnthalpy {
  double n, l_phi;
};
constexpr RelativeEnthalpy parker[] = {
    {1.0, 45.61},    {2.775, 19.87},   {3.700, 15.40},   {5.551, 10.24}, {6.167, 9.213},  {6.938, 8.201},
    {7.929, 7.217},  {9.251, 6.268},   {10.0, 5.841},    {11.10, 5.318}, {12.33, 4.899},  {13.88, 4.402},
    {15.86, 3.958},  {18.50, 3.506},   {22.20, 3.063},   {27.75, 2.623}, {37.00, 2.167},  {55.51, 1.695},
    {100.0, 1.234},  {111.0, 1.172},   {277.5, 0.761},   {555.1, 0.556}, {1000.0, 0.427}, {2000.0, 0.310},
    {5000.0, 0.197}, {10000.0, 0.142}, {50000.0, 0.067},
};

SmoothTable heat_of_solution_table() {
  std::vector<double> x{0.0}, h{solution_enthalpy_at_infinite_dilution};
  for (auto it = std::rbegin(parker); it != std::rend(parker); ++it) {
    x.push_back(1.0 / (1.0 + it->n));
    h.push_back(solution_enthalpy_at_infinite_dilution + it->l_phi * kilojoule);
  }
  return {x, h};
}

// Mean activity coefficients at 25 °C: robinson-stokes-1959, appendix 8.10 (from memory; the 1 and
// 3 mol/kg values, 0.809 and 1.316, are also rows of tests/reference). The osmotic coefficients they imply by
// Gibbs–Duhem, 1.038 at 1 mol/kg and 1.347 at 3 mol/kg, match the tabulated 1.039 and 1.348; from 1 to
// 15 mol/kg they lie within 1.6 % of the emf study zhao-lei-1986 (read; validation.md).
const UniUnivalentIsotherm& isotherm() {
  static const UniUnivalentIsotherm curve(17.0, {0.001, 0.01, 0.1, 0.2, 0.5, 1.0, 1.5,  2.0,  2.5,  3.0, 3.5,
                                                 4.0,   5.0,  6.0, 7.0, 8.0, 9.0, 10.0, 12.0, 14.0, 16.0},
                                          {0.965, 0.905, 0.796, 0.767, 0.757, 0.809, 0.896, 1.009, 1.147, 1.316, 1.518,
                                           1.762, 2.380, 3.220, 4.37,  5.90,  7.94,  10.44, 17.25, 27.3,  42.4});
  return curve;
}

// Specific heat capacity at 20 °C, J/(kg K): wikipedia-hydrochloric-acid, physical-properties table
// (read; it agrees within 2 % with the mole-fraction table of perry-specific-heats, read); pure
// water from IAPWS-95 (iapws-95).
SmoothTable heat_capacity_table() {
  return {{0.0, 0.10, 0.20, 0.30, 0.32, 0.34, 0.36, 0.38}, {4181.3, 3470, 2990, 2600, 2550, 2500, 2460, 2430}};
}

// β = ∂Δcp/∂T, J/(kg K²): least-squares slopes of perry-specific-heats' hydrochloric-acid table
// (read; cal/(g °C) × 4184 at 0, 10, 20, 40 and 60 °C for 9.09, 16.7 and 20.0 mol % HCl, at 0 and 60 °C
// for 25.9 mol %), less (1 − w) times pure water's slope over the same temperatures (iapws-95 through
// python3-iapws: −0.488 J/(kg K²), −0.574 for 0–60 °C), so that water's own change, which the model
// carries separately, is not counted twice. Zero at w = 0. The table's two or three digits make each
// slope uncertain by about 15 %.
SmoothTable heat_capacity_temperature_slope_table() {
  return {{0.0, 0.1683, 0.2886, 0.3360, 0.4143}, {0.0, 4.626, 4.827, 4.789, 4.520}};
}

// Density at 20 °C, kg/m³: crc-concentrative-properties (read) at 10, 20, 30 and 36 wt %;
// wikipedia-hydrochloric-acid (read) at 32, 34 and 38 wt %; pure water from IAPWS-95.
SmoothTable density_table() {
  return {{0.0, 0.10, 0.20, 0.30, 0.32, 0.34, 0.36, 0.38},
          {998.21, 1047.6, 1098.0, 1149.2, 1159.0, 1169.0, 1179.1, 1189.0}};
}

BinaryData make_data() {
  return BinaryData{
      {"HCl", molar_mass, "g", {0.0, 0.38, 273.15, 393.15}},
      formation_enthalpy,
      heat_capacity_gas,
      formation_enthalpy,  // the reference phase is the gas itself
      heat_capacity_gas,
      heat_of_solution_table(),
      heat_capacity_table(),
      heat_capacity_temperature_slope_table(),
      density_table(),
      [](double) { return 0.0; },  // the expansion of dissolved HCl is not known here: water's alone
      [](double x) { return isotherm().ln_water_activity(x); },
      [](double x) { return isotherm().ln_solute_activity(x) - std::log(henry_constant) + std::log(atmosphere); },
      6.0,  // mol/kg: the range of the HCl ion-interaction parameters (pitzer-1991, from memory)
      "water is the solvent and HCl is fully dissociated to H^+ and Cl^-; the ionic engine describes it and a pH "
      "is meaningful",
      "beyond 6 mol/kg (about 18 wt %) the ion-interaction parameters are not fitted; a pH there (below −1) would "
      "be an extrapolation and is not given; this binary model gives enthalpy, heat capacity, density and the "
      "vapour pressures of water and HCl"};
}

}  // namespace

const BinaryData& hydrochloric_acid_data() {
  static const BinaryData data = make_data();
  return data;
}

}  // namespace protonflow::thermo::detail
