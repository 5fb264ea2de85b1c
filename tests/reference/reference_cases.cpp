#include "reference_cases.hpp"

#include <cmath>
#include <functional>
#include <tuple>
#include <fmt/format.h>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/formula.hpp"
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
       }) {
    cases.push_back({metals, quantity, source, published, 0.005, model});
  }
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
    text += fmt::format("| {} | {} | {:.4f} | {:.4f} | {:+.4f} | ±{:.4f}{} | {} |\n", c.quantity, c.source, c.published,
                        model, deviation, c.tolerance, c.note.empty() ? "" : fmt::format(" [{}]", notes.size() + 1),
                        std::abs(deviation) <= c.tolerance ? "yes" : "**no**");
    if (!c.note.empty()) notes.push_back(c.note);
  }
  if (!notes.empty()) text += "\n## Notes on tolerances wider than the published ones\n\n";
  for (std::size_t i = 0; i < notes.size(); ++i) text += fmt::format("{}. {}\n", i + 1, notes[i]);
  return text;
}

}  // namespace protonflow::reference
