#include "reference_cases.hpp"

#include <boost/math/tools/minima.hpp>
#include <algorithm>
#include <array>
#include <cmath>
#include <functional>
#include <tuple>
#include <utility>
#include <fmt/format.h>

#include "protonflow/thermo/activity_pitzer.hpp"
#include "protonflow/thermo/concentrated_binary.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/formula.hpp"
#include "protonflow/thermo/pitzer_enthalpy.hpp"
#include "protonflow/thermo/stream_enthalpy.hpp"
#include "protonflow/thermo/water_properties.hpp"
#include "solution_probe.hpp"

namespace protonflow::reference {

namespace {

using thermo::ActivityModelKind;
constexpr double celsius = 273.15;

double pkw(double temperature) { return -formation_log_k("OH^-", temperature); }

// pKa of the step HnA → H^+ + Hn−1A: difference of the formation constants of the two species.
double step_pka(const std::string& acid, const std::string& base) {
  return formation_log_k(acid) - (base.empty() ? 0.0 : formation_log_k(base));
}

double ph(const Recipe& recipe, ActivityModelKind model, double temperature = 298.15) {
  return solve_recipe(recipe, model, temperature).speciation.ph;
}

double grams_per_mole(const char* formula) { return 1e3 * thermo::molar_mass(thermo::parse_formula(formula)); }

// The concentrated binaries (thermo/concentrated_binary.hpp): mass fraction of n mol H2O per mol solute.
double binary_mass_fraction(thermo::ConcentratedBinary binary, double water_per_solute) {
  const double solute = thermo::describe(binary).solute_molar_mass;
  return solute / (solute + water_per_solute * thermo::constants::water_molar_mass);
}

// Integral heat of solution at 25 °C, kJ per mol solute, at n mol H2O per mol solute.
double binary_heat_of_solution(thermo::ConcentratedBinary binary, double water_per_solute) {
  return thermo::binary_properties(binary, 298.15, binary_mass_fraction(binary, water_per_solute)).heat_of_solution / 1e3;
}

// Density at 20 °C in g/cm³.
double binary_density(thermo::ConcentratedBinary binary, double mass_fraction) {
  return thermo::binary_properties(binary, 293.15, mass_fraction).density / 1e3;
}

double binary_boiling_celsius(thermo::ConcentratedBinary binary, double mass_fraction) {
  return thermo::bubble_temperature(binary, mass_fraction, 101325.0) - celsius;
}

// The maximum-boiling azeotrope at 1 atm: (mass fraction, °C), by Brent's minimisation of −T_bubble.
std::pair<double, double> binary_azeotrope(thermo::ConcentratedBinary binary, double low, double high) {
  const auto r = boost::math::tools::brent_find_minima(
      [binary](double w) { return -thermo::bubble_temperature(binary, w, 101325.0); }, low, high, 40);
  return {r.first, -r.second - celsius};
}

// Heat released (kJ) per kg of 98 wt % H2SO4 diluted with water, all at 25 °C, to the mass fraction given.
double sulfuric_dilution_heat(double target) {
  using thermo::ConcentratedBinary;
  const double water = 0.98 / target - 1.0;  // kg water per kg acid
  const double before = thermo::binary_specific_enthalpy(ConcentratedBinary::sulfuric_acid, 298.15, 0.98) +
                        water * thermo::binary_specific_enthalpy(ConcentratedBinary::sulfuric_acid, 298.15, 0.0);
  const double after = (1.0 + water) * thermo::binary_specific_enthalpy(ConcentratedBinary::sulfuric_acid, 298.15, target);
  return (before - after) / 1e3;
}

std::vector<ReferenceCase> build_cases() {
  const std::string constants = "Equilibrium constants, 25 °C, infinite dilution";
  const std::string gammas = "Mean activity coefficients, 25 °C";
  const std::string buffers = "Standard buffers, pH(S) at 25 °C";
  const std::string worked = "Worked examples";
  const std::string water = "Water";
  const std::string masses = "Molar masses, g/mol";
  const std::string crc = "CRC Handbook of Chemistry and Physics, dissociation constants (from memory)";
  const std::string pb = "Plummer & Busenberg 1982, Geochim. Cosmochim. Acta 46, 1011";
  const std::string rs = "Robinson & Stokes 1959, Electrolyte Solutions, appendix 8.10 (from memory)";
  const std::string iupac = "IUPAC Recommendations 2002, Buck et al., Pure Appl. Chem. 74, 2169";
  const std::string practice = "common practice, no single source";
  const std::string iapws = "IAPWS R11-07 through python3-iapws";
  const std::string pt = "python3-periodictable";

  std::vector<ReferenceCase> cases{
      {water, "pKw, 0 °C", iapws, 14.9463, 0.002, [] { return pkw(celsius); }},
      {water, "pKw, 25 °C", iapws, 13.9945, 0.002, [] { return pkw(celsius + 25); }},
      {water, "pKw, 50 °C", iapws, 13.2644, 0.002, [] { return pkw(celsius + 50); }},
      {water, "pKw, 100 °C", iapws, 12.2518, 0.002, [] { return pkw(celsius + 100); }},

      {constants, "pK of HSO4^-", crc, 1.99, 0.03, [] { return step_pka("HSO4^-", ""); }},
      {constants, "pK1 of H3PO4", crc, 2.148, 0.03, [] { return step_pka("H3PO4(aq)", "H2PO4^-"); }},
      {constants, "pK2 of H3PO4", crc, 7.198, 0.03, [] { return step_pka("H2PO4^-", "HPO4^2-"); }},
      {constants, "pK3 of H3PO4", crc, 12.35, 0.05, [] { return step_pka("HPO4^2-", ""); }},
      {constants, "pK1 of carbonic acid", pb, 6.352, 0.002, [] { return step_pka("CO2(aq)", "HCO3^-"); }},
      {constants, "pK2 of carbonic acid", pb, 10.329, 0.002, [] { return step_pka("HCO3^-", ""); }},
      {constants, "pK1 of carbonic acid, 0 °C", pb, 6.579, 0.003,
       [] { return formation_log_k("CO2(aq)", celsius) - formation_log_k("HCO3^-", celsius); }},
      {constants, "pK1 of carbonic acid, 50 °C", pb, 6.286, 0.003,
       [] { return formation_log_k("CO2(aq)", celsius + 50) - formation_log_k("HCO3^-", celsius + 50); }},
      {constants, "pKa of acetic acid", "Harned & Ehlers 1933, J. Am. Chem. Soc. 55, 652 (from memory)", 4.756, 0.005,
       [] { return step_pka("CH3COOH(aq)", ""); }},
      {constants, "pKa of formic acid", crc, 3.745, 0.02, [] { return step_pka("HCOOH(aq)", ""); }},
      {constants, "pKa of HF", crc, 3.17, 0.05, [] { return step_pka("HF(aq)", ""); }},
      {constants, "pKa of NH4^+", "Bates & Pinching 1949, J. Res. NBS 42, 419 (from memory)", 9.245, 0.005,
       [] { return -formation_log_k("NH3(aq)"); }},
      {constants, "pKa of boric acid", "Manov, DeLollis & Acree 1944, J. Res. NBS 33, 287 (from memory)", 9.237, 0.01,
       [] { return -formation_log_k("B(OH)4^-"); }},
      {constants, "pK1 of citric acid", crc, 3.13, 0.03, [] { return step_pka("C6H8O7(aq)", "H2C6H5O7^-"); }},
      {constants, "pK2 of citric acid", crc, 4.76, 0.03, [] { return step_pka("H2C6H5O7^-", "HC6H5O7^2-"); }},
      {constants, "pK3 of citric acid", crc, 6.40, 0.03, [] { return step_pka("HC6H5O7^2-", ""); }},
      {constants, "pK1 of SO2(aq)", "Goldberg & Parker 1985, J. Res. NBS 90, 341 (from memory)", 1.86, 0.05,
       [] { return step_pka("SO2(aq)", "HSO3^-"); }},
      {constants, "pK2 of SO2(aq)", "Goldberg & Parker 1985, J. Res. NBS 90, 341 (from memory)", 7.17, 0.05,
       [] { return step_pka("HSO3^-", ""); }},
      {constants, "pK1 of H2S", crc, 6.99, 0.03, [] { return step_pka("H2S(aq)", ""); }},
  };

  // Mean activity coefficients: both models at the published tolerance (±3 % at 0.1, ±5 % at 0.5 mol/kg).
  struct Salt {
    const char* salt;
    const char* cation;
    int cations;
    const char* anion;
    int anions;
    double molality;
    double gamma;
    double relative_tolerance;
  };
  for (const Salt& s : {Salt{"HCl", "H^+", 1, "Cl^-", 1, 0.1, 0.796, 0.03}, Salt{"HCl", "H^+", 1, "Cl^-", 1, 0.5, 0.757, 0.05},
                        Salt{"NaCl", "Na^+", 1, "Cl^-", 1, 0.1, 0.778, 0.03}, Salt{"NaCl", "Na^+", 1, "Cl^-", 1, 0.5, 0.681, 0.05},
                        Salt{"CaCl2", "Ca^2+", 1, "Cl^-", 2, 0.1, 0.518, 0.05}}) {
    for (const auto& [model, label] : {std::pair{ActivityModelKind::davies, "Davies"}, std::pair{ActivityModelKind::b_dot, "B-dot"}}) {
      const std::string quantity = fmt::format("γ± {} {} mol/kg, {}", s.salt, s.molality, label);
      double tolerance = s.relative_tolerance;
      std::string note;
      // Two widened tolerances, each a property of the model form, not of the solver:
      if (quantity == "γ± NaCl 0.5 mol/kg, Davies") {
        tolerance = 0.08;
        note = "Davies has no ion-specific term: it gives one γ± for every 1:1 salt at a given I. The published "
               "HCl and NaCl values at 0.5 mol/kg differ by 11 %, so no ion-independent model meets ±5 % for both; "
               "Davies meets HCl, B-dot meets NaCl.";
      } else if (quantity == "γ± HCl 0.5 mol/kg, B-dot") {
        tolerance = 0.06;
        note = "ḃ = 0.041 is Helgeson's value for NaCl-dominated solutions; HCl lies outside its fit. Davies meets "
               "±5 % for HCl.";
      }
      cases.push_back({gammas, quantity, rs, s.gamma, tolerance * s.gamma,
                       [s, model = model] {
                         return mean_activity_coefficient(s.salt, s.cation, s.cations, s.anion, s.anions, s.molality, model);
                       },
                       note});
    }
  }

  for (const auto& [model, label] : {std::pair{ActivityModelKind::davies, "Davies"}, std::pair{ActivityModelKind::b_dot, "B-dot"}}) {
    cases.push_back({buffers, fmt::format("KH2PO4 + Na2HPO4, 0.025 mol/kg each, {}", label), iupac, 6.865, 0.03,
                     [model = model] { return ph({{"KH2PO4", 0.025}, {"Na2HPO4", 0.025}}, model); }});
    cases.push_back({buffers, fmt::format("potassium hydrogen phthalate 0.05 mol/kg, {}", label), iupac, 4.005, 0.05,
                     [model = model] { return ph({{"KHC8H4O4", 0.05}}, model); }});
  }

  cases.push_back({worked, "acetic acid 0.1 mol/kg, pH (Davies)", practice, 2.88, 0.02,
                   [] { return ph({{"CH3COOH", 0.1}}, ActivityModelKind::davies); }});
  cases.push_back({worked, "HCl 0.01 mol/kg, activity-corrected pH (Davies)", practice, 2.04, 0.01,
                   [] { return ph({{"HCl", 0.01}}, ActivityModelKind::davies); }});
  cases.push_back({worked, "NH3 0.1 mol/kg, pH (Davies)", practice, 11.13, 0.02,
                   [] { return ph({{"NH3", 0.1}}, ActivityModelKind::davies); }});
  cases.push_back({worked, "H2SO4 0.05 mol/kg, ideal solution pH", practice, 1.24, 0.01,
                   [] { return ph({{"H2SO4", 0.05}}, ActivityModelKind::ideal); }});
  cases.push_back({worked, "HCl + NaOH 0.01 mol/kg each, exact equivalence, pH (Davies)", practice, 7.00, 0.01,
                   [] { return ph({{"HCl", 0.01}, {"NaOH", 0.01}}, ActivityModelKind::davies); }});
  // Henderson–Hasselbalch at γ = 1: a half-neutralised weak acid with a large buffer has pH = pKa.
  cases.push_back({worked, "acetic acid 0.5 + NaOH 0.25 mol/kg, ideal: pH = pKa (Henderson-Hasselbalch)",
                   "Harned & Ehlers 1933 pKa with Henderson-Hasselbalch", 4.756, 0.001,
                   [] { return ph({{"CH3COOH", 0.5}, {"NaOH", 0.25}}, ActivityModelKind::ideal); }});
  cases.push_back({worked, "NH4Cl 0.5 + NaOH 0.25 mol/kg, ideal: pH = pKa (Henderson-Hasselbalch)",
                   "Bates & Pinching 1949 pKa with Henderson-Hasselbalch", 9.245, 0.001,
                   [] { return ph({{"NH4Cl", 0.5}, {"NaOH", 0.25}}, ActivityModelKind::ideal); }});

  // Henry's law at 25 °C: molecular solute per atm over water open to the gas (γ = 1 for neutral
  // species in every model), and the combined constant of a strong acid.
  const std::string henry = "Henry's law, 25 °C, mol kg⁻¹ atm⁻¹";
  const auto henry_constant = [](const char* gas, const char* solute, double atm) {
    const ProbeResult r = solve_open_to({}, gas, atm * 101325.0, ActivityModelKind::ideal);
    return r.molality(solute) / atm;
  };
  cases.push_back({henry, "CO2 at 1 atm: m(CO2(aq)) / p", pb, 0.0340, 0.02 * 0.0340,
                   [=] { return henry_constant("CO2(g)", "CO2(aq)", 1.0); }});
  const std::string sander = "Sander 2015, Atmos. Chem. Phys. 15, 4399 (from memory)";
  cases.push_back({henry, "SO2 at 1e-3 atm: m(SO2(aq)) / p", sander, 1.23, 0.123,
                   [=] { return henry_constant("SO2(g)", "SO2(aq)", 1e-3); }});
  cases.push_back({henry, "NH3 at 1e-4 atm: m(NH3(aq)) / p", sander, 59.0, 5.9,
                   [=] { return henry_constant("NH3(g)", "NH3(aq)", 1e-4); }});
  cases.push_back({henry, "H2S at 1e-2 atm: m(H2S(aq)) / p", sander, 0.10, 0.010,
                   [=] { return henry_constant("H2S(g)", "H2S(aq)", 1e-2); }});
  cases.push_back({henry, "HCl at 1e-8 atm: γ±² m(H^+) m(Cl^-) / p (Davies), mol² kg⁻² atm⁻¹ / 1e6",
                   "Brimblecombe & Clegg 1988, J. Atmos. Chem. 7, 1 (from memory)", 2.04, 0.204, [] {
                     const ProbeResult r = solve_open_to({}, "HCl(g)", 1e-8 * 101325.0, ActivityModelKind::davies);
                     const double gamma2 = std::pow(10.0, r.log10_gamma("H^+") + r.log10_gamma("Cl^-"));
                     return gamma2 * r.molality("H^+") * r.molality("Cl^-") / 1e-8 / 1e6;
                   }});
  cases.push_back({henry, "water vapour pressure over pure water, kPa", "IAPWS-95 through python3-iapws", 3.1699,
                   0.001 * 3.1699, [] { return equilibrium_partial_pressure({}, "H2O(g)", ActivityModelKind::davies) / 1e3; }});

  // Enthalpies from the engine's state enthalpies (NBS data, dilute-solution model), kJ/mol.
  const std::string energy = "Reaction and solution enthalpies, 298.15 K, kJ/mol";
  const std::string nbs = "NBS tables, Wagman et al. 1982 (from memory)";
  cases.push_back({energy, "H^+ + OH^- → H2O(l), from HCl and NaOH at 1e-4 mol/kg", nbs, -55.84, 0.3,
                   [] { return neutralisation_enthalpy(1e-4) / 1e3; }});
  // Dissolving into 1 kg of water at 1e-4 mol/kg: low enough that ion association is negligible,
  // high enough that water's own ions, which the acid or base pushes back, add under 0.06 kJ/mol.
  cases.push_back({energy, "HCl(g) → H^+ + Cl^-, 1e-4 mol into 1 kg of water", nbs, -74.85, 0.3,
                   [] { return dissolution_enthalpy("HCl", "HCl(g)", 1e-4) / 1e3; }});
  cases.push_back({energy, "NaOH(s) → Na^+ + OH^-, 1e-4 mol into 1 kg of water", nbs, -44.51, 0.3,
                   [] { return dissolution_enthalpy("NaOH", "NaOH(s)", 1e-4) / 1e3; }});
  // H2SO4 at any finite molality forms HSO4^- (2 % at 1e-4 mol/kg, +0.4 kJ/mol): the published value
  // is the standard-state one, so the case sums the engine's standard-state species enthalpies.
  cases.push_back({energy, "H2SO4(l) → 2 H^+ + SO4^2-, standard states", nbs, -95.28, 0.3,
                   [] { return standard_dissolution_enthalpy("H2SO4", "H2SO4(l)") / 1e3; }});

  // The Pitzer model in concentrated solutions, 25 °C: γ±, φ and stoichiometric γ± of H2SO4, each
  // solved by the engine (speciation included: HSO4^- in sulfuric acid).
  const std::string concentrated = "Concentrated solutions with the Pitzer model, 25 °C";
  const std::string rs_conc = "Robinson & Stokes 1959, Electrolyte Solutions, appendix 8.10 (from memory)";
  struct ConcentratedSalt {
    const char* salt;
    const char* cation;
    int cations;
    const char* anion;
    int anions;
    double molality;
    double gamma;
    double relative_tolerance;
  };
  for (const ConcentratedSalt& s :
       {ConcentratedSalt{"NaCl", "Na^+", 1, "Cl^-", 1, 1.0, 0.657, 0.02}, ConcentratedSalt{"NaCl", "Na^+", 1, "Cl^-", 1, 3.0, 0.714, 0.02},
        ConcentratedSalt{"NaCl", "Na^+", 1, "Cl^-", 1, 6.0, 0.986, 0.02}, ConcentratedSalt{"HCl", "H^+", 1, "Cl^-", 1, 1.0, 0.809, 0.03},
        ConcentratedSalt{"HCl", "H^+", 1, "Cl^-", 1, 3.0, 1.316, 0.03}, ConcentratedSalt{"HCl", "H^+", 1, "Cl^-", 1, 6.0, 3.22, 0.03},
        ConcentratedSalt{"CaCl2", "Ca^2+", 1, "Cl^-", 2, 1.0, 0.495, 0.04},
        ConcentratedSalt{"CaCl2", "Ca^2+", 1, "Cl^-", 2, 2.0, 0.792, 0.04}}) {
    cases.push_back({concentrated, fmt::format("γ± {} {} mol/kg, Pitzer", s.salt, s.molality), rs_conc, s.gamma,
                     s.relative_tolerance * s.gamma, [s] {
                       return mean_activity_coefficient(s.salt, s.cation, s.cations, s.anion, s.anions, s.molality,
                                                        ActivityModelKind::pitzer);
                     }});
  }
  // Temperature: NaCl at 0 °C through Møller's (1988) temperature functions and A_φ(T) of
  // the engine's water properties.
  cases.push_back({concentrated, "γ± NaCl 1 mol/kg at 0 °C, Pitzer", "Rogers & Pitzer 1982, J. Phys. Chem. Ref. Data 11, 15",
                   0.640, 0.03 * 0.640, [] {
                     const ProbeResult r = solve_recipe({{"NaCl", 1.0}}, ActivityModelKind::pitzer, 273.15);
                     return std::pow(10.0, 0.5 * (r.log10_gamma("Na^+") + r.log10_gamma("Cl^-")));
                   }});
  // Osmotic coefficient φ = −ln a_w / (M_w ν m).
  for (const auto& [molality, phi] : {std::pair{1.0, 0.936}, std::pair{3.0, 1.045}, std::pair{6.0, 1.271}}) {
    cases.push_back({concentrated, fmt::format("φ NaCl {} mol/kg, Pitzer", molality), rs_conc, phi, 0.01 * phi,
                     [molality = molality] {
                       const ProbeResult r = solve_recipe({{"NaCl", molality}}, ActivityModelKind::pitzer);
                       return -std::log(r.speciation.water_activity) /
                              (thermo::constants::water_molar_mass * 2.0 * molality);
                     }});
  }
  // Stoichiometric γ± of H2SO4: γ±³ = a(H^+)² a(SO4^2-) / (4 m³), m the stoichiometric molality and
  // a the free ions' activities with the engine's own HSO4^- split — the quantity the cell
  // Pt|H2|H2SO4(m)|Hg2SO4|Hg measures, E = E° − (3RT/2F) ln(4^⅓ m γ±), whatever the speciation.
  // Robinson & Stokes' table (from memory) is Harned & Hamer's (1935) reduction of that cell with
  // E° = 0.61536 V. Covington, Dobson & Wynne-Jones (1965) found E° = 0.61251 V, the value Gardiner,
  // Mitchell & Cobble (1969) took to recalculate γ± of H2SO4 (both E° in Hamer 1972, J. Res. NBS 76A,
  // 185, Table 11, read). The same emfs with the later E° give every γ± times exp(2F ΔE° / 3RT) =
  // 0.9287: the table's values are carried to it here, and the engine must meet them within 5 %.
  const double faraday = 96485.33212;  // C/mol, CODATA 2018 (exact: N_A e)
  const double e_standard_harned_hamer = 0.61536, e_standard_covington = 0.61251;  // V, hamer-1972 Table 11
  const double to_covington_standard = std::exp(2.0 * faraday * (e_standard_covington - e_standard_harned_hamer) /
                                                (3.0 * thermo::constants::gas_constant * 298.15));
  const std::string rs_sulfuric =
      "Robinson & Stokes 1959, appendix 8.10 (from memory; Harned & Hamer's emf), × 0.9287 for E°(Hg2SO4|Hg) "
      "0.61251 V of Covington et al. 1965 in place of 0.61536 V (Hamer 1972, Table 11, read)";
  for (const auto& [molality, gamma] : {std::pair{0.01, 0.544}, std::pair{0.1, 0.265}, std::pair{0.5, 0.154},
                                        std::pair{1.0, 0.130}, std::pair{3.0, 0.141}, std::pair{6.0, 0.264}}) {
    const double reference = gamma * to_covington_standard;
    cases.push_back({concentrated, fmt::format("stoichiometric γ± H2SO4 {} mol/kg, Pitzer", molality), rs_sulfuric,
                     reference, 0.05 * reference, [molality = molality] {
                       const ProbeResult r = solve_recipe({{"H2SO4", molality}}, ActivityModelKind::pitzer);
                       const double a_h = r.molality("H^+") * std::pow(10.0, r.log10_gamma("H^+"));
                       const double a_so4 = r.molality("SO4^2-") * std::pow(10.0, r.log10_gamma("SO4^2-"));
                       return std::cbrt(a_h * a_h * a_so4 / (4.0 * molality * molality * molality));
                     }});
  }

  // Osmotic coefficient of H2SO4 (φ = −ln a_w / (3 M_w m)) against the water activity of the
  // full-range H2SO4–H2O model of Zeleznik (1991), an independent fit to the same kind of data: the
  // hand-over between the two models (docs/concentrated-acids.md) must not jump.
  for (const double molality : {1.0, 3.0, 6.0}) {
    const double acid_mass = molality * 0.0980785;  // kg per kg of water; M(H2SO4) of python3-periodictable
    const double mass_fraction = acid_mass / (1.0 + acid_mass);
    const auto phi_of = [molality](double water_activity) {
      return -std::log(water_activity) / (3.0 * thermo::constants::water_molar_mass * molality);
    };
    cases.push_back({concentrated, fmt::format("φ H2SO4 {} mol/kg, Pitzer", molality),
                     "Zeleznik 1991, J. Phys. Chem. Ref. Data 20, 1157, through the engine's H2SO4–H2O model",
                     phi_of(thermo::binary_properties(thermo::ConcentratedBinary::sulfuric_acid, 298.15, mass_fraction)
                                .water_activity),
                     0.03 * phi_of(thermo::binary_properties(thermo::ConcentratedBinary::sulfuric_acid, 298.15,
                                                             mass_fraction)
                                       .water_activity),
                     [molality, phi_of] {
                       return phi_of(solve_recipe({{"H2SO4", molality}}, ActivityModelKind::pitzer).speciation.water_activity);
                     },
                     "Two published fits disagree here: Clegg, Rard & Pitzer (1994) in the Pitzer engine and Zeleznik "
                     "(1991) in the binary model (its coefficients read from a transcription) differ by up to 2.5 % in φ "
                     "between 1 and 3 mol/kg, in both directions; the row holds 3 % so that a jump at the hand-over "
                     "shows. Osmotic coefficients read at source (Staples 1981, Rard et al.) would say which is off"});
  }

  // Integral heat of solution of H2SO4(l) in n H2O with the Pitzer model: the species' standard
  // enthalpies (NBS), the HSO4^- split the model solves, and the relative enthalpy L from the
  // temperature functions of Clegg, Rard & Pitzer (1994), kJ per mol H2SO4.
  const auto pitzer_heat_of_solution = [](double water_per_acid) {
    const double molality = 1.0 / (thermo::constants::water_molar_mass * water_per_acid);
    const ProbeResult acid = solve_recipe({{"H2SO4", molality}}, ActivityModelKind::pitzer);
    const ProbeResult water = solve_recipe({}, ActivityModelKind::pitzer);
    const auto excess = thermo::make_excess_enthalpy_model(acid.system);
    const double pure = bundled_database().find("H2SO4(l)")->formation_enthalpy->value;
    return (thermo::state_enthalpy(acid.system, acid.speciation, excess.get()) -
            thermo::state_enthalpy(water.system, water.speciation) - molality * pure) /
           molality / 1e3;
  };
  const std::string pitzer_heats = "Heats of dilution with the Pitzer model, 25 °C, kJ/mol";
  for (const auto& [n, value] :
       {std::pair{10.0, -66.5}, std::pair{50.0, -72.8}, std::pair{100.0, -73.7}, std::pair{1000.0, -78.3}})
    cases.push_back({pitzer_heats,
                     fmt::format("H2SO4(l) in {:g} H2O ({:.2f} mol/kg), integral heat of solution, Pitzer", n,
                                 1.0 / (thermo::constants::water_molar_mass * n)),
                     "NBS tables, Wagman et al. 1982 (read)", value, 0.03 * std::abs(value),
                     [n = n, pitzer_heat_of_solution] { return pitzer_heat_of_solution(n); }});

  // Apparent relative molal enthalpy L_φ = L / n(solute) of HCl from the Pitzer model's temperature
  // derivatives (Silvester & Pitzer 1977) and A_H from the engine's water properties, kJ/mol.
  const std::string heats = "Heats of dilution with the Pitzer model, 25 °C, kJ/mol";
  const std::string parker = "Parker 1965, NSRDS-NBS 2, as tabulated in the CRC Handbook (read)";
  for (const auto& [molality, water_per_acid, l_phi] : {std::tuple{1.0, 55.51, 1.695}, std::tuple{6.0, 9.251, 6.268}}) {
    cases.push_back({heats, fmt::format("L_φ HCl, n = {} mol H2O per mol ({:.0f} mol/kg)", water_per_acid, molality),
                     parker, l_phi, 0.05 * l_phi, [molality = molality] {
                       thermo::SoluteProperties p;
                       p.charge = {1, -1};
                       p.ion_size_angstrom = {9, 3};
                       p.name = {"H^+", "Cl^-"};
                       const thermo::PitzerModel model(p, thermo::bundled_pitzer_parameters());
                       const std::vector<double> m{molality, molality};
                       return model.relative_enthalpy(298.15, thermo::constants::standard_atmosphere, m) / molality / 1e3;
                     }});
  }
  // L_φ of a 1:1 acid from the Pitzer model alone (its temperature derivatives and A_H), kJ/mol.
  const auto pitzer_l_phi = [](const char* cation, const char* anion, double molality) {
    thermo::SoluteProperties p;
    p.charge = {1, -1};
    p.ion_size_angstrom = {9, 3};
    p.name = {cation, anion};
    const thermo::PitzerModel model(p, thermo::bundled_pitzer_parameters());
    const std::vector<double> m{molality, molality};
    return model.relative_enthalpy(298.15, thermo::constants::standard_atmosphere, m) / molality / 1e3;
  };
  // More of Parker's HCl column, 0.1 to 5 mol/kg, against Silvester & Pitzer's derivatives (not fitted here).
  for (const auto& [molality, l_phi] : {std::pair{0.1, 0.556}, std::pair{0.5, 1.172}, std::pair{2.0, 2.623},
                                        std::pair{3.0, 3.506}, std::pair{4.0, 4.402}, std::pair{5.0, 5.318}})
    cases.push_back({heats, fmt::format("L_φ HCl, {:g} mol/kg", molality), parker, l_phi, 0.05 * l_phi,
                     [molality = molality, pitzer_l_phi] { return pitzer_l_phi("H^+", "Cl^-", molality); }});
  // Heat released on diluting from m1 to m2, L_φ(m1) − L_φ(m2), kJ per mol acid. The tolerance is the
  // 5 % aim on each L_φ, added: 0.05 (L_φ(m1) + L_φ(m2)).
  const std::string dilution_note =
      "Heats of dilution between two molalities: Parker tabulates L_φ, and the difference of two values each held "
      "to 5 % is held to 5 % of their sum";
  for (const auto& [from, to, l_from, l_to] : {std::tuple{6.0, 1.0, 6.268, 1.695}, std::tuple{6.0, 3.0, 6.268, 3.506},
                                               std::tuple{3.0, 1.0, 3.506, 1.695}, std::tuple{1.0, 0.1, 1.695, 0.556}})
    cases.push_back({heats, fmt::format("HCl diluted from {:g} to {:g} mol/kg, heat released", from, to), parker,
                     l_from - l_to, 0.05 * (l_from + l_to),
                     [from = from, to = to, pitzer_l_phi] {
                       return pitzer_l_phi("H^+", "Cl^-", from) - pitzer_l_phi("H^+", "Cl^-", to);
                     },
                     dilution_note});
  // HNO3: its derivatives in the parameter file are fitted to this same column (1–6 mol/kg), so these rows
  // show the fit's quality, not an independent check.
  const std::string hno3_fit_note =
      "HNO3 with the Pitzer model: no published temperature derivatives of H^+–NO3^- were read, so the three in the "
      "parameter file are a least-squares fit to these Parker values (1–6 mol/kg); the rows show how well three "
      "parameters carry the column, not an independent check. Without them the model gave the Debye–Hückel part "
      "alone, 1.30 kJ/mol at 1 mol/kg against 0.506";
  for (const auto& [molality, l_phi] : {std::pair{1.0, 0.506}, std::pair{3.0, 0.665}, std::pair{6.0, 1.749}})
    cases.push_back({heats, fmt::format("L_φ HNO3, {:g} mol/kg", molality), parker, l_phi, 0.05 * l_phi,
                     [molality = molality, pitzer_l_phi] { return pitzer_l_phi("H^+", "NO3^-", molality); },
                     hno3_fit_note});
  for (const auto& [from, to, l_from, l_to] : {std::tuple{6.0, 1.0, 1.749, 0.506}, std::tuple{5.0, 2.0, 1.310, 0.527}})
    cases.push_back({heats, fmt::format("HNO3 diluted from {:g} to {:g} mol/kg, heat released", from, to), parker,
                     l_from - l_to, 0.05 * (l_from + l_to),
                     [from = from, to = to, pitzer_l_phi] {
                       return pitzer_l_phi("H^+", "NO3^-", from) - pitzer_l_phi("H^+", "NO3^-", to);
                     },
                     hno3_fit_note});
  // The Pitzer model away from 25 °C: the osmotic coefficients of NaCl and KCl at their freezing points, where the
  // parameters are carried from 25 °C by their first and second temperature derivatives (the second ones
  // are what the relative heat capacity rests on). Published: the freezing-point depression of the CRC
  // Handbook's concentrative-properties table (read in a public transcription of the 102nd edition's
  // table, github.com/amosonabike/CRC-Solution-Properties-), turned into the water activity at that temperature
  // by IAPWS: ln a_w = (g_ice − g_liquid) / (R T), ice Ih (IAPWS R10-06) and liquid water (IAPWS-95),
  // from python3-iapws 1.5.2 (`tests/reference/freezing_point_test.cpp` recomputes these φ).
  const std::string freezing = "Temperature dependence of the Pitzer model: NaCl and KCl at their freezing points";
  const std::string crc_freezing =
      "CRC Handbook, concentrative properties, freezing-point depression (read in a transcription of the 102nd "
      "edition's table), with ice and water from python3-iapws";
  for (const auto& [salt, cation, molality, depression, phi] :
       {std::tuple{"NaCl", "Na^+", 0.901, 3.05, 0.91173}, std::tuple{"NaCl", "Na^+", 1.901, 6.56, 0.93031},
        std::tuple{"NaCl", "Na^+", 3.02, 10.89, 0.97335}, std::tuple{"NaCl", "Na^+", 4.278, 16.46, 1.03972},
        std::tuple{"NaCl", "Na^+", 5.111, 20.67, 1.09318}, std::tuple{"KCl", "K^+", 0.706, 2.32, 0.88501},
        std::tuple{"KCl", "K^+", 1.49, 4.81, 0.86983}, std::tuple{"KCl", "K^+", 2.004, 6.45, 0.86767}})
    cases.push_back({freezing, fmt::format("φ {} {:g} mol/kg at its freezing point, −{:g} °C", salt, molality, depression),
                     crc_freezing, phi, 0.05 * phi,
                     [cation = cation, molality = molality, depression = depression] {
                       thermo::SoluteProperties p;
                       p.charge = {1, -1};
                       p.ion_size_angstrom = {4, 3};
                       p.name = {cation, "Cl^-"};
                       const thermo::PitzerModel model(p, thermo::bundled_pitzer_parameters());
                       const std::vector<double> m{molality, molality};
                       thermo::ActivityEvaluation e(2);
                       model.evaluate(celsius - depression, thermo::constants::standard_atmosphere, m, e);
                       return -e.ln_water_activity / (2.0 * thermo::constants::water_molar_mass * molality);
                     },
                     "NaCl and KCl at their freezing points: the 25 °C parameters carried down by Møller's (1988) NaCl "
                     "functions (NaCl −0.2 to +1.8 %; with Silvester & Pitzer's first derivatives and Carroll et al.'s "
                     "second ones, held before, +0.5 to +4.3 %) and Greenberg & Møller's (1989) KCl functions (−0.1 to "
                     "+0.9 %; +0.3 to +1.4 % with the derivatives held before). The 25 °C aim of 1 % is held here at 5 %"});

  // Solubility in brines with the Pitzer model, 25 °C.
  const std::string brines = "Solubility in brines with the Pitzer model, 25 °C";
  const std::string marshall = "Marshall & Slusher 1966, J. Phys. Chem. 70, 4015 (from memory)";
  cases.push_back({brines, "gypsum in water, mol/kg", marshall, 0.0154, 0.05 * 0.0154,
                   [] { return gypsum_solubility(0.0, ActivityModelKind::pitzer); }});
  cases.push_back({brines, "CO2 at 1 atm in 1 mol/kg NaCl over CO2 in water (salting-out)",
                   "Harned & Davis 1943, J. Am. Chem. Soc. 65, 2030 (from memory)", 0.80, 0.04, [] {
                     const double in_brine = solve_open_to({{"NaCl", 1.0}}, "CO2(g)", 101325.0, ActivityModelKind::pitzer)
                                                 .molality("CO2(aq)");
                     const double in_water = solve_open_to({}, "CO2(g)", 101325.0, ActivityModelKind::pitzer).molality("CO2(aq)");
                     return in_brine / in_water;
                   }});
  // CO2 salting-out measured by Malinin & Savelyeva (1972) at 25 °C and 47.95 bar, as Kuenen coefficients
  // (gas per gram of water, so their ratio is the ratio of CO2 molalities), against NaCl in mol per litre of
  // solution. Molarity is turned into molality with the specific volumes of NaCl solutions at 25 °C of
  // Rogers & Pitzer 1982 (CRC Handbook table, read), interpolated linearly.
  const auto nacl_molality_of_molarity = [](double molarity) {
    constexpr std::array<std::pair<double, double>, 9> specific_volume{{{0.1, 0.998834}, {0.25, 0.992832},
        {0.5, 0.983185}, {0.75, 0.973932}, {1.0, 0.965038}, {2.0, 0.932590}, {3.0, 0.904339}, {4.0, 0.879457},
        {5.0, 0.857301}}};  // (mol/kg, cm³/g)
    const double salt = grams_per_mole("NaCl");
    const auto molarity_at = [&](double m) {
      std::size_t k = 1;
      while (k + 1 < specific_volume.size() && specific_volume[k].first < m) ++k;
      const auto [m0, v0] = specific_volume[k - 1];
      const auto [m1, v1] = specific_volume[k];
      const double v = v0 + (v1 - v0) * (m - m0) / (m1 - m0);
      return 1e3 * m / ((1e3 + salt * m) * v);
    };
    double low = 0.1, high = 5.0;  // molarity rises with molality over the table
    for (int i = 0; i < 60; ++i) (molarity_at(0.5 * (low + high)) < molarity ? low : high) = 0.5 * (low + high);
    return 0.5 * (low + high);
  };
  const std::string malinin =
      "Malinin & Savelyeva 1972, Geochem. Int. 9, 410, in the IUPAC-NIST Solubility Database (read)";
  for (const auto& [molarity, kuenen] : {std::pair{0.905, 43.25}, std::pair{1.793, 36.14}, std::pair{2.597, 30.43}})
    cases.push_back({brines, fmt::format("CO2 in {:g} mol/L NaCl over CO2 in water (salting-out), Kuenen coefficients", molarity),
                     malinin, kuenen / 52.84, 0.05 * kuenen / 52.84,
                     [molarity = molarity, nacl_molality_of_molarity] {
                       const double nacl = nacl_molality_of_molarity(molarity);
                       const double in_brine =
                           solve_open_to({{"NaCl", nacl}}, "CO2(g)", 101325.0, ActivityModelKind::pitzer).molality("CO2(aq)");
                       const double in_water = solve_open_to({}, "CO2(g)", 101325.0, ActivityModelKind::pitzer).molality("CO2(aq)");
                       return in_brine / in_water;
                     },
                     "CO2 salting-out: measured at 47.95 bar, where water holds about 1.2 mol/kg CO2, and computed at "
                     "1 atm; the ratio is taken to carry over (the model has no CO2–CO2 or ζ terms), so 5 % is held "
                     "against the data's 1 % scatter"});
  // Metal hydrolysis, complexes and solids, 25 °C, infinite dilution: the data against the compilations'
  // recommended values (log *beta of M + n H2O = M(OH)n + n H^+; log *Ks of the solid's dissolution with H^+).
  const std::string metals = "Metal hydrolysis, complexes and solids, 25 °C, infinite dilution";
  const std::string powell07 = "Powell et al. 2007, Pure Appl. Chem. 79, 895 (from memory)";
  const std::string powell13 = "Powell et al. 2013, Pure Appl. Chem. 85, 2249 (from memory)";
  const std::string brown = "Brown & Ekberg 2016, Hydrolysis of Metal Ions";
  const std::string nordstrom = "Nordstrom et al. 1990, ACS Symp. Ser. 416, 398 (from memory)";
  const std::string rai = "Rai, Sass & Moore 1987, Inorg. Chem. 26, 345 (from memory)";
  const auto log_beta = [](const char* species) { return [species] { return formation_log_k(species); }; };
  const auto log_ks = [](const char* solid) { return [solid] { return -formation_log_k(solid); }; };
  for (const auto& [quantity, source, published, model] : std::vector<std::tuple<std::string, std::string, double, std::function<double()>>>{
           {"log *beta1 CuOH^+", powell07, -7.95, log_beta("CuOH^+")},
           {"log *beta2 Cu(OH)2(aq)", powell07, -16.2, log_beta("Cu(OH)2(aq)")},
           {"log *beta3 Cu(OH)3^-", powell07, -26.60, log_beta("Cu(OH)3^-")},
           {"log *beta4 Cu(OH)4^2-", powell07, -39.74, log_beta("Cu(OH)4^2-")},
           {"log *Ks Cu(OH)2(s)", powell07, 8.67, log_ks("Cu(OH)2(s)")},
           {"log *Ks tenorite CuO", powell07, 7.64, log_ks("tenorite")},
           {"log *Ks theophrastite β-Ni(OH)2", "Palmer et al., J. Coord. Chem., OSTI 1055155 (read, abstract)", 11.67, log_ks("theophrastite")},
           {"log *beta1 ZnOH^+", powell13, -8.96, log_beta("ZnOH^+")},
           {"log *beta2 Zn(OH)2(aq)", powell13, -17.82, log_beta("Zn(OH)2(aq)")},
           {"log *beta3 Zn(OH)3^-", powell13, -28.05, log_beta("Zn(OH)3^-")},
           {"log *beta4 Zn(OH)4^2-", powell13, -40.41, log_beta("Zn(OH)4^2-")},
           {"log *Ks zincite ZnO", powell13, 11.12, log_ks("zincite")},
           {"log *beta2 Al(OH)2^+", brown, -10.63, log_beta("Al(OH)2^+")},
           {"log *beta3 Al(OH)3(aq)", brown, -15.66, log_beta("Al(OH)3(aq)")},
           {"log *Ks gibbsite", brown, 7.75, log_ks("gibbsite")},
           {"log *Ks Al(OH)3(am)", nordstrom, 10.8, log_ks("Al(OH)3(am)")},
           {"log *Ks ferrihydrite Fe(OH)3", nordstrom, 4.891, log_ks("ferrihydrite")},
           {"log *beta3 Fe(OH)3(aq)", nordstrom, -12.56, log_beta("Fe(OH)3(aq)")},
           {"log *beta1 FeOH^+", nordstrom, -9.5, log_beta("FeOH^+")},
           {"log *Ks Fe(OH)2(s)", nordstrom, 13.564, log_ks("Fe(OH)2(s)")},
           {"log Ksp siderite FeCO3", nordstrom, -10.89, log_ks("siderite")},
           {"log K FeSO4(aq)", nordstrom, 2.25, log_beta("FeSO4(aq)")},
           {"log K CaF^+", nordstrom, 0.94, log_beta("CaF^+")},
           {"log K AlF^2+", nordstrom, 7.0, log_beta("AlF^2+")},
           {"log K FeSO4^+", nordstrom, 4.04, log_beta("FeSO4^+")},
           {"log *Ks Cr(OH)3(am)", rai, 9.35, log_ks("Cr(OH)3(am)")},
           {"log *beta3 Cr(OH)3(aq)", rai, -16.19, log_beta("Cr(OH)3(aq)")},
           {"log *beta1 MnOH^+", nordstrom, -10.59, log_beta("MnOH^+")},
           {"log beta4 Cu(NH3)4^2+ (2 M NH4NO3, 30 °C)", "Bjerrum 1941, Metal Ammine Formation (from memory)", 13.32,
            [] { return formation_log_k("Cu(NH3)4^2+") - 4 * formation_log_k("NH3(aq)"); }},
       }) {
    cases.push_back({metals, quantity, source, published, 0.005, model});
  }
  // Solids of fluoride removal, soda ash, copper, phosphate and sulfite liquors, each against the constant as
  // its source writes the reaction (salts.yaml converts them to formation from the basis species).
  const std::string solids = "Solids of fluoride, carbonate, phosphate and sulfite liquors, 25 °C, infinite dilution";
  const auto log_k_at = [](const char* species, double temperature) {
    return [species, temperature] { return formation_log_k(species, temperature); };
  };
  for (const auto& [quantity, source, published, model] : std::vector<std::tuple<std::string, std::string, double, std::function<double()>>>{
           {"log Ksp villiaumite NaF", "Nordstrom 2022, Mineral. Mag. (read, abstract)", -0.4981, log_ks("villiaumite")},
           {"log Ksp nahcolite NaHCO3 (Na^+ + HCO3^-)", "NBS 1982 ΔfG° (from memory)", -0.407,
            [] { return formation_log_k("HCO3^-") - formation_log_k("nahcolite"); }},
           {"log Ksp sellaite MgF2", "CRC Handbook, Ksp 5.16e-11 (from memory)", -10.29, log_ks("sellaite")},
           {"log *Ks0 ½ malachite + 2 H^+ = Cu^2+ + 3/2 H2O + ½ CO2(g)", "Preis & Gamsjäger 2002, J. Chem. Thermodyn. 34 (read, abstract)", 6.34,
            [] { return 0.5 * (formation_log_k("CO2(g)") - formation_log_k("malachite")); }},
           {"log Ksp brushite (Ca^2+ + HPO4^2-)", "Gregory, Moreno & Brown 1970, as tabulated by Dorozhkin 2010 (read)", -6.59,
            [] { return formation_log_k("HPO4^2-") - formation_log_k("brushite"); }},
           {"log Ksp brushite (Ca^2+ + HPO4^2-) at 37 °C", "Gregory, Moreno & Brown 1970, as tabulated by Dorozhkin 2010 (read)", -6.63,
            [=] { return log_k_at("HPO4^2-", 310.15)() - log_k_at("brushite", 310.15)(); }},
           {"log *Ks strengite + 3 H^+ = Fe^3+ + H3PO4(aq) + 2 H2O", "Iuliano, Ciavatta & De Tommaso 2007, SSSAJ 71 (read, abstract)", -6.70,
            [] { return formation_log_k("H3PO4(aq)") - formation_log_k("strengite"); }},
           {"log Ksp hannebachite CaSO3·½H2O", "Lange's Handbook, Ksp 3.1e-7 (from memory)", -6.51, log_ks("hannebachite")},
           {"log *Kps0 smithsonite + 2 H^+ = Zn^2+ + CO2(g) + H2O", "Preis, Königsberger & Gamsjäger 2000, J. Solution Chem. 29 (read, abstract)", 7.25,
            [] { return formation_log_k("CO2(g)") - formation_log_k("smithsonite"); }},
           // Per Ca10(PO4)6(OH)2 = 10 Ca^2+ + 6 PO4^3- + 2 OH^-: twice the data's Ca5 unit.
           {"−log Ksp hydroxyapatite Ca10(PO4)6(OH)2", "Dorozhkin 2010, Materials 3, table 3 (read)", 116.8,
            [] { return 2.0 * (formation_log_k("hydroxyapatite") - formation_log_k("OH^-")); }},
       }) {
    cases.push_back({solids, quantity, source, published, 0.005, model});
  }
  cases.push_back({solids, "−log Ksp hydroxyapatite Ca10(PO4)6(OH)2 at 37 °C", "Dorozhkin 2010, Materials 3, table 3 (read)", 117.2,
                   0.05, [] { return 2.0 * (formation_log_k("hydroxyapatite", 310.15) - formation_log_k("OH^-", 310.15)); },
                   "±0.05, the rounding of the tabulated value; the data's enthalpy is fitted to it with pKw's 25 °C enthalpy"});
  cases.push_back({metals, "ΔfH° of Cr^3+(aq), kJ/mol", "Ball & Nordstrom 1998, J. Chem. Eng. Data 43, 895 (from memory)",
                   -238.5, 0.05, [] { return bundled_database().find("Cr^3+")->formation_enthalpy->value / 1e3; }});
  // Palmer et al. fit ΔrCp = 0 over 5–200 °C, so their constant at 60 °C is van 't Hoff with their mean ΔrH:
  // 11.67 − 82.1 kJ/mol / (R ln 10) × (1/298.15 − 1/333.15) K⁻¹ = 11.67 − 1.511 = 10.16.
  cases.push_back({metals, "log *Ks theophrastite β-Ni(OH)2 at 60 °C",
                   "Palmer et al., J. Coord. Chem., OSTI 1055155 (read, abstract: ΔrH −82.1 kJ/mol, ΔrCp 0, 5–200 °C)",
                   10.16, 0.01, [] { return -formation_log_k("theophrastite", 333.15); },
                   "±0.01, the rounding; the published value is their model at 60 °C, log *Ks(25 °C) with their mean ΔrH"});
  // Calcium and ferric phosphate ion pairs (phosphate.yaml), each against its source's own reaction.
  const std::string pairs = "Calcium and ferric phosphate ion pairs, 25 and 37.5 °C";
  const std::string gregory = "Gregory, Moreno & Brown 1970, J. Res. NBS 74A, the abstract's equations (read)";
  cases.push_back({pairs, "log K Ca^2+ + HPO4^2- = CaHPO4(aq)", gregory, 2.401, 0.005,
                   [] { return formation_log_k("CaHPO4(aq)") - formation_log_k("HPO4^2-"); }});
  cases.push_back({pairs, "log K Ca^2+ + H2PO4^- = CaH2PO4^+", gregory, 0.703, 0.005,
                   [] { return formation_log_k("CaH2PO4^+") - formation_log_k("H2PO4^-"); }});
  // At 37.5 °C the data's van 't Hoff from 25 °C leaves the fitted curve by 0.13 for CaHPO4(aq).
  cases.push_back({pairs, "log K Ca^2+ + HPO4^2- = CaHPO4(aq) at 37.5 °C", gregory, 2.599, 0.15,
                   [] { return formation_log_k("CaHPO4(aq)", 310.65) - formation_log_k("HPO4^2-", 310.65); },
                   "±0.15: van 't Hoff with the fit's 25 °C slope, not its curvature, which must not be carried to 60 °C"});
  cases.push_back({pairs, "log K Ca^2+ + H2PO4^- = CaH2PO4^+ at 37.5 °C", gregory, 0.650, 0.05,
                   [] { return formation_log_k("CaH2PO4^+", 310.65) - formation_log_k("H2PO4^-", 310.65); },
                   "±0.05: van 't Hoff with the fit's 25 °C slope"});
  // The review gives log beta at I = 0.1 mol/kg; the data hold it at infinite dilution (Davies): back to 0.1 here.
  cases.push_back({pairs, "log beta Fe^3+ + H2PO4^- = FeH2PO4^2+ at I = 0.1 mol/kg (Davies)",
                   "2024 review PMC10943352, table 3 (read)", 3.5, 0.05, [] {
                     const double a = thermo::debye_huckel_parameters(298.15, thermo::constants::standard_atmosphere).a;
                     const double davies = std::sqrt(0.1) / (1.0 + std::sqrt(0.1)) - 0.3 * 0.1;
                     return formation_log_k("FeH2PO4^2+") - formation_log_k("H2PO4^-") - 6.0 * a * davies;
                   },
                   "±0.05, the rounding of the tabulated 3.5"});
  cases.push_back({constants, "pKa of HOCl", "Morris 1966, J. Phys. Chem. 70, 3798 (from memory)", 7.53, 0.01,
                   [] { return -formation_log_k("OCl^-"); }});
  cases.push_back({constants, "Cl2(aq) + H2O = HOCl + H^+ + Cl^-, log K", "Wang & Margerum 1994, Inorg. Chem. 33, 1050 (from memory)",
                   -3.35, 0.1, [] { return -formation_log_k("Cl2(aq)"); }});
  // In 0.1 mol/kg HCl, as molecular solubility is measured: the acid holds the hydrolysis back.
  cases.push_back({henry, "Cl2 (molecular) at 1e-3 atm over 0.1 mol/kg HCl: m(Cl2(aq)) / p",
                   "Sander 2015, listing NBS 1982 (read)", 0.062, 0.003, [] {
                     const ProbeResult r = solve_open_to({{"HCl", 0.1}}, "Cl2(g)", 1e-3 * 101325.0, ActivityModelKind::ideal);
                     return r.molality("Cl2(aq)") / 1e-3;
                   }});
  // Dissolved O2 from water-saturated air at 1 atm: KH(T) times p(O2) = 0.20946 (101.325 kPa - p_sat(T)).
  const auto oxygen_mg_per_kg = [](double temperature) {
    const double p_o2 = 0.20946 * (thermo::constants::standard_atmosphere - thermo::water_saturation_pressure(temperature)) /
                        thermo::constants::standard_atmosphere;
    return std::pow(10.0, -formation_log_k("O2(g)", temperature)) * p_o2 * 31998.8;
  };
  const std::string benson = "Benson & Krause 1984, Limnol. Oceanogr. 29, 620 (from memory)";
  cases.push_back({henry, "O2 from air at 25 °C, mg per kg of water", benson, 8.27, 0.1, [=] { return oxygen_mg_per_kg(298.15); }});
  cases.push_back({henry, "O2 from air at 10 °C, mg per kg of water", benson, 11.29, 0.25,
                   [=] { return oxygen_mg_per_kg(283.15); },
                   "van 't Hoff with Sander's 1700 K instead of the published fit: within 2 %"});

  cases.push_back({masses, "M(H2SO4)", pt, 98.0785, 1e-4, [] { return grams_per_mole("H2SO4"); }});
  cases.push_back({masses, "M(CaSO4·2H2O)", pt, 172.1712, 1e-4, [] { return grams_per_mole("CaSO4.2H2O"); }});

  // Concentrated acid–water binaries (docs/concentrated-acids.md). The NBS, Circular 500 and Parker
  // values below are also nodes of the models' own tables: these rows guard the path from the tables
  // through the per-kg enthalpy to the published quantity; the independent checks are the densities
  // of NaOH, the boiling points, the azeotropes and the dilution heats.
  {
    using thermo::ConcentratedBinary;
    const std::string binaries = "Concentrated acid–water binaries (binary models)";
    const std::string nbs_read = "NBS tables, Wagman et al. 1982 (read)";
    const std::string c500 = "NBS Circular 500, as reproduced in chemical-engineering texts (from memory)";
    const std::string parker = "Parker 1965, NSRDS-NBS 2, as tabulated in the CRC Handbook (read)";
    const std::string crc_density = "CRC Handbook, concentrative properties of aqueous solutions (read)";
    const std::string boiling_read = "common handbook values (read)";
    const std::string boiling_memory = "from memory; check against Gmitro & Vermeulen 1964, AIChE J. 10, 740";
    const auto sulfuric = ConcentratedBinary::sulfuric_acid;
    const auto hydrochloric = ConcentratedBinary::hydrochloric_acid;
    const auto nitric = ConcentratedBinary::nitric_acid;
    const auto caustic = ConcentratedBinary::sodium_hydroxide;
    for (const auto& [n, value, source, tolerance] :
         {std::tuple{1.0, -27.8, nbs_read, 0.03}, std::tuple{2.0, -41.92, c500, 0.01}, std::tuple{5.0, -58.03, c500, 0.01},
          std::tuple{10.0, -66.5, nbs_read, 0.03}, std::tuple{25.0, -72.30, c500, 0.01}, std::tuple{50.0, -72.8, nbs_read, 0.03},
          std::tuple{100.0, -73.7, nbs_read, 0.03}})
      cases.push_back({binaries, fmt::format("H2SO4(l) in {:g} H2O, integral heat of solution at 25 °C, kJ/mol", n),
                       source, value, std::abs(value) * tolerance,
                       [n = n, sulfuric] { return binary_heat_of_solution(sulfuric, n); }});
    // L_φ = ΔH_sol(n) − ΔH_sol(∞), within each model's range (HCl to 38 wt %, n ≥ 3.3; HNO3 to 70 wt %,
    // n ≥ 1.5); ΔH_sol(∞) of HCl(g) −74.852 and of HNO3(l) −30.90 kJ/mol (nbs-1982, from memory:
    // the first derived, −167.159 + 92.307, the second recalled as such).
    for (const auto& [n, value] : {std::pair{3.700, 15.40}, std::pair{5.551, 10.24}, std::pair{9.251, 6.268},
                                   std::pair{18.50, 3.506}, std::pair{55.51, 1.695}})
      cases.push_back({binaries, fmt::format("HCl in {:g} H2O, L_φ at 25 °C, kJ/mol", n), parker, value, 0.03 * value,
                       [n = n, hydrochloric] { return binary_heat_of_solution(hydrochloric, n) + 74.852; }});
    for (const auto& [n, value] : {std::pair{2.775, 9.498}, std::pair{5.551, 3.933},
                                   std::pair{9.251, 1.749}, std::pair{18.50, 0.665}, std::pair{55.51, 0.506}})
      cases.push_back({binaries, fmt::format("HNO3 in {:g} H2O, L_φ at 25 °C, kJ/mol", n), parker, value, 0.03 * value,
                       [n = n, nitric] { return binary_heat_of_solution(nitric, n) + 30.90; }});
    for (const auto& [w, value] : {std::pair{0.10, 1.0661}, std::pair{0.20, 1.1398}, std::pair{0.30, 1.2191},
                                   std::pair{0.70, 1.6105}, std::pair{0.90, 1.8144}, std::pair{0.98, 1.8361}})
      cases.push_back({binaries, fmt::format("H2SO4 {:g} wt %, density at 20 °C, g/cm³", 100 * w), crc_density, value,
                       0.005 * value, [w = w, sulfuric] { return binary_density(sulfuric, w); }});
    for (const auto& [w, value] :
         {std::pair{0.10, 1.0476}, std::pair{0.20, 1.098}, std::pair{0.30, 1.1492}, std::pair{0.36, 1.1791}})
      cases.push_back({binaries, fmt::format("HCl {:g} wt %, density at 20 °C, g/cm³", 100 * w), crc_density, value,
                       0.005 * value, [w = w, hydrochloric] { return binary_density(hydrochloric, w); }});
    cases.push_back({binaries, "HNO3 40 wt %, density at 20 °C, g/cm³", crc_density, 1.2466, 0.005 * 1.2466,
                     [nitric] { return binary_density(nitric, 0.40); }});
    cases.push_back({binaries, "NaOH 40 wt %, density at 20 °C, g/cm³", crc_density, 1.4299, 0.005 * 1.4299,
                     [caustic] { return binary_density(caustic, 0.40); }});
    cases.push_back({binaries, "HCl 10 wt %, boiling point at 1 atm, °C", boiling_read, 103.0, 2.0,
                     [hydrochloric] { return binary_boiling_celsius(hydrochloric, 0.10); }});
    cases.push_back({binaries, "HCl 30 wt %, boiling point at 1 atm, °C", boiling_read, 90.0, 2.0,
                     [hydrochloric] { return binary_boiling_celsius(hydrochloric, 0.30); }});
    cases.push_back({binaries, "HCl 36 wt %, boiling point at 1 atm, °C", boiling_read, 61.0, 4.0,
                     [hydrochloric] { return binary_boiling_celsius(hydrochloric, 0.36); },
                     "HCl 36 wt %: no published pressure read bears out 61 °C. Perry's partial-pressure tables "
                     "(whose 20 °C totals match the International Critical Tables' rows below) put the 1 atm bubble "
                     "point of 36 % acid at 56.5 °C; the model (emf-based γ± within 1.6 % of Zhao & Lei 1986 to 15 "
                     "mol/kg, Clegg & Brimblecombe's Henry's-law constant, Parker's heats) boils it at 57.7 °C. 61 °C "
                     "needs a mean heat of HCl desorption of about 40.5 kJ/mol over 25–61 °C, against 44.6 from "
                     "Parker's calorimetry and 42.7 from Perry's table (least-squares slopes over 0–60 °C). Published "
                     "2 K; held at 4 K. The boiling curve is checked at 2 K against the points Perry's tables imply "
                     "(rows below)."});
    cases.push_back({binaries, "HCl maximum-boiling azeotrope at 1 atm, wt %", "Wikipedia, Hydrochloric acid (read)",
                     20.2, 1.0, [hydrochloric] { return 100 * binary_azeotrope(hydrochloric, 0.15, 0.25).first; }});
    cases.push_back({binaries, "HCl maximum-boiling azeotrope at 1 atm, °C", "Wikipedia, Hydrochloric acid (read)",
                     108.6, 2.0, [hydrochloric] { return binary_azeotrope(hydrochloric, 0.15, 0.25).second; }});
    cases.push_back({binaries, "HNO3 maximum-boiling azeotrope at 1 atm, wt %", boiling_read, 68.0, 1.0,
                     [nitric] { return 100 * binary_azeotrope(nitric, 0.55, 0.70).first; },
                     "HNO3 azeotrope: a calibration, not a check. No HNO3 activities above 3 mol/kg were read; "
                     "beyond 3 mol/kg ln γ± leaves the table with its own slope and bends smoothly to a final slope, "
                     "and those two parameters are fitted to put the azeotrope at 68.0 wt % and 120.5 °C. Water and "
                     "acid activities still come from the one ln γ± curve (Gibbs-Duhem holds). The azeotrope at "
                     "1 atm agrees only because it was fitted; Clegg & Brimblecombe's (1990) parameters or Davis & De "
                     "Bruin's (1964) activities, when read, are the test."});
    cases.push_back({binaries, "HNO3 maximum-boiling azeotrope at 1 atm, °C", boiling_read, 120.5, 2.0,
                     [nitric] { return binary_azeotrope(nitric, 0.55, 0.70).second; }});
    cases.push_back({binaries, "H2SO4 50 wt %, boiling point at 1 atm, °C", boiling_memory, 124.0, 5.0,
                     [sulfuric] { return binary_boiling_celsius(sulfuric, 0.50); }});
    cases.push_back({binaries, "H2SO4 70 wt %, boiling point at 1 atm, °C", boiling_memory, 167.0, 5.0,
                     [sulfuric] { return binary_boiling_celsius(sulfuric, 0.70); }});
    // Densities away from 20 °C: only the 20 °C tables enter the models; the temperature dependence
    // is water's own expansion plus the pure acid's (docs/concentrated-acids.md).
    const std::string advancedthermo = "advancedthermo.com electrolyte density tables (read)";
    for (const auto& [binary, molality, t, value] :
         {std::tuple{hydrochloric, 6.0, 25.0, 1.08485}, std::tuple{hydrochloric, 6.0, 85.0, 1.05540},
          std::tuple{hydrochloric, 3.0, 55.0, 1.03258}, std::tuple{hydrochloric, 1.0, 85.0, 0.98626},
          std::tuple{nitric, 6.0, 25.0, 1.15873}, std::tuple{nitric, 6.0, 85.0, 1.11147},
          std::tuple{nitric, 3.0, 55.0, 1.06945}, std::tuple{caustic, 6.0, 25.0, 1.20866},
          std::tuple{caustic, 6.0, 85.0, 1.17227}, std::tuple{caustic, 3.0, 55.0, 1.09840},
          std::tuple{caustic, 1.0, 85.0, 1.00878}})
      cases.push_back({binaries,
                       fmt::format("{} {:g} mol/kg, density at {:g} °C, g/cm³", thermo::describe(binary).solute, molality, t),
                       advancedthermo, value, 0.005 * value, [binary = binary, molality = molality, t = t] {
                         const double mass = molality * thermo::describe(binary).solute_molar_mass;
                         return thermo::binary_properties(binary, t + celsius, mass / (1.0 + mass)).density / 1e3;
                       }});
    // Total vapour pressure over HCl at 20 °C (International Critical Tables, in the Wikipedia table):
    // the model's pressures come from γ± and a Henry's-law constant at 25 °C, no pressure enters it.
    for (const auto& [w, value] : {std::pair{0.10, 1.95}, std::pair{0.20, 1.40}, std::pair{0.30, 2.13}, std::pair{0.32, 3.73},
                                   std::pair{0.34, 7.24}, std::pair{0.36, 14.5}, std::pair{0.38, 28.3}})
      cases.push_back(
          {binaries, fmt::format("HCl {:g} wt %, total vapour pressure at 20 °C, kPa", 100 * w),
           "International Critical Tables, in Wikipedia, Hydrochloric acid (read)", value, (w <= 0.30 ? 0.05 : 0.15) * value,
           [w = w, hydrochloric] {
             const thermo::BinaryProperties p = thermo::binary_properties(hydrochloric, 293.15, w);
             return (p.water_vapour_pressure + p.solute_vapour_pressure) / 1e3;
           },
           w <= 0.30   ? std::string{}
           : w == 0.32 ? "HCl above 30 wt %: no tolerance is published for these pressures; 5 % is held to 30 wt %, "
                         "and 15 % above, where the model's HCl pressure rests on mean activity coefficients at "
                         "12–17 mol/kg recalled from Robinson & Stokes (10–14 % low at 32–36 wt %). Those γ± agree "
                         "within 1.6 % with Zhao & Lei's 1986 emf study to 15 mol/kg (rows below): the gap is between "
                         "the emf route and these older pressures, not a slip of memory."
                       : "HCl above 30 wt %: as for 32 wt %."});
    cases.push_back({binaries, "98 wt % H2SO4 diluted to 70 wt % at 25 °C, heat released, kJ per kg acid",
                     "NBS tables, Wagman et al. 1982, integral heats of solution, derived (roughly)", 400.0, 40.0,
                     [] { return sulfuric_dilution_heat(0.70); }});
    cases.push_back({binaries, "98 wt % H2SO4 diluted to 50 wt % at 25 °C, heat released, kJ per kg acid",
                     "NBS tables, Wagman et al. 1982, integral heats of solution, derived (about)", 550.0, 55.0,
                     [] { return sulfuric_dilution_heat(0.50); }});
    // HCl heat capacity away from 20 °C: the model's 20 °C table (Wikipedia) carried by the slope β
    // fitted to Perry's 0–60 °C columns (its 20 °C column is not a node of the model's table).
    const std::string perry_heats = "Perry's Handbook, specific heats of aqueous solutions, hydrochloric acid (read)";
    for (const auto& [t, value] : {std::pair{0.0, 0.58}, std::pair{60.0, 0.638}})
      cases.push_back({binaries, fmt::format("HCl 20.0 mol % (33.6 wt %), specific heat at {:g} °C, cal/(g K)", t),
                       perry_heats, value, 0.02 * value, [t = t, hydrochloric] {
                         const double x = 0.200, solute = x * thermo::describe(hydrochloric).solute_molar_mass;
                         const double w = solute / (solute + (1.0 - x) * thermo::constants::water_molar_mass);
                         return thermo::binary_properties(hydrochloric, t + celsius, w).heat_capacity / 4184.0;
                       }});
    cases.push_back({binaries, "HCl 22 wt %, partial pressure of HCl at 30 °C, mmHg",
                     "Perry's Handbook, partial pressures of HCl over aqueous HCl, as quoted in a course tutorial (read)",
                     1.02, 0.10 * 1.02, [hydrochloric] {
                       return thermo::binary_properties(hydrochloric, 303.15, 0.22).solute_vapour_pressure / 133.322;
                     }});
    // Perry's partial pressures of HCl and of water over 30–38 wt % acid, 0–110 °C, mmHg (its 20 °C
    // totals are the International Critical Tables' rows above): a check of each vapour on its own,
    // at the strengths where the 1 atm boiling curve is steep. The model takes no pressure from it.
    const std::string perry_pressures = "Perry's Handbook, partial pressures of HCl and of H2O over aqueous HCl (read)";
    const std::string perry_hcl_note =
        "HCl over 30–38 wt % acid: the table's HCl pressures lie 10–14 % above the emf route at 25 °C (γ± of "
        "Zhao & Lei 1986 and Clegg & Brimblecombe's Henry's-law constant give the model's, within 3 %); the table's "
        "own columns obey Gibbs–Duhem only to 5–10 % between neighbouring strengths. Held at 20 %, the size of that "
        "disagreement; the model lies from 18 % below the table (36 wt %, 0 °C) to 4 % above it (38 wt %, 45 °C), "
        "nearest it near the boiling points.";
    for (const auto& [w, t, value] :
         {std::tuple{0.30, 25.0, 15.1}, std::tuple{0.30, 90.0, 542.0}, std::tuple{0.36, 0.0, 29.0},
          std::tuple{0.36, 25.0, 142.0}, std::tuple{0.36, 50.0, 535.0}, std::tuple{0.36, 60.0, 860.0},
          std::tuple{0.38, 25.0, 277.0}, std::tuple{0.38, 45.0, 758.0}})
      cases.push_back({binaries, fmt::format("HCl {:g} wt %, partial pressure of HCl at {:g} °C, mmHg", 100 * w, t),
                       perry_pressures, value, 0.20 * value,
                       [w = w, t = t, hydrochloric] {
                         return thermo::binary_properties(hydrochloric, t + celsius, w).solute_vapour_pressure / 133.322;
                       },
                       perry_hcl_note});
    for (const auto& [w, t, value] :
         {std::tuple{0.30, 90.0, 207.0}, std::tuple{0.36, 25.0, 4.41}, std::tuple{0.36, 60.0, 34.8}})
      cases.push_back({binaries, fmt::format("HCl {:g} wt %, partial pressure of H2O at {:g} °C, mmHg", 100 * w, t),
                       perry_pressures, value, 0.05 * value, [w = w, t = t, hydrochloric] {
                         return thermo::binary_properties(hydrochloric, t + celsius, w).water_vapour_pressure / 133.322;
                       }});
    // The 1 atm bubble point those tables imply: HCl + water at the two tabulated temperatures that
    // bracket 760 mmHg, ln p interpolated linearly in 1/T (derived here from the table's entries).
    const auto bubble_point_of_table = [](double t_low, double total_low, double t_high, double total_high) {
      const double x_low = 1.0 / (t_low + celsius), x_high = 1.0 / (t_high + celsius);
      const double f = std::log(760.0 / total_low) / std::log(total_high / total_low);
      return 1.0 / (x_low + f * (x_high - x_low)) - celsius;
    };
    struct TableBracket {
      double w, t_low, hcl_low, water_low, t_high, hcl_high, water_high;
    };
    for (const TableBracket& b : {TableBracket{0.30, 90.0, 542.0, 207.0, 100.0, 845.0, 310.0},
                                  TableBracket{0.32, 80.0, 623.0, 120.0, 90.0, 970.0, 184.0},
                                  TableBracket{0.34, 60.0, 450.0, 40.5, 70.0, 720.0, 66.5},
                                  TableBracket{0.36, 50.0, 535.0, 20.4, 60.0, 860.0, 34.8},
                                  TableBracket{0.38, 40.0, 598.0, 9.52, 45.0, 758.0, 13.0}})
      cases.push_back({binaries,
                       fmt::format("HCl {:g} wt %, boiling point at 1 atm implied by Perry's partial pressures, °C", 100 * b.w),
                       "Perry's Handbook, partial pressures of HCl and of H2O over aqueous HCl (read), derived",
                       bubble_point_of_table(b.t_low, b.hcl_low + b.water_low, b.t_high, b.hcl_high + b.water_high), 2.0,
                       [w = b.w, hydrochloric] { return binary_boiling_celsius(hydrochloric, w); }});
    // γ± of HCl at 25 °C from the model's HCl pressure and its Henry's-law constant (2.04e6 mol² kg⁻² atm⁻¹,
    // clegg-brimblecombe-1988-hcl) against the emf study of Zhao & Lei 1986 (glass and hydrogen electrodes
    // against Ag–AgCl, 0.018–15.02 mol/kg), through their fitted equation
    //   log10 γ± = −0.5115 √m/(1 + 1.471 √m) + 0.1069 m + 7.412e-3 m² − 6.637e-4 m³ + 1.586e-5 m⁴
    // (the stored abstract lost its √ and exponents; so restored, it gives 0.807, 1.322 and 10.44 at 1, 3
    // and 10 mol/kg against Robinson & Stokes' 0.809, 1.316 and 10.44).
    const auto zhao_lei = [](double m) {
      const double s = std::sqrt(m);
      return std::pow(10.0, -0.5115 * s / (1.0 + 1.471 * s) + 0.1069 * m + 7.412e-3 * m * m - 6.637e-4 * m * m * m +
                                1.586e-5 * m * m * m * m);
    };
    for (const double m : {10.0, 12.0, 15.0})
      cases.push_back({binaries, fmt::format("HCl {:g} mol/kg, γ± at 25 °C from the HCl pressure", m),
                       "Zhao & Lei 1986, Acta Phys.-Chim. Sin. 2, 30 (read, abstract)", zhao_lei(m), 0.03 * zhao_lei(m),
                       [m, hydrochloric] {
                         const double solute = m * thermo::describe(hydrochloric).solute_molar_mass;
                         const double p = thermo::binary_properties(hydrochloric, 298.15, solute / (1.0 + solute))
                                              .solute_vapour_pressure / 101325.0;
                         return std::sqrt(2.04e6 * p) / m;
                       }});
  }
  {
    // Cyanide (thermo/data/cyanide.yaml): pKa of HCN at 20 and 30 °C as measured, and Henry's law for
    // HCN at 25 and 35 °C from the published temperature function ln KH = 8205.7/T − 25.323 (M/atm).
    const std::string cyanide = "cyanide";
    const std::string izatt = "Izatt et al. 1962, Inorg. Chem. 1, 828 (read in a summary)";
    const std::string ma = "Ma et al. 2010, Environ. Sci. Technol. 44, 3028 (read)";
    cases.push_back({cyanide, "pKa of HCN, 20 °C", izatt, 9.36, 0.03, [] { return formation_log_k("HCN(aq)", celsius + 20); }});
    cases.push_back({cyanide, "pKa of HCN, 30 °C", izatt, 9.11, 0.03, [] { return formation_log_k("HCN(aq)", celsius + 30); }});
    cases.push_back({cyanide, "pKa of HCN, 25 °C", "Izatt et al. 1962 (from memory)", 9.21, 0.01,
                     [] { return formation_log_k("HCN(aq)"); }});
    cases.push_back({cyanide, "HCN at 1e-6 atm over water, 25 °C: m(HCN(aq)) / p, mol kg⁻¹ atm⁻¹", ma, 9.02, 0.02 * 9.02, [] {
                       const ProbeResult r = solve_open_to({}, "HCN(g)", 1e-6 * 101325.0, ActivityModelKind::ideal);
                       return r.molality("HCN(aq)") / 1e-6;
                     }});
    for (const double t : {25.0, 35.0}) {
      const double published = std::exp(8205.7 / (celsius + t) - 25.323);
      cases.push_back({cyanide, fmt::format("HCN Henry's law constant at {:g} °C, mol kg⁻¹ atm⁻¹", t), ma, published,
                       0.02 * published, [t] {
                         return std::pow(10.0, formation_log_k("HCN(aq)", celsius + t) - formation_log_k("HCN(g)", celsius + t));
                       }});
    }
  }
  {
    // Salts across temperature with the Pitzer model: Møller's (1988) temperature functions of Na2SO4 with
    // the sodium sulfates' solubility products, whose ΔrH° and ΔrCp° are NBS 1982's (thermo/data/salts.yaml)
    // and whose 25 °C values the Pitzer file fits to one solubility each (mirabilite at 25 °C, thenardite
    // at 90 °C): every other point tests how the activity model and the solids carry temperature.
    const std::string salts_t = "Salts across temperature with the Pitzer model";
    const std::string crc_solubility =
        "CRC Handbook, aqueous solubility of inorganic compounds at various temperatures (from memory)";
    const auto molality_of_mass_percent = [](double percent) {
      return percent / (100.0 - percent) * 1e3 / grams_per_mole("Na2SO4");
    };
    constexpr double sulfate_feed = 4.5;  // mol per kg of water, more than dissolves from 0 to 100 °C
    for (const auto& [t, percent, solid] :
         {std::tuple{0.0, 4.5, "mirabilite"}, std::tuple{10.0, 8.3, "mirabilite"}, std::tuple{20.0, 16.1, "mirabilite"},
          std::tuple{25.0, 21.9, "mirabilite"}, std::tuple{30.0, 29.0, "mirabilite"}, std::tuple{40.0, 32.5, "thenardite"},
          std::tuple{60.0, 31.2, "thenardite"}, std::tuple{80.0, 30.1, "thenardite"}, std::tuple{100.0, 29.7, "thenardite"}}) {
      const double published = molality_of_mass_percent(percent);
      const bool hydrate = std::string(solid) == "mirabilite";
      cases.push_back({salts_t, fmt::format("Na2SO4 solubility at {:g} °C ({}), mol/kg", t, solid), crc_solubility, published,
                       (hydrate ? 0.05 : 0.12) * published,
                       [t = t, solid = std::string(solid)] { return salt_solubility("Na2SO4", solid, sulfate_feed, celsius + t); },
                       t == 25.0 ? "the point the Pitzer file's mirabilite constant is fitted to: a calibration, not a check"
                       : hydrate ? ""
                                 : "thenardite saturates at I = 9–10 mol/kg, beyond the 6 mol/kg of the 25 °C parameters: "
                                   "the model is 5–11 % high at 40–80 °C and 5 % low at 100 °C (12 % held)"});
    }
    cases.push_back({salts_t, "Na2SO4 solubility at 90 °C (thenardite), mol/kg",
                     "ACS Omega 5, 4875 (2020), NaOH–Na2SO4–H2O at 363.15 K, Table 5 (read)", molality_of_mass_percent(29.91),
                     0.01 * molality_of_mass_percent(29.91),
                     [] { return salt_solubility("Na2SO4", "thenardite", sulfate_feed, celsius + 90.0); },
                     "the point the Pitzer file's thenardite constant is fitted to: a calibration, not a check"});
    // Mirabilite turns to thenardite where the two solubilities meet: bisection on their difference.
    cases.push_back({salts_t, "mirabilite–thenardite transition in water, °C", crc_solubility, 32.38, 0.5, [] {
                       double low = 30.0, high = 33.0;
                       for (int i = 0; i < 30; ++i) {
                         const double mid = 0.5 * (low + high);
                         const bool hydrate_less_soluble = salt_solubility("Na2SO4", "mirabilite", sulfate_feed, celsius + mid) <
                                                           salt_solubility("Na2SO4", "thenardite", sulfate_feed, celsius + mid);
                         (hydrate_less_soluble ? low : high) = mid;
                       }
                       return 0.5 * (low + high);
                     }});
    // Gypsum: retrograde above a maximum near 40 °C (Nordstrom et al.'s log K(T) with the HMW84 Ca–SO4 terms
    // held at 25 °C and A_φ(T)), by Brent's minimisation of minus the solubility.
    cases.push_back({salts_t, "gypsum in water: temperature of greatest solubility, °C",
                     "common handbook value, about 40 °C (from memory)", 40.0, 7.0, [] {
                       const auto r = boost::math::tools::brent_find_minima(
                           [](double t) { return -gypsum_solubility(0.0, ActivityModelKind::pitzer, celsius + t); }, 10.0, 70.0, 20);
                       return r.first;
                     }});
    // CaCl2 below 25 °C: φ at the freezing point from the CRC depressions (read in the transcription named
    // above) and python3-iapws, ν = 3 (`tests/reference/freezing_point_test.cpp` recomputes them). The
    // Greenberg & Møller functions stop at 0 °C (their poles lie at −10 °C): colder, they are held there.
    for (const auto& [molality, depression, phi] :
         {std::tuple{0.375, 1.82, 0.87146}, std::tuple{0.575, 2.93, 0.91494}, std::tuple{1.001, 5.86, 1.05192},
          std::tuple{1.467, 9.83, 1.20547}, std::tuple{1.716, 12.28, 1.28821}, std::tuple{2.253, 18.3, 1.46356}})
      cases.push_back({salts_t, fmt::format("φ CaCl2 {:g} mol/kg at its freezing point, −{:g} °C", molality, depression),
                       crc_freezing, phi, 0.05 * phi,
                       [molality = molality, depression = depression] {
                         thermo::SoluteProperties p;
                         p.charge = {2, -1};
                         p.ion_size_angstrom = {6, 3};
                         p.name = {"Ca^2+", "Cl^-"};
                         const thermo::PitzerModel model(p, thermo::bundled_pitzer_parameters());
                         const std::vector<double> m{molality, 2.0 * molality};
                         thermo::ActivityEvaluation e(2);
                         model.evaluate(celsius - depression, thermo::constants::standard_atmosphere, m, e);
                         return -e.ln_water_activity / (3.0 * thermo::constants::water_molar_mass * molality);
                       },
                       "CaCl2 at its freezing point: HMW84's 25 °C values carried down by the Møller (1988) and Greenberg "
                       "& Møller (1989) functions, held at 0 °C below it; φ is −3.5 to +0.9 % off (with the 25 °C values "
                       "alone +1.3 to +3.8 %, with Pitzer 1991 Table 13's first derivatives +4 to +10 %). The 25 °C aim of "
                       "1 % is held here at 5 %"});
    // MgCl2 (de Lima & Pitzer's quadratics, fitted from 25 °C and extrapolated below) and MgSO4 (no
    // temperature dependence in the file) at their freezing points, the same way; the CRC table stops at
    // 3 K for MgCl2 and 3.7 K for MgSO4.
    struct Frozen {
      const char* salt;
      const char* cation;
      const char* anion;
      int z_cation, z_anion, cations, anions;
      double molality, depression, phi;
    };
    for (const Frozen& f : {Frozen{"MgCl2", "Mg^2+", "Cl^-", 2, -1, 1, 2, 0.325, 1.65, 0.91167},
                            Frozen{"MgCl2", "Mg^2+", "Cl^-", 2, -1, 1, 2, 0.438, 2.3, 0.94282},
                            Frozen{"MgCl2", "Mg^2+", "Cl^-", 2, -1, 1, 2, 0.553, 3.01, 0.97732},
                            Frozen{"MgSO4", "Mg^2+", "SO4^2-", 2, -2, 1, 1, 0.437, 0.87, 0.53679},
                            Frozen{"MgSO4", "Mg^2+", "SO4^2-", 2, -2, 1, 1, 0.923, 1.85, 0.53984},
                            Frozen{"MgSO4", "Mg^2+", "SO4^2-", 2, -2, 1, 1, 1.352, 2.86, 0.56973},
                            Frozen{"MgSO4", "Mg^2+", "SO4^2-", 2, -2, 1, 1, 1.582, 3.67, 0.62489}}) {
      const bool sulfate = std::string(f.salt) == "MgSO4";
      cases.push_back({salts_t, fmt::format("φ {} {:g} mol/kg at its freezing point, −{:g} °C", f.salt, f.molality, f.depression),
                       crc_freezing, f.phi, (sulfate ? 0.06 : 0.05) * f.phi,
                       [f] {
                         thermo::SoluteProperties p;
                         p.charge = {f.z_cation, f.z_anion};
                         p.ion_size_angstrom = {8, 4};
                         p.name = {f.cation, f.anion};
                         const thermo::PitzerModel model(p, thermo::bundled_pitzer_parameters());
                         const std::vector<double> m{f.cations * f.molality, f.anions * f.molality};
                         thermo::ActivityEvaluation e(2);
                         model.evaluate(celsius - f.depression, thermo::constants::standard_atmosphere, m, e);
                         return -e.ln_water_activity / ((f.cations + f.anions) * thermo::constants::water_molar_mass * f.molality);
                       },
                       sulfate ? "MgSO4 at its freezing point with no temperature dependence in the file (HMW84's 25 °C values "
                                 "and A_φ(T)): φ is 1–5 % high; Phutela & Pitzer's (1986) functions, as their first three "
                                 "derivatives at 25 °C, would make it 2–5 % low, so neither is taken up. 6 % is held"
                               : ""});
    }
    // The functions' first derivatives at 25 °C against Silvester & Pitzer's, as Pitzer 1991 tabulates them:
    // Na2SO4 agrees; CaCl2, MgCl2 and K2SO4 do not (docs/activity.md).
    const std::string table_13 = "Pitzer 1991, ch. 3, Table 13 (read in a transcription)";
    const auto derivative = [](const char* anion, const char* cation, int which) {
      for (const thermo::PitzerBinary& b : thermo::bundled_pitzer_parameters().binary)
        if (b.cation == cation && b.anion == anion) {
          const thermo::PitzerCoefficient& c = which == 0 ? b.beta0 : b.beta1;
          return (c.at(298.16) - c.at(298.14)) / 0.02 * 1e3;
        }
      return 0.0;
    };
    cases.push_back({salts_t, "∂β⁰/∂T of Na2SO4 at 25 °C (Møller 1988), 1e-3 K⁻¹", table_13, 2.367, 0.1 * 2.367,
                     [derivative] { return derivative("SO4^2-", "Na^+", 0); }});
    cases.push_back({salts_t, "∂β¹/∂T of Na2SO4 at 25 °C (Møller 1988), 1e-3 K⁻¹", table_13, 5.63, 0.1 * 5.63,
                     [derivative] { return derivative("SO4^2-", "Na^+", 1); }});
  }
  {
    // NaCl's heats across temperature: L_φ and J_φ = ∂L_φ/∂T from Møller's (1988) functions and A_H of the
    // engine's water, against the evaluation of Pitzer, Peiper & Busey (1984), whose tables give L_φ/(RT) and
    // J_φ/R at 0.1 MPa (read in a public transcription of the tables, IDAES's test data).
    const std::string nacl_heats = "Heats of NaCl with the Pitzer model, 25–100 °C";
    const std::string ppb = "Pitzer, Peiper & Busey 1984, J. Phys. Chem. Ref. Data 13, 1, tables (read in a transcription)";
    const auto nacl_relative_enthalpy = [](double temperature, double molality, bool heat_capacity) {
      thermo::SoluteProperties p;
      p.charge = {1, -1};
      p.ion_size_angstrom = {4, 3};
      p.name = {"Na^+", "Cl^-"};
      const thermo::PitzerModel model(p, thermo::bundled_pitzer_parameters());
      const std::vector<double> m{molality, molality};
      const auto l = [&](double t) { return model.relative_enthalpy(t, thermo::constants::standard_atmosphere, m) / molality; };
      return heat_capacity ? (l(temperature + 0.5) - l(temperature - 0.5)) : l(temperature) / 1e3;
    };
    struct Tabulated {
      double celsius_, molality, l_over_rt, j_over_r;
    };
    for (const Tabulated& r : {Tabulated{25, 0.1, 0.135, 1.39}, Tabulated{25, 1.0, -0.041, 5.28}, Tabulated{25, 3.0, -0.505, 10.29},
                               Tabulated{25, 6.0, -0.8, 14.76}, Tabulated{50, 0.1, 0.233, 1.45}, Tabulated{50, 1.0, 0.335, 4.59},
                               Tabulated{50, 3.0, 0.24, 8.44}, Tabulated{50, 6.0, 0.282, 12.17}, Tabulated{100, 0.1, 0.43, 2.05},
                               Tabulated{100, 1.0, 0.946, 5.55}, Tabulated{100, 3.0, 1.347, 9.21}, Tabulated{100, 6.0, 1.845, 12.66}}) {
      const double t = celsius + r.celsius_;
      const double l_published = r.l_over_rt * thermo::constants::gas_constant * t / 1e3;
      cases.push_back({nacl_heats, fmt::format("L_φ NaCl {:g} mol/kg at {:g} °C, kJ/mol", r.molality, r.celsius_), ppb, l_published,
                       std::max(0.05 * std::abs(l_published), 0.06),
                       [t, r, nacl_relative_enthalpy] { return nacl_relative_enthalpy(t, r.molality, false); },
                       "NaCl's L_φ crosses zero near 1 mol/kg at 25 °C and stays within ±2 kJ/mol to 100 °C: the tolerance "
                       "is 5 % or 0.06 kJ/mol, whichever is larger (at 50 °C, 3–6 mol/kg the model is 0.04–0.06 kJ/mol low)"});
      const double j_published = r.j_over_r * thermo::constants::gas_constant;
      cases.push_back({nacl_heats, fmt::format("J_φ = ∂L_φ/∂T of NaCl {:g} mol/kg at {:g} °C, J/(K mol)", r.molality, r.celsius_),
                       ppb, j_published, 0.05 * j_published,
                       [t, r, nacl_relative_enthalpy] { return nacl_relative_enthalpy(t, r.molality, true); }});
    }
  }
  return cases;
}

}  // namespace

const std::vector<ReferenceCase>& reference_cases() {
  static const std::vector<ReferenceCase> cases = build_cases();
  return cases;
}

std::string render_validation_table() {
  std::string text =
      "# Validation table\n\n"
      "What the engine computes today against published values. Generated by `validation_table` "
      "(tests/reference); the test `reference: validation table is current` fails when this file is stale. "
      "Regenerate with:\n\n"
      "    build/tests/reference/validation_table > docs/validation.md\n\n"
      "Sources are named as in the project's reference-value list; \"from memory\" means the published value was "
      "recalled, not read, when the list was written. Deviation is model − published.\n";
  std::string group;
  std::vector<std::string> notes;
  for (const ReferenceCase& c : reference_cases()) {
    if (c.group != group) {
      group = c.group;
      text += fmt::format("\n## {}\n\n| case | source | published | model | deviation | tolerance | within |\n"
                          "| --- | --- | --- | --- | --- | --- | --- |\n",
                          group);
    }
    const double model = c.model();
    const double deviation = model - c.published;
    // a note shared by several rows is listed once
    const auto seen = std::find(notes.begin(), notes.end(), c.note);
    const std::size_t note_number = static_cast<std::size_t>(seen - notes.begin()) + 1;
    text += fmt::format("| {} | {} | {:.4f} | {:.4f} | {:+.4f} | ±{:.4f}{} | {} |\n", c.quantity, c.source, c.published,
                        model, deviation, c.tolerance, c.note.empty() ? "" : fmt::format(" [{}]", note_number),
                        std::abs(deviation) <= c.tolerance ? "yes" : "**no**");
    if (!c.note.empty() && seen == notes.end()) notes.push_back(c.note);
  }
  if (!notes.empty()) text += "\n## Notes on tolerances wider than the published ones\n\n";
  for (std::size_t i = 0; i < notes.size(); ++i) text += fmt::format("{}. {}\n", i + 1, notes[i]);
  return text;
}

}  // namespace protonflow::reference
