// The neutraliser, loaded as a host loads it: the dose to pH 7 of a strong acid, Henderson–
// Hasselbalch at half-neutralisation, the phosphate standard buffer, gypsum from lime on sulfuric
// acid, the heat of neutralisation, mass, element, charge and energy balances (recomputed through
// protonflow_thermo), the buffer capacity against a numerical titration, unreachable targets, the
// safety and staging warnings, and a property test over random feeds and reagents.
#include <catch2/catch.hpp>
#include <rapidcheck/catch.h>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/database.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>
#include <protonflow/thermo/formula.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>
#include <protonflow/thermo/water_properties.hpp>

#include <array>
#include <cmath>
#include <map>
#include <string>
#include <utility>
#include <vector>

#include "units_test_support.hpp"

using namespace units_test;
using host::ParameterValue;
namespace thermo = protonflow::thermo;

namespace {

const host::Module& neutraliser_module() {
  static const host::Module module(UNITS_NEUTRALISER_MODULE);
  return module;
}

// Result indices, in the declared order.
enum Result {
  outlet_ph = 0, feed_ph, outlet_temperature, duty, reagent_flow, reagent_ratio, dose_solves, process_gain,
  buffer_capacity, off_gas_flow, dry_solids_flow, sludge_flow, dissolved_fe, dissolved_al, dissolved_zn, dissolved_cu,
  dissolved_ni, dissolved_ca, dissolved_mg, dissolved_f, fe2_oxidised, o2_demand, o2_demand_mass, air_demand,
  air_demand_volume, dissolved_cr
};

constexpr double t25 = 298.15;  // K

// kg of water with the given solutes (mol each), per second, aqueous, at T and 1 atm.
host::StreamState solution(const host::Slate& slate, double water_kg, const std::vector<std::pair<std::string, double>>& solutes,
                           double temperature = t25) {
  host::StreamState s = stream(slate, temperature, atmosphere);
  flow(s, slate, PFU_AQUEOUS_ROW, "H2O") = water_kg * mol_per_kg_water;
  for (const auto& [name, amount] : solutes) flow(s, slate, PFU_AQUEOUS_ROW, name) += amount;
  return s;
}

struct Dose {
  host::StreamState feed, reagent, product, off_gas;
  host::Solution solution;
  double scale() const { return solution.results[reagent_ratio] * mass(feed) / mass(reagent); }
  // kg/s of a stream, from the component molar masses (python3-periodictable agrees, reference tests).
  double mass(const host::StreamState& s) const;
  const host::Slate* slate;
};

double component_molar_mass(const std::string& formula) { return thermo::molar_mass(thermo::parse_formula(formula)); }

double Dose::mass(const host::StreamState& s) const {
  double m = 0.0;
  for (std::size_t c = 0; c < slate->components.size(); ++c) m += column_total(s, *slate, c) * component_molar_mass(slate->components[c]);
  return m;
}

Dose run(const std::vector<ParameterValue>& parameters, const host::Slate& slate, const host::StreamState& feed,
         const host::StreamState& reagent) {
  host::Instance unit = neutraliser_module().create("neutraliser", parameters, slate);
  Dose d{feed, reagent, {}, {}, {}, &slate};
  std::vector<host::StreamState> outlets(2);
  d.solution = unit.solve(std::vector<host::StreamState>{feed, reagent}, outlets);
  d.product = outlets[0];
  d.off_gas = outlets[1];
  return d;
}

std::string failure(const std::vector<ParameterValue>& parameters, const host::Slate& slate, const host::StreamState& feed,
                    const host::StreamState& reagent) {
  try {
    run(parameters, slate, feed, reagent);
  } catch (const host::SolveError& error) {
    return error.what();
  }
  return "solved";
}

// Mass balance per component: product and off-gas hold the feed and the dosed reagent, to round-off.
void check_mass_balance(const Dose& d) {
  const host::Slate& slate = *d.slate;
  const double s = d.scale();
  for (std::size_t c = 0; c < slate.components.size(); ++c) {
    INFO("component " << slate.components[c]);
    const double in = column_total(d.feed, slate, c) + s * column_total(d.reagent, slate, c);
    const double out = column_total(d.product, slate, c) + column_total(d.off_gas, slate, c);
    CHECK(out == Approx(in).epsilon(1e-12).margin(1e-300));
  }
  for (const double f : d.product.flows) CHECK(f >= 0.0);
  for (const double f : d.off_gas.flows) CHECK(f >= 0.0);
}

// Element balance: every element of the components' formulas, in and out, to round-off.
void check_element_balance(const Dose& d) {
  const host::Slate& slate = *d.slate;
  std::map<std::string, double> in, out;
  const double s = d.scale();
  for (std::size_t c = 0; c < slate.components.size(); ++c) {
    const thermo::Formula formula = thermo::parse_formula(slate.components[c]);
    const double n_in = column_total(d.feed, slate, c) + s * column_total(d.reagent, slate, c);
    const double n_out = column_total(d.product, slate, c) + column_total(d.off_gas, slate, c);
    for (const auto& [element, count] : formula.elements) {
      in[element] += count * n_in;
      out[element] += count * n_out;
    }
  }
  for (const auto& [element, amount] : in) {
    INFO("element " << element);
    CHECK(out[element] == Approx(amount).epsilon(1e-12).margin(1e-300));
  }
}

const thermo::Database& database() {
  static const thermo::Database loaded = thermo::load_database(thermo::default_data_directory());
  return loaded;
}

// The system docs/units.md gives the neutraliser: every reachable solid allowed, a closed gas phase.
thermo::ChemicalSystem unit_system(const host::Slate& slate, thermo::ActivityModelKind activity = thermo::ActivityModelKind::davies) {
  thermo::SystemOptions options;
  options.gas_phase = true;
  options.activity = activity;
  const thermo::ChemicalSystem reach(database(), slate.components, options);
  for (const thermo::PhaseSpecies& solid : reach.solids()) options.allowed_solids.push_back(solid.name);
  return thermo::ChemicalSystem(database(), slate.components, options);
}

std::vector<double> totals(const host::Slate& slate, const host::StreamState& s, double scale = 1.0) {
  std::vector<double> n(slate.components.size());
  for (std::size_t c = 0; c < n.size(); ++c) n[c] = scale * column_total(s, slate, c);
  return n;
}

// Energy balance recomputed through protonflow_thermo: H(product) − H(feed) − s H(reagent) = duty,
// each at its own temperature; and the charge balance of the product's speciation.
void check_energy_and_charge(const Dose& d) {
  const host::Slate& slate = *d.slate;
  const thermo::ChemicalSystem system = unit_system(slate);
  thermo::EquilibriumSolver solver(system);
  const double h_feed = thermo::state_enthalpy(system, solver.solve(d.feed.temperature, d.feed.pressure, totals(slate, d.feed)));
  const double h_reagent =
      thermo::state_enthalpy(system, solver.solve(d.reagent.temperature, d.reagent.pressure, totals(slate, d.reagent)));
  std::vector<double> out = totals(slate, d.product);
  const std::vector<double> gas = totals(slate, d.off_gas);
  for (std::size_t c = 0; c < out.size(); ++c) out[c] += gas[c];
  const thermo::Speciation product = solver.solve(d.product.temperature, d.product.pressure, out);
  const double h_product = thermo::state_enthalpy(system, product);
  const double imbalance = h_product - h_feed - d.scale() * h_reagent - d.solution.results[duty];
  CHECK(std::abs(imbalance) <= 1e-9 * std::abs(h_product));
  CHECK(product.ph == Approx(d.solution.results[outlet_ph]).margin(1e-7));
  double charge = 0.0, scale = 0.0;
  for (std::size_t i = 0; i < system.solutes().size(); ++i) {
    charge += system.solutes()[i].charge * product.molality[i];
    scale += std::abs(system.solutes()[i].charge) * product.molality[i];
  }
  CHECK(std::abs(charge) <= 1e-12 * scale);
}

std::vector<ParameterValue> at_25c(std::vector<ParameterValue> parameters) {
  parameters.push_back({"energy", std::string("at_temperature")});
  parameters.push_back({"outlet_temperature", t25});
  return parameters;
}

const host::Slate hcl_naoh{{"H2O", "HCl", "NaOH"}, {}};

}  // namespace

TEST_CASE("neutraliser: NaOH dosed to pH 7 on HCl equals the acid to 0.1 %", "[neutraliser]") {
  const host::StreamState feed = solution(hcl_naoh, 1.0, {{"HCl", 0.01}});
  const host::StreamState reagent = solution(hcl_naoh, 1.0, {{"NaOH", 0.1}});
  const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 7.0}}), hcl_naoh, feed, reagent);
  const double naoh = d.scale() * 0.1;
  // Stoichiometry (worked example, derived from the ion product, bandura-lvov-2006: at equivalence pH = pKw/2 = 6.997):
  // at pH 7.000 the excess base is below 1e-6 of the acid.
  CHECK(naoh == Approx(0.01).epsilon(1e-3));
  CHECK(d.solution.results[outlet_ph] == Approx(7.0).margin(1e-8));
  CHECK(d.solution.results[dose_solves] > 2);
  CHECK(d.solution.results[reagent_flow] == Approx(d.mass(reagent) * d.scale()).epsilon(1e-12));
  // Steep at neutrality: one step of the valve swings the pH far beyond 0.5, and staging is named.
  CHECK(d.solution.results[process_gain] > 0.0);
  CHECK(warned(d.solution, "stages in series would serve"));
  check_mass_balance(d);
  check_element_balance(d);
  check_energy_and_charge(d);
}

TEST_CASE("neutraliser: heat of neutralisation of HCl by NaOH is -55.84 kJ/mol", "[neutraliser]") {
  // 0.01 mol/s each, dilute: the duty to hold 25 °C is the heat of H+ + OH- -> H2O(l), NBS 1982
  // (nbs-1982, from memory; derived, −285.830 + 229.994, ±0.3 kJ/mol), plus dilution heats far below it.
  const host::StreamState feed = solution(hcl_naoh, 1.0, {{"HCl", 0.01}});
  const host::StreamState reagent = solution(hcl_naoh, 1.0, {{"NaOH", 0.01}});
  const Dose d = run(at_25c({}), hcl_naoh, feed, reagent);
  CHECK(d.solution.results[duty] / 0.01 == Approx(-55.84e3).margin(0.3e3));
  CHECK(d.solution.results[reagent_ratio] == Approx(d.mass(reagent) / d.mass(feed)).epsilon(1e-12));
  check_mass_balance(d);
  check_energy_and_charge(d);

  // Adiabatic: the same heat warms the 2 kg/s by about 55.84 * 0.01 / (2 * 4.18) = 0.067 K.
  const Dose hot = run({}, hcl_naoh, feed, reagent);
  CHECK(hot.solution.results[duty] == 0.0);
  CHECK(hot.solution.results[outlet_temperature] - t25 == Approx(0.0668).margin(0.002));
  check_energy_and_charge(hot);
}

TEST_CASE("neutraliser: acetic acid half-neutralised gives pKa plus the Davies shift", "[neutraliser]") {
  const host::Slate slate{{"H2O", "CH3COOH", "NaOH"}, {}};
  // 0.1 mol acetic acid in 0.9 kg water, 0.05 mol NaOH in 0.1 kg: 1 kg water in the product.
  const host::StreamState feed = solution(slate, 0.9, {{"CH3COOH", 0.1}});
  const host::StreamState reagent = solution(slate, 0.1, {{"NaOH", 0.05}});
  const Dose d = run(at_25c({}), slate, feed, reagent);
  // Henderson–Hasselbalch (derived from the acid's mass-action law): pH = pKa + log10(γ(A-)/γ(HA)); γ(HA) = 1 in
  // Davies, log10 γ(A-) = -A (√I/(1+√I) - 0.3 I) at I ≈ 0.05 mol/kg (Na+ and acetate), A from
  // water's density and permittivity (Robinson & Stokes 1959, through thermo). pKa 4.756, Harned &
  // Ehlers 1933 (harned-ehlers-1933), ±0.005. The buffer's own H+ shifts the ratio by 4e-4 in log.
  const double i = 0.05;
  const double a = thermo::debye_huckel_parameters(t25, atmosphere).a;
  const double shift = -a * (std::sqrt(i) / (1.0 + std::sqrt(i)) - 0.3 * i);
  CHECK(d.solution.results[outlet_ph] == Approx(4.756 + shift).margin(0.005 + 5e-4));
  check_mass_balance(d);
  check_energy_and_charge(d);

  // Van Slyke's buffer capacity against a numerical titration with NaOH, the strong base: dC_B/dpH
  // from two doses 1 % apart around the half-neutralisation. The result holds γ constant; the
  // titration also raises I by the dose, which moves log10 γ(A-) by d log10 γ/dI (Davies) per mol:
  //   d pH/dC_B = 1/β + d log10 γ(A-)/dI.
  const host::StreamState less = solution(slate, 0.1, {{"NaOH", 0.0495}});
  const host::StreamState more = solution(slate, 0.1, {{"NaOH", 0.0505}});
  const double ph_less = run(at_25c({}), slate, feed, less).solution.results[outlet_ph];
  const double ph_more = run(at_25c({}), slate, feed, more).solution.results[outlet_ph];
  const double slope = (ph_more - ph_less) / 0.001;  // pH per mol NaOH per kg water
  const double davies_slope = -a * (1.0 / (2.0 * std::sqrt(i) * (1.0 + std::sqrt(i)) * (1.0 + std::sqrt(i))) - 0.3);
  CHECK(slope == Approx(1.0 / d.solution.results[buffer_capacity] + davies_slope).epsilon(0.005));
  // Analytic at the pKa with [H+] negligible: β = ln10 C/4 = 0.0576 mol/kg (Van Slyke 1922).
  CHECK(d.solution.results[buffer_capacity] == Approx(std::log(10.0) * 0.1 / 4.0).epsilon(0.01));
}

TEST_CASE("neutraliser: the phosphate standard buffer", "[neutraliser]") {
  const host::Slate slate{{"H2O", "KH2PO4", "NaH2PO4", "NaOH"}, {}};
  // KH2PO4 0.025 + NaH2PO4 0.025 in 0.9 kg water, dosed with 0.025 mol NaOH in 0.1 kg: the product
  // is KH2PO4 0.025 + Na2HPO4 0.025 mol/kg. pH(S) 6.865 at 25 °C, IUPAC 2002 (buck-2002), ±0.03.
  const host::StreamState feed = solution(slate, 0.9, {{"KH2PO4", 0.025}, {"NaH2PO4", 0.025}});
  const host::StreamState reagent = solution(slate, 0.1, {{"NaOH", 0.025}});
  const Dose d = run(at_25c({{"activity_model", std::string("b-dot")}}), slate, feed, reagent);
  CHECK(d.solution.results[outlet_ph] == Approx(6.865).margin(0.03));
  check_mass_balance(d);
}

TEST_CASE("neutraliser: lime on 2 % sulfuric acid precipitates gypsum to its solubility", "[neutraliser]") {
  const host::Slate slate{{"H2O", "H2SO4", "Ca(OH)2"}, {"gypsum", "portlandite"}};
  // 1 kg/s of 2 wt % H2SO4; lime slurry of 10 wt % Ca(OH)2, dosed to pH 7 at 25 °C.
  const double h2so4 = 0.02 / component_molar_mass("H2SO4");
  host::StreamState feed = solution(slate, 0.98, {{"H2SO4", h2so4}});
  const host::StreamState reagent = solution(slate, 0.9, {{"Ca(OH)2", 0.1 / component_molar_mass("Ca(OH)2")}});
  const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 7.0}}), slate, feed, reagent);
  const double gypsum = flow(d.product, slate, PFU_FIRST_SOLID_ROW, "H2SO4");
  REQUIRE(gypsum > 0.0);
  const double calcium = d.scale() * flow(reagent, slate, PFU_AQUEOUS_ROW, "Ca(OH)2");
  // Equivalence: lime equals the acid (pH 7 lies in the steep part; 0.1 % is far within it).
  CHECK(calcium == Approx(h2so4).epsilon(1e-3));
  // What stays dissolved is gypsum's solubility in water: 15.3 mmol/kg at 25 °C (Marshall &
  // Slusher 1966, marshall-slusher-1966, from memory, ±5 %); the Davies model with the CaSO4(aq)
  // pair is held to ±8 %.
  const double water = flow(d.product, slate, PFU_AQUEOUS_ROW, "H2O") * 0.018015268;
  const double dissolved = (calcium - gypsum) / water;
  CHECK(dissolved == Approx(15.3e-3).epsilon(0.08));
  CHECK(d.solution.results[dissolved_ca] == Approx(dissolved * 40.078 * 1e3 * thermo::water_density(t25) / 1e3).epsilon(0.01));
  // Dry solids are the gypsum (172.17 g/mol, python3-periodictable, iupac-atomic-weights).
  CHECK(d.solution.results[dry_solids_flow] == Approx(gypsum * 0.1721712).epsilon(1e-6));
  CHECK(d.solution.results[sludge_flow] == Approx(d.solution.results[dry_solids_flow] / 0.02).epsilon(1e-12));
  CHECK(warned(d.solution, "solids precipitate"));
  check_mass_balance(d);
  check_element_balance(d);
  check_energy_and_charge(d);
}

TEST_CASE("neutraliser: an unreachable target names the highest pH the reagent can give", "[neutraliser]") {
  SECTION("lime cannot pass about pH 12.4") {
    const host::Slate slate{{"H2O", "HCl", "Ca(OH)2"}, {"portlandite"}};
    const host::StreamState feed = solution(slate, 1.0, {{"HCl", 0.01}});
    const host::StreamState reagent = solution(slate, 0.9, {{"Ca(OH)2", 0.1 / component_molar_mass("Ca(OH)2")}});
    const std::string message =
        failure(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 13.0}, {"max_reagent_ratio", 10.0}}), slate, feed, reagent);
    INFO(message);
    CHECK(message.find("unreachable: the highest pH this reagent can give is 12.") != std::string::npos);
  }
  SECTION("ammonia, a weak base, cannot reach pH 12") {
    const host::Slate slate{{"H2O", "HCl", "NH3"}, {}};
    const host::StreamState feed = solution(slate, 1.0, {{"HCl", 0.01}});
    const host::StreamState reagent = solution(slate, 1.0, {{"NH3", 1.0}});
    const std::string message =
        failure(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 12.0}}), slate, feed, reagent);
    INFO(message);
    CHECK(message.find("unreachable: the highest pH this reagent can give is 11.") != std::string::npos);
  }
  SECTION("Mg(OH)2 slurry stops near pH 10 (brucite's saturation)") {
    const host::Slate slate{{"H2O", "HCl", "Mg(OH)2"}, {"brucite"}};
    const host::StreamState feed = solution(slate, 1.0, {{"HCl", 0.01}});
    const host::StreamState reagent = solution(slate, 0.9, {{"Mg(OH)2", 0.1 / component_molar_mass("Mg(OH)2")}});
    const std::string message =
        failure(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 11.0}, {"max_reagent_ratio", 10.0}}), slate, feed, reagent);
    INFO(message);
    // A saturated brucite solution is near pH 10.4 (Ksp about 10^-11.2, CRC Handbook, from memory).
    CHECK(message.find("unreachable: the highest pH this reagent can give is 10.") != std::string::npos);
  }
  SECTION("a base cannot lower the pH") {
    const host::StreamState feed = solution(hcl_naoh, 1.0, {{"HCl", 0.01}});
    const host::StreamState reagent = solution(hcl_naoh, 1.0, {{"NaOH", 0.1}});
    const std::string message = failure(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 1.0}}), hcl_naoh, feed, reagent);
    CHECK(message.find("the target needs an acid") != std::string::npos);
  }
}

TEST_CASE("neutraliser: an alkaline waste dosed with sulfuric acid", "[neutraliser]") {
  const host::Slate slate{{"H2O", "NaOH", "H2SO4"}, {}};
  const host::StreamState feed = solution(slate, 1.0, {{"NaOH", 0.02}});
  const host::StreamState reagent = solution(slate, 0.9, {{"H2SO4", 1.0}});
  const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 8.5}}), slate, feed, reagent);
  CHECK(d.solution.results[outlet_ph] == Approx(8.5).margin(1e-8));
  CHECK(d.solution.results[process_gain] < 0.0);  // acid lowers the pH
  // Stoichiometry: half a mole of H2SO4 per mole of NaOH, to 0.1 % (HSO4- is negligible at pH 8.5).
  CHECK(d.scale() * 1.0 == Approx(0.01).epsilon(1e-3));
  check_mass_balance(d);
  check_energy_and_charge(d);
}

TEST_CASE("neutraliser: toxic gas and foaming are warned", "[neutraliser]") {
  SECTION("sulfide meeting acid releases H2S") {
    const host::Slate slate{{"H2O", "HCl", "NaOH", "H2S"}, {}};
    const host::StreamState feed = solution(slate, 1.0, {{"H2S", 0.01}, {"NaOH", 0.01}});  // NaHS
    const host::StreamState reagent = solution(slate, 1.0, {{"HCl", 0.1}});
    const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 5.0}}), slate, feed, reagent);
    CHECK(warned(d.solution, "toxic gas: hydrogen sulfide"));
    check_mass_balance(d);
  }
  SECTION("soda ash on acid foams with CO2") {
    const host::Slate slate{{"H2O", "HCl", "Na2CO3"}, {}};
    const host::StreamState feed = solution(slate, 1.0, {{"HCl", 0.5}});
    const host::StreamState reagent = solution(slate, 1.0, {{"Na2CO3", 1.0}});
    const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 5.0}}), slate, feed, reagent);
    CHECK(warned(d.solution, "CO2 is released"));
    CHECK(d.solution.results[off_gas_flow] > 0.0);
    CHECK(flow(d.off_gas, slate, PFU_GAS_ROW, "Na2CO3") + flow(d.off_gas, slate, PFU_GAS_ROW, "HCl") >= 0.0);
    check_mass_balance(d);
    check_element_balance(d);
    check_energy_and_charge(d);
  }
  SECTION("ammonium meeting caustic releases NH3; the liquor is corrosive") {
    const host::Slate slate{{"H2O", "NH4Cl", "NaOH"}, {}};
    const host::StreamState feed = solution(slate, 1.0, {{"NH4Cl", 0.5}});
    const host::StreamState reagent = solution(slate, 1.0, {{"NaOH", 5.0}});
    const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 12.8}}), slate, feed, reagent);
    CHECK(warned(d.solution, "toxic gas: ammonia"));
    CHECK(warned(d.solution, "corrosive liquor"));
  }
}

TEST_CASE("neutraliser: parameters that do not fit the mode are refused", "[neutraliser]") {
  const auto create_error = [](const std::vector<ParameterValue>& parameters) {
    try {
      neutraliser_module().create("neutraliser", parameters, hcl_naoh);
    } catch (const host::CreateError& error) {
      return std::string(error.what());
    }
    return std::string("created");
  };
  CHECK(create_error({{"target_ph", 7.0}}).find("does not apply with mode fixed_reagent") != std::string::npos);
  CHECK(create_error({{"mode", std::string("target_ph")}}).find("needs parameter 'target_ph'") != std::string::npos);
  CHECK(create_error({{"outlet_temperature", 300.0}}).find("does not apply with energy adiabatic") != std::string::npos);
}

TEST_CASE("neutraliser property: pH rises with the dose, every target is met or refused as unreachable", "[neutraliser]") {
  const host::Slate slate{{"H2O", "HCl", "H2SO4", "CH3COOH", "NaOH", "Ca(OH)2", "Na2CO3", "NH3", "Mg(OH)2"},
                          {"gypsum", "portlandite", "brucite", "calcite"}};
  const std::vector<std::string> acids{"HCl", "H2SO4", "CH3COOH"};
  const std::vector<std::string> bases{"NaOH", "Ca(OH)2", "Na2CO3", "NH3", "Mg(OH)2"};
  rc::prop("random feeds and reagents", [&] {
    const std::string acid = *rc::gen::elementOf(acids);
    const std::string base = *rc::gen::elementOf(bases);
    const double acid_molality = std::pow(10.0, *rc::gen::inRange(-30, 0) / 10.0);   // 1e-3 .. 1 mol/kg
    const double base_molality = std::pow(10.0, *rc::gen::inRange(-20, 3) / 10.0);  // 1e-2 .. 2 mol/kg
    const double target = *rc::gen::inRange(30, 130) / 10.0;                           // pH 3 .. 12.9
    RC_TAG(acid, base);
    const host::StreamState feed = solution(slate, 1.0, {{acid, acid_molality}});
    const host::StreamState reagent = solution(slate, 1.0, {{base, base_molality}});
    host::Instance fixed = neutraliser_module().create("neutraliser", at_25c({}), slate);
    double previous = -1.0;
    for (const double share : {0.25, 0.5, 1.0, 2.0}) {
      host::StreamState dosed = reagent;
      for (double& f : dosed.flows) f *= share;
      std::vector<host::StreamState> outlets(2);
      const host::Solution s = fixed.solve(std::vector<host::StreamState>{feed, dosed}, outlets);
      RC_ASSERT(s.results[outlet_ph] >= previous - 1e-9);
      previous = s.results[outlet_ph];
    }
    try {
      const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", target}}), slate, feed, reagent);
      RC_ASSERT(std::abs(d.solution.results[outlet_ph] - target) <= 1e-6);
      // Mass balance per component, product and off-gas against feed and dose, to round-off.
      for (std::size_t c = 0; c < slate.components.size(); ++c) {
        const double in = column_total(d.feed, slate, c) + d.scale() * column_total(d.reagent, slate, c);
        const double out = column_total(d.product, slate, c) + column_total(d.off_gas, slate, c);
        RC_ASSERT(std::abs(out - in) <= 1e-12 * in);
      }
    } catch (const host::SolveError& error) {
      const std::string message = error.what();
      RC_ASSERT(message.find("unreachable") != std::string::npos ||
                message.find("not reached within max_reagent_ratio") != std::string::npos ||
                message.find("the target needs an acid") != std::string::npos);
    }
  });
}

TEST_CASE("neutraliser: zinc and aluminium re-dissolve at high pH, fluoride precipitates as fluorite", "[neutraliser]") {
  const auto dissolved_at = [](const host::Slate& slate, const host::StreamState& feed, const host::StreamState& reagent,
                               double ph, Result element, const std::string& form = "fresh") {
    const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", ph}, {"precipitate_form", form}}), slate,
                       feed, reagent);
    check_mass_balance(d);
    return d.solution.results[element];
  };
  SECTION("zinc: least soluble near pH 9 to 10, amphoteric above (zincate)") {
    const host::Slate slate{{"H2O", "H2SO4", "ZnO", "NaOH"}, {"zincite", "Zn(OH)2(am)"}};
    const host::StreamState feed = solution(slate, 1.0, {{"H2SO4", 0.01}, {"ZnO", 0.001}});  // 65 mg/L Zn
    const host::StreamState reagent = solution(slate, 1.0, {{"NaOH", 2.0}});
    const double at_7 = dissolved_at(slate, feed, reagent, 7.0, dissolved_zn, "aged");
    const double at_95 = dissolved_at(slate, feed, reagent, 9.5, dissolved_zn, "aged");
    const double at_125 = dissolved_at(slate, feed, reagent, 12.5, dissolved_zn, "aged");
    INFO("Zn mg/L at pH 7, 9.5, 12.5: " << at_7 << ", " << at_95 << ", " << at_125);
    CHECK(at_95 < at_7);
    CHECK(at_95 < at_125);
    CHECK(at_95 < 1.0);  // common practice: hydroxide precipitation leaves well under 1 mg/L Zn near pH 9.5
    // The solubility curve of zincite from the data's constants (thermo/data/metals.yaml, powell-2013, from
    // memory): log a(Zn^2+) = 11.12 - 2 pH, log *beta_1..4 = -8.96, -17.82, -28.05, -40.41; charged species
    // divided by their Davies gammas (Davies 1962, A = 0.509) at the ionic strength of 0.01 mol/kg Na2SO4,
    // I = 0.03. 65.38 g/mol; ±5 % for the litre taken as water's and the ZnSO4(aq) pair.
    const double sqrt_i = std::sqrt(0.03);
    const auto davies_gamma = [&](int z) { return std::pow(10.0, -0.509 * z * z * (sqrt_i / (1.0 + sqrt_i) - 0.3 * 0.03)); };
    double zinc = 0.0;
    const double log_zn = 11.12 - 2.0 * 9.5;
    const std::array<double, 5> log_beta{0.0, -8.96, -17.82, -28.05, -40.41};
    const std::array<int, 5> charge{2, 1, 0, -1, -2};
    for (std::size_t n = 0; n < log_beta.size(); ++n)
      zinc += std::pow(10.0, log_zn + log_beta[n] + static_cast<double>(n) * 9.5) / davies_gamma(charge[n]);
    CHECK(at_95 == Approx(zinc * 65.38e3).epsilon(0.05));
  }
  SECTION("aluminium: fresh Al(OH)3 least soluble near pH 7, aluminate above") {
    // The fresh solid's minimum lies near pH 6.8 with Brown & Ekberg's (2016) hydrolysis constants; below
    // about pH 6.6 their Al13O4(OH)24^7+ holds the Al dissolved against Al(OH)3(am): log m(Al13) =
    // 13 x 10.8 - 100.03 - 7 pH = 40.37 - 7 pH (thermo/data/metals.yaml), so 1 mmol/kg stays in solution at pH 6.
    const host::Slate slate{{"H2O", "H2SO4", "Al(OH)3", "NaOH"}, {"gibbsite", "Al(OH)3(am)"}};
    const host::StreamState feed = solution(slate, 1.0, {{"H2SO4", 0.01}, {"Al(OH)3", 0.001}});  // 27 mg/L Al
    const host::StreamState reagent = solution(slate, 1.0, {{"NaOH", 2.0}});
    const double at_45 = dissolved_at(slate, feed, reagent, 4.5, dissolved_al);
    const double at_7 = dissolved_at(slate, feed, reagent, 7.0, dissolved_al);
    const double at_10 = dissolved_at(slate, feed, reagent, 10.0, dissolved_al);
    INFO("Al mg/L at pH 4.5, 7, 10: " << at_45 << ", " << at_7 << ", " << at_10);
    CHECK(at_7 < at_45);
    CHECK(at_7 < at_10);
  }
  SECTION("fluoride: lime leaves about fluorite's solubility") {
    const host::Slate slate{{"H2O", "HF", "Ca(OH)2"}, {"fluorite", "portlandite"}};
    const host::StreamState feed = solution(slate, 1.0, {{"HF", 0.02}});  // 380 mg/L F
    const host::StreamState reagent = solution(slate, 0.9, {{"Ca(OH)2", 0.1 / component_molar_mass("Ca(OH)2")}});
    const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 8.0}}), slate, feed, reagent);
    // Fluorite is Ca(OH)2 + 2 HF - 2 H2O, no non-negative combination of the slate's components, so
    // the shared phase bookkeeping carries it in the aqueous row and says so; the equilibrium has it.
    CHECK(warned(d.solution, "solids precipitate in the product: fluorite"));
    CHECK(warned(d.solution, "fluorite is no non-negative combination"));
    // Nearly all the fluoride as CaF2, 78.07 g/mol (python3-periodictable gives 78.075).
    CHECK(d.solution.results[dry_solids_flow] == Approx(0.01 * 0.078075).epsilon(0.02));
    // Fluorite's solubility in water, 16 mg/L CaF2 = 7.8 mg/L F (CRC Handbook, crc-handbook, from
    // memory, 0.0016 g/100 mL near 20 °C); at the stoichiometric dose the liquor is near pure
    // fluorite-saturated water. ±25 % for the recalled value and the model.
    CHECK(d.solution.results[dissolved_f] == Approx(7.8).epsilon(0.25));
    check_mass_balance(d);
    check_element_balance(d);
    check_energy_and_charge(d);
  }
}

TEST_CASE("neutraliser: the titration curve of HCl by NaOH as a series", "[neutraliser]") {
  // 0.01 mol/s HCl in 1 kg/s of water; 0.1 mol/kg NaOH; the curve from no reagent to twice the
  // equivalence ratio in 201 points, so that point 100 is the equivalence point.
  const host::StreamState feed = solution(hcl_naoh, 1.0, {{"HCl", 0.01}});
  const host::StreamState reagent = solution(hcl_naoh, 1.0, {{"NaOH", 0.1}});
  const double reagent_mass = 1.0 + 0.1 * component_molar_mass("NaOH");            // kg per 0.1 mol NaOH
  const double feed_mass = 1.0 + 0.01 * component_molar_mass("HCl");
  const double equivalence = 0.1 * reagent_mass / feed_mass;                        // kg/kg for 0.01 mol NaOH
  const Dose d = run(at_25c({{"curve_points", 201.0}, {"curve_ratio_max", 2.0 * equivalence}}), hcl_naoh, feed, reagent);
  REQUIRE(d.solution.series.size() == 1);
  const auto& curve = d.solution.series[0];
  REQUIRE(curve.x.size() == 201);
  CHECK(curve.x[0] == 0.0);
  CHECK(curve.x[200] == Approx(2.0 * equivalence).epsilon(1e-15));
  CHECK(curve.y[0] == Approx(d.solution.results[feed_ph]).margin(1e-9));  // the feed is at 25 °C too
  for (std::size_t i = 1; i < curve.x.size(); ++i) CHECK(curve.y[i] > curve.y[i - 1]);
  // Strong acid + strong base at exact equivalence: pH = pKw/2 (worked example, derived from the ion product,
  // pKw 13.9945 at 25 °C from IAPWS R11-07 (bandura-lvov-2006) through python3-iapws), ±0.01.
  CHECK(curve.x[100] == Approx(equivalence).epsilon(1e-14));
  CHECK(curve.y[100] == Approx(13.9945 / 2.0).margin(0.01));
  // At 1.5 times equivalence 0.005 mol OH- is left in 1.15 kg of water with 0.015 Na+ and 0.01 Cl-:
  // pH = pKw + log10(γ m(OH-)), γ by Davies at I = 0.015/1.15 (the model's own activity, so the
  // check is of the chemistry and the curve's x), pKw 13.9945 (IAPWS R11-07), ±0.002.
  const double i = 0.015 / 1.15;
  const double a = thermo::debye_huckel_parameters(t25, atmosphere).a;
  const double log_gamma = -a * (std::sqrt(i) / (1.0 + std::sqrt(i)) - 0.3 * i);
  CHECK(curve.y[150] == Approx(13.9945 + log_gamma + std::log10(0.005 / 1.15)).margin(0.002));
}

TEST_CASE("neutraliser: two reagents are dosed together in the proportions of their flows", "[neutraliser]") {
  const host::Slate slate{{"H2O", "HCl", "NaOH", "Ca(OH)2"}, {"portlandite"}};
  const host::StreamState feed = solution(slate, 1.0, {{"HCl", 0.02}});
  const host::StreamState caustic = solution(slate, 0.5, {{"NaOH", 0.05}});
  const host::StreamState lime = solution(slate, 0.5, {{"Ca(OH)2", 0.025}});
  host::Instance unit = neutraliser_module().create(
      "neutraliser", at_25c({{"mode", std::string("target_ph")}, {"target_ph", 7.0}}), slate);
  std::vector<host::StreamState> outlets(2);
  const std::vector<std::uint32_t> inlet_counts{1, 2}, outlet_counts{1, 1};
  const host::Solution s = unit.solve(std::vector<host::StreamState>{feed, caustic, lime}, inlet_counts, outlets, outlet_counts);
  CHECK(s.results[outlet_ph] == Approx(7.0).margin(1e-8));
  // The dose scales both reagents: NaOH and Ca(OH)2 stay 2:1 in moles, and their base equivalents
  // (1 and 2 per mole) equal the acid to 0.1 % at pH 7 (stoichiometry).
  const double naoh = column_total(outlets[0], slate, 2) + column_total(outlets[1], slate, 2);
  const double lime_out = column_total(outlets[0], slate, 3) + column_total(outlets[1], slate, 3);
  CHECK(naoh / lime_out == Approx(2.0).epsilon(1e-12));
  CHECK(naoh + 2.0 * lime_out == Approx(0.02).epsilon(1e-3));
  // Water: the feed's and the same share of both reagents'.
  const double share = naoh / 0.05;
  CHECK(column_total(outlets[0], slate, 0) + column_total(outlets[1], slate, 0) ==
        Approx((1.0 + share * 1.0) * mol_per_kg_water).epsilon(1e-12));
}

TEST_CASE("neutraliser: 20 % sulfuric acid dosed adiabatically with 20 % caustic runs hot, and says so", "[neutraliser]") {
  const host::Slate slate{{"H2O", "H2SO4", "NaOH"}, {}};
  const double t40 = 313.15;
  const host::StreamState feed = solution(slate, 0.8, {{"H2SO4", 0.2 / component_molar_mass("H2SO4")}}, t40);
  const host::StreamState reagent = solution(slate, 0.8, {{"NaOH", 0.2 / component_molar_mass("NaOH")}}, t40);
  const Dose d = run({{"mode", std::string("target_ph")}, {"target_ph", 7.0}}, slate, feed, reagent);
  // About 4.1 mol of H+ neutralised at 55.84 kJ/mol (NBS 1982) and 2 mol of HSO4- dissociated into
  // some 1.8 kg of liquor of about 4 kJ/(kg K): a rise of 30 to 45 K from 40 °C (an estimate to
  // orient the check; the engine's own figure is held to the energy balance below).
  CHECK(d.solution.results[outlet_temperature] > 333.15);
  CHECK(d.solution.results[outlet_temperature] < 373.15);
  CHECK(warned(d.solution, "hot outlet"));
  CHECK(d.solution.results[outlet_ph] == Approx(7.0).margin(1e-6));
  check_mass_balance(d);
  check_energy_and_charge(d);
}

TEST_CASE("neutraliser: dry lime powder is dosed as its solid, to the acid's equivalent", "[neutraliser]") {
  const host::Slate slate{{"H2O", "H2SO4", "Ca(OH)2"}, {"gypsum", "portlandite"}};
  const host::StreamState feed = solution(slate, 1.0, {{"H2SO4", 0.05}});
  host::StreamState lime = stream(slate, t25, atmosphere);
  flow(lime, slate, PFU_FIRST_SOLID_ROW + 1, "Ca(OH)2") = 0.1;  // portlandite, no water
  const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 8.0}}), slate, feed, lime);
  CHECK(d.solution.results[outlet_ph] == Approx(8.0).margin(1e-8));
  // Stoichiometry: one Ca(OH)2 per H2SO4 at pH 8, to 0.1 %.
  CHECK(d.scale() * 0.1 == Approx(0.05).epsilon(1e-3));
  CHECK(flow(d.product, slate, PFU_FIRST_SOLID_ROW, "H2SO4") > 0.0);  // gypsum
  check_mass_balance(d);
  check_element_balance(d);
  // Without water the unit can find no pH of its own for the powder: an unreachable target says so.
  const std::string message = failure(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 13.5}, {"max_reagent_ratio", 0.01}}),
                                      slate, feed, lime);
  CHECK(message.find("the reagent alone cannot be equilibrated (it carries no water)") != std::string::npos);
}

TEST_CASE("neutraliser: lime to pH 9 leaves more zinc dissolved over the fresh solid than over the aged one",
          "[neutraliser]") {
  // A dilute zinc sulfate waste, so that the activity coefficients stay near one and the same in both runs.
  const host::Slate slate{{"H2O", "ZnSO4", "H2SO4", "Ca(OH)2"}, {"Zn(OH)2(am)", "zincite", "gypsum", "portlandite"}};
  const host::StreamState feed = solution(slate, 1.0, {{"ZnSO4", 1e-4}, {"H2SO4", 1e-3}});  // 6.5 mg/L Zn
  const host::StreamState reagent = solution(slate, 1.0, {{"Ca(OH)2", 0.01}});           // lime water
  const auto dose = [&](const std::string& form) {
    return run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 9.0}, {"precipitate_form", form}}), slate, feed,
               reagent);
  };
  const Dose fresh = dose("fresh");
  const Dose aged = dose("aged");
  check_mass_balance(fresh);
  check_mass_balance(aged);
  CHECK(warned(fresh.solution, "Zn(OH)2(am) (fresh form)"));
  CHECK(warned(aged.solution, "zincite (aged form)"));
  const double zinc_fresh = fresh.solution.results[dissolved_zn];
  const double zinc_aged = aged.solution.results[dissolved_zn];
  INFO("Zn mg/L at pH 9 over Zn(OH)2(am) and zincite: " << zinc_fresh << ", " << zinc_aged);
  CHECK(zinc_fresh > zinc_aged);
  // Every dissolved zinc species is Zn^2+ times pH terms, and Zn^2+ is fixed by the solid, so at the same pH
  // and ionic strength the two differ by the ratio of the solids' constants alone (thermo/data/metals.yaml):
  // log *Ks 12.45 for Zn(OH)2(am) (baes-mesmer-1976) against 11.12 for zincite (powell-2013).
  CHECK(zinc_fresh / zinc_aged == Approx(std::pow(10.0, 12.45 - 11.12)).epsilon(0.02));
  // The closed form of the same constants: total = sum over n of 10^(log *Ks + log *beta_n + (n - 2) pH)
  // / gamma_n, log *beta_1..4 -8.96, -17.82, -28.05, -40.41 (powell-2013). Davies gammas at the ionic
  // strength of the dosed liquor, taken as that of 1.1 mmol/kg CaSO4 fully dissociated (I = 4.4e-3;
  // the CaSO4(aq) and ZnSO4(aq) pairs the engine also has move the total by a few per cent).
  const double ionic_strength = 4.4e-3;
  const double sqrt_i = std::sqrt(ionic_strength);
  const auto davies_gamma = [&](int charge) {  // Davies 1962, A = 0.509 at 25 °C
    return std::pow(10.0, -0.509 * charge * charge * (sqrt_i / (1.0 + sqrt_i) - 0.3 * ionic_strength));
  };
  const std::array<double, 5> log_beta{0.0, -8.96, -17.82, -28.05, -40.41};
  const std::array<int, 5> charge{2, 1, 0, -1, -2};
  const auto closed_form = [&](double log_ks) {
    double total = 0.0;
    for (std::size_t n = 0; n < log_beta.size(); ++n)
      total += std::pow(10.0, log_ks + log_beta[n] + (static_cast<double>(n) - 2.0) * 9.0) / davies_gamma(charge[n]);
    return total * 65.38e3;  // mg/L, the litre taken as water's kilogram
  };
  CHECK(zinc_fresh == Approx(closed_form(12.45)).epsilon(0.1));
  CHECK(zinc_aged == Approx(closed_form(11.12)).epsilon(0.1));
}

namespace {

// Spent pickle liquor: FeCl2 in HCl, limed; Fe(III) enters the slate as Fe(OH)3, the component that
// receives the oxidised iron whatever acid the feed holds (docs/units.md, "Aeration").
const host::Slate ferrous_slate{{"H2O", "FeCl2", "Fe(OH)3", "HCl", "Ca(OH)2"},
                                {"Fe(OH)2(s)", "ferrihydrite", "goethite", "portlandite"}};

host::StreamState pickle_liquor() { return solution(ferrous_slate, 1.0, {{"FeCl2", 0.01}, {"HCl", 0.01}}); }  // 558 mg/L Fe
host::StreamState lime_slurry() {
  return solution(ferrous_slate, 0.9, {{"Ca(OH)2", 0.1 / component_molar_mass("Ca(OH)2")}});  // 10 wt % Ca(OH)2
}

// Davies (davies-1962) at 25 °C, A = 0.5091 (from memory, as the engine's Debye–Hückel A at 25 °C).
double davies_gamma(int charge, double ionic_strength) {
  const double root = std::sqrt(ionic_strength);
  return std::pow(10.0, -0.5091 * charge * charge * (root / (1.0 + root) - 0.3 * ionic_strength));
}

// The product's equilibrium recomputed through protonflow_thermo (product and off-gas together).
thermo::Speciation product_state(const Dose& d) {
  const thermo::ChemicalSystem system = unit_system(*d.slate);
  thermo::EquilibriumSolver solver(system);
  std::vector<double> out = totals(*d.slate, d.product);
  const std::vector<double> gas = totals(*d.slate, d.off_gas);
  for (std::size_t c = 0; c < out.size(); ++c) out[c] += gas[c];
  return solver.solve(d.product.temperature, d.product.pressure, out);
}

}  // namespace

TEST_CASE("neutraliser: aerating ferrous liquor before liming drops dissolved iron from Fe(OH)2 to ferrihydrite", "[neutraliser]") {
  const std::vector<ParameterValue> to_85 = at_25c({{"mode", std::string("target_ph")}, {"target_ph", 8.5}});
  std::vector<ParameterValue> aerated_to_85 = to_85;
  aerated_to_85.push_back({"fe2_oxidised_fraction", 1.0});
  const Dose plain = run(to_85, ferrous_slate, pickle_liquor(), lime_slurry());
  const Dose aerated = run(aerated_to_85, ferrous_slate, pickle_liquor(), lime_slurry());
  const double ph = 8.5;
  const double fe_mg_per_mol = 55.845e3 * thermo::water_density(t25) / 1e3;  // mg/L per mol/kg (55.845 g/mol, IUPAC)

  // Without aeration Fe(II) is held by Fe(OH)2(s): the data's constants (thermo/data/ferrous-iron.yaml,
  // nordstrom-1990, from memory) log *Ks 13.564, log *beta_1..3 -9.5, -20.57, -31.0, FeCl^+ log K 0.14;
  // Davies gammas at the product's ionic strength. ±1 % for the litre taken as water's.
  {
    const thermo::Speciation s = product_state(plain);
    const thermo::ChemicalSystem system = unit_system(ferrous_slate);
    const double chloride = s.activity[system.index_of_solute("Cl^-")];
    const double ferrous = std::pow(10.0, 13.564 - 2.0 * ph);  // a(Fe^2+)
    const double iron = ferrous / davies_gamma(2, s.ionic_strength) + ferrous * chloride * std::pow(10.0, 0.14) / davies_gamma(1, s.ionic_strength) +
                        std::pow(10.0, 13.564 - 9.5 - 1.0 * ph) / davies_gamma(1, s.ionic_strength) + std::pow(10.0, 13.564 - 20.57) +
                        std::pow(10.0, 13.564 - 31.0 + ph) / davies_gamma(1, s.ionic_strength);
    INFO("Fe mg/L at pH 8.5 without aeration: " << plain.solution.results[dissolved_fe] << ", closed form " << iron * fe_mg_per_mol);
    CHECK(plain.solution.results[outlet_ph] == Approx(ph).margin(1e-6));
    CHECK(plain.solution.results[dissolved_fe] == Approx(iron * fe_mg_per_mol).epsilon(0.01));
    CHECK(plain.solution.results[fe2_oxidised] == 0.0);
    CHECK(plain.solution.results[o2_demand] == 0.0);
    CHECK(warned(plain.solution, "Fe(OH)2(s)"));
  }
  // Aerated, Fe(III) is held by ferrihydrite: log *Ks 4.891, log *beta_1..4 -2.19, -5.67, -12.56, -21.6
  // (thermo/data/metals.yaml, nordstrom-1990, from memory); dimer and trimer are negligible at pH 8.5.
  {
    const thermo::Speciation s = product_state(aerated);
    const std::array<double, 5> log_beta{0.0, -2.19, -5.67, -12.56, -21.6};
    const std::array<int, 5> charge{3, 2, 1, 0, -1};
    double iron = 0.0;
    for (std::size_t n = 0; n < log_beta.size(); ++n)
      iron += std::pow(10.0, 4.891 + log_beta[n] + (static_cast<double>(n) - 3.0) * ph) / davies_gamma(charge[n], s.ionic_strength);
    INFO("Fe mg/L at pH 8.5 aerated: " << aerated.solution.results[dissolved_fe] << ", closed form " << iron * fe_mg_per_mol);
    CHECK(aerated.solution.results[outlet_ph] == Approx(ph).margin(1e-6));
    CHECK(aerated.solution.results[dissolved_fe] == Approx(iron * fe_mg_per_mol).epsilon(0.01));
    CHECK(aerated.solution.results[dissolved_fe] < 1e-3 * plain.solution.results[dissolved_fe]);
    CHECK(warned(aerated.solution, "ferrihydrite"));
  }
  // O2 and air: 1/4 mol O2 per mol Fe; 31.998 g/mol (IUPAC atomic weights); air 20.9476 mol % O2 (U.S. Standard
  // Atmosphere 1976); normal volume R 273.15 K / 101325 Pa = 22.414 L/mol (CODATA 2018 R).
  const double oxygen = 0.25 * 0.01;
  CHECK(aerated.solution.results[fe2_oxidised] == Approx(0.01).epsilon(1e-12));
  CHECK(aerated.solution.results[o2_demand] == Approx(oxygen).epsilon(1e-12));
  CHECK(aerated.solution.results[o2_demand_mass] == Approx(oxygen * 31.998e-3 * 3600.0).epsilon(1e-12));
  CHECK(aerated.solution.results[air_demand] == Approx(oxygen / 0.209476).epsilon(1e-12));
  CHECK(aerated.solution.results[air_demand_volume] == Approx(oxygen / 0.209476 * 22.4140e-3 * 3600.0).epsilon(1e-5));
  // Lime: Fe^2+ -> Fe(OH)2 and Fe^2+ + 1/4 O2 -> Fe(OH)3 both release 2 H^+ per Fe, so aeration adds lime only for
  // the Fe(II) that stayed dissolved without it: one Ca(OH)2 per Fe^2+ (half per FeOH^+). About 1 kg of water.
  const double extra_lime = (aerated.solution.results[reagent_flow] - plain.solution.results[reagent_flow]) * 0.1 /
                            component_molar_mass("Ca(OH)2");
  const double ferrous_left = plain.solution.results[dissolved_fe] / fe_mg_per_mol;
  INFO("extra Ca(OH)2 " << extra_lime << " mol/s; Fe(II) left dissolved without aeration " << ferrous_left << " mol/kg");
  CHECK(extra_lime > 0.8 * ferrous_left);
  CHECK(extra_lime < 1.05 * ferrous_left);

  // Balances. Mass per component holds without aeration; with it, every element (O included) balances with
  // the O2 taken in, the charge of the product is zero, and the energy balance closes with the O2 at 25 °C
  // (zero enthalpy, the element in its standard state, nbs-1982): the heat of the oxidation is in the
  // species' formation enthalpies.
  check_mass_balance(plain);
  check_element_balance(plain);
  check_energy_and_charge(plain);
  check_energy_and_charge(aerated);
  std::map<std::string, double> in{{"O", 2.0 * aerated.solution.results[o2_demand]}}, out;
  for (std::size_t c = 0; c < ferrous_slate.components.size(); ++c) {
    const thermo::Formula formula = thermo::parse_formula(ferrous_slate.components[c]);
    const double n_in = column_total(aerated.feed, ferrous_slate, c) + aerated.scale() * column_total(aerated.reagent, ferrous_slate, c);
    const double n_out = column_total(aerated.product, ferrous_slate, c) + column_total(aerated.off_gas, ferrous_slate, c);
    for (const auto& [element, count] : formula.elements) {
      in[element] += count * n_in;
      out[element] += count * n_out;
    }
  }
  for (const auto& [element, amount] : in) {
    INFO("element " << element);
    CHECK(out[element] == Approx(amount).epsilon(1e-12));
  }
  for (const double f : aerated.product.flows) CHECK(f >= 0.0);
  // The heat of the oxidation, Fe^2+ + 1/4 O2 + H^+ -> Fe^3+ + 1/2 H2O: dfH -48.5 - 285.83/2 + 89.1 = -102.3 kJ/mol
  // (nbs-1982, from memory), shows in the duty at 25 °C: more heat is removed when aerated.
  CHECK(aerated.solution.results[duty] < plain.solution.results[duty]);

  // Adiabatic, the same heat warms the product instead; the energy balance closes with zero duty.
  const std::vector<ParameterValue> adiabatic{{"mode", std::string("target_ph")}, {"target_ph", 8.5}};
  std::vector<ParameterValue> aerated_adiabatic = adiabatic;
  aerated_adiabatic.push_back({"fe2_oxidised_fraction", 1.0});
  const Dose warm_plain = run(adiabatic, ferrous_slate, pickle_liquor(), lime_slurry());
  const Dose warm_aerated = run(aerated_adiabatic, ferrous_slate, pickle_liquor(), lime_slurry());
  INFO("adiabatic outlet " << warm_plain.solution.results[outlet_temperature] << " K, aerated "
                           << warm_aerated.solution.results[outlet_temperature] << " K");
  CHECK(warm_aerated.solution.results[outlet_temperature] > warm_plain.solution.results[outlet_temperature]);
  CHECK(warm_aerated.solution.results[duty] == 0.0);
  check_energy_and_charge(warm_aerated);
}

TEST_CASE("neutraliser: aeration refuses a slate without Fe(III) and a feed without Fe(II), naming the parameter",
          "[neutraliser]") {
  const host::Slate no_ferric{{"H2O", "FeCl2", "HCl", "Ca(OH)2"}, {"Fe(OH)2(s)", "portlandite"}};
  std::string message = "created";
  try {
    neutraliser_module().create("neutraliser", std::vector<ParameterValue>{{"fe2_oxidised_fraction", 0.5}}, no_ferric);
  } catch (const host::CreateError& error) {
    message = error.what();
  }
  INFO(message);
  CHECK(message.find("fe2_oxidised_fraction") != std::string::npos);
  CHECK(message.find("no Fe(III) component") != std::string::npos);
  // Without aeration the same slate serves.
  CHECK_NOTHROW(neutraliser_module().create("neutraliser", std::vector<ParameterValue>{}, no_ferric));

  const host::StreamState acid = solution(ferrous_slate, 1.0, {{"HCl", 0.01}});
  const std::string failed = failure({{"fe2_oxidised_fraction", 0.5}}, ferrous_slate, acid, lime_slurry());
  INFO(failed);
  CHECK(failed.find("fe2_oxidised_fraction") != std::string::npos);
  CHECK(failed.find("carries no Fe(II)") != std::string::npos);
}

TEST_CASE("neutraliser: cyanide and hypochlorite wastes acidified release HCN and Cl2, and the unit warns", "[neutraliser]") {
  SECTION("cyanide: HCN over the liquor at pH 7, none worth warning of at pH 11") {
    // 1 mmol/kg NaCN (26 mg/L CN). At pH 7 nearly all of it is HCN(aq) (pKa 9.21, izatt-1962), over which Henry's
    // law (9.02 mol/(kg atm) at 25 °C, ma-2010) puts 1.1e-4 atm = 110 ppm, above the NIOSH short-term limit of
    // 4.7 ppm (niosh-pocket-guide). At pH 11 HCN is 10^(9.21 - 11) = 1.6 % of it: about 1.8 ppm, below.
    const host::Slate slate{{"H2O", "NaCN", "HCl", "NaOH"}, {}};
    const host::StreamState feed = solution(slate, 1.0, {{"NaCN", 1e-3}, {"NaOH", 1e-2}});
    const host::StreamState acid = solution(slate, 1.0, {{"HCl", 0.1}});
    const Dose to_7 = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 7.0}}), slate, feed, acid);
    CHECK(warned(to_7.solution, "toxic gas released: hydrogen cyanide"));
    CHECK(warned(to_7.solution, "mg/kg of water as HCN(aq)"));
    CHECK(warned(to_7.solution, "NIOSH recommended limit 4.7 ppm"));
    check_mass_balance(to_7);
    check_element_balance(to_7);
    check_energy_and_charge(to_7);
    const Dose to_11 = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 11.0}}), slate, feed, acid);
    CHECK_FALSE(warned(to_11.solution, "toxic gas released"));
  }
  SECTION("hypochlorite: Cl2 over the liquor at pH 3, none at pH 8") {
    // 1 mmol/kg NaOCl in 10 mmol/kg NaCl. Cl2(aq) = 10^3.34 m(HOCl) a(Cl^-) a(H^+) (thermo/data/chlorine.yaml):
    // at pH 3 about 2e-5 mol/kg, some 300 ppm of Cl2 over it (Henry 0.061 mol/(kg atm)), above the NIOSH
    // ceiling of 0.5 ppm; at pH 8 ten million times less.
    const host::Slate slate{{"H2O", "NaOCl", "NaCl", "HCl", "NaOH"}, {}};
    const host::StreamState feed = solution(slate, 1.0, {{"NaOCl", 1e-3}, {"NaCl", 0.01}, {"NaOH", 1e-3}});
    const host::StreamState acid = solution(slate, 1.0, {{"HCl", 0.1}});
    const Dose to_3 = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 3.0}}), slate, feed, acid);
    CHECK(warned(to_3.solution, "toxic gas released: chlorine"));
    CHECK(warned(to_3.solution, "NIOSH recommended limit 0.5 ppm"));
    check_mass_balance(to_3);
    check_element_balance(to_3);
    check_energy_and_charge(to_3);
    const Dose to_8 = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", 8.0}}), slate, feed, acid);
    CHECK_FALSE(warned(to_8.solution, "toxic gas released"));
  }
}

TEST_CASE("neutraliser: dissolved Fe(III), Cu and Ni follow their solubility curves through the unit", "[neutraliser]") {
  // 0.5 mmol/kg each of FeCl3, CuCl2 and NiCl2 in 0.01 mol/kg HCl, dosed with 2 mol/kg NaOH, fresh solids. For a
  // metal whose solid is present, the total dissolved is sum_n 10^(log *Ks + log *beta_n + (n - z) pH) / gamma_n,
  // with the data's constants (thermo/data/metals.yaml; each source from memory) and Davies gammas at the product's
  // ionic strength; the data hold no chloride complexes of these metals. (Cr(III): the next test.)
  const host::Slate slate{{"H2O", "HCl", "NaOH", "FeCl3", "CuCl2", "NiCl2"},
                          {"ferrihydrite", "goethite", "Cu(OH)2(s)", "tenorite", "Ni(OH)2(fresh)", "theophrastite"}};
  const host::StreamState feed = solution(slate, 1.0, {{"HCl", 0.01}, {"FeCl3", 5e-4}, {"CuCl2", 5e-4}, {"NiCl2", 5e-4}});
  const host::StreamState reagent = solution(slate, 1.0, {{"NaOH", 2.0}});
  struct Metal {
    const char* name;
    Result result;
    const char* solid;
    double molar_mass;  // g/mol, IUPAC atomic weights
    double log_ks;
    int charge;
    std::vector<double> log_beta;  // n = 0, 1, ...
    const char* source;
    std::vector<std::array<double, 3>> polynuclear = {};  // M_p(OH)_q: p, q, log *beta_pq
  };
  const std::vector<Metal> metals{
      {"Fe(III)", dissolved_fe, "ferrihydrite", 55.845, 4.891, 3, {0.0, -2.19, -5.67, -12.56, -21.6}, "nordstrom-1990",
       {{2, 2, -2.95}, {3, 4, -6.3}}},
      {"Cu", dissolved_cu, "Cu(OH)2(s)", 63.546, 8.67, 2, {0.0, -7.95, -16.2, -26.6, -39.74}, "powell-2007", {{2, 2, -10.43}}},
      {"Ni", dissolved_ni, "Ni(OH)2(fresh)", 58.6934, 12.73, 2, {0.0, -9.86, -19.0, -30.0}, "nbs-1982, baes-mesmer-1976"},
  };
  const thermo::ChemicalSystem system = unit_system(slate);
  std::map<std::string, std::map<double, double>> found;  // metal -> pH -> mg/L
  int compared = 0;
  for (const double ph : {6.5, 9.0, 10.5, 12.5}) {
    const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", ph}}), slate, feed, reagent);
    check_mass_balance(d);
    check_element_balance(d);
    const thermo::Speciation s = product_state(d);
    for (const Metal& m : metals) {
      found[m.name][ph] = d.solution.results[m.result];
      std::size_t solid = 0;
      while (system.solids()[solid].name != m.solid) ++solid;
      if (!(s.solid_amount[solid] > 0.0)) continue;  // not saturated: no curve to be on
      double total = 0.0;
      for (std::size_t n = 0; n < m.log_beta.size(); ++n)
        total += std::pow(10.0, m.log_ks + m.log_beta[n] + (static_cast<double>(n) - m.charge) * ph) /
                 davies_gamma(m.charge - static_cast<int>(n), s.ionic_strength);
      for (const auto& [p, q, log_beta] : m.polynuclear)
        total += p * std::pow(10.0, p * m.log_ks + log_beta + (q - p * m.charge) * ph) /
                 davies_gamma(static_cast<int>(p * m.charge - q), s.ionic_strength);
      const double closed_form = total * m.molar_mass * 1e3 * thermo::water_density(t25) / 1e3;  // mg/L
      INFO(m.name << " at pH " << ph << " (" << m.source << "): " << d.solution.results[m.result] << " mg/L, closed form "
                  << closed_form);
      CHECK(d.solution.results[m.result] == Approx(closed_form).epsilon(0.01));
      ++compared;
    }
  }
  // Fe(III) and Cu at every pH; Ni from pH 9 (at pH 6.5 its salt stays dissolved at 0.5 mmol/kg).
  CHECK(compared == 11);
  // Cu is least soluble near pH 9.5 and rises again as Cu(OH)3^- and Cu(OH)4^2-; Ni falls past pH 10.5 and rises
  // again as Ni(OH)3^-.
  CHECK(found["Cu"][9.0] < found["Cu"][12.5]);
  CHECK(found["Ni"][10.5] < found["Ni"][9.0]);
  CHECK(found["Ni"][12.5] > found["Ni"][10.5]);
}

TEST_CASE("neutraliser: dissolved Cr(III) over Cr(OH)3(am) through the unit, amphoteric above pH 10", "[neutraliser]") {
  // 0.5 mmol/kg CrCl3 in 0.01 mol/kg HCl, dosed with 2 mol/kg NaOH. With Cr(OH)3(am) present the total dissolved
  // Cr is sum_n 10^(log *Ks + log *beta_n + (n - 3) pH) / gamma_n over Cr^3+, CrOH^2+, Cr(OH)3(aq) and Cr(OH)4^-,
  // with the data's constants (Rai, Sass & Moore 1987, rai-1987, from memory: log *Ks 9.35, log *beta 1, 3, 4 =
  // -3.57, -16.19, -27.65; no Cr(OH)2^+) and Davies gammas at the product's ionic strength; no chloride complexes.
  const host::Slate slate{{"H2O", "HCl", "NaOH", "CrCl3"}, {"Cr(OH)3(am)"}};
  const host::StreamState feed = solution(slate, 1.0, {{"HCl", 0.01}, {"CrCl3", 5e-4}});
  const host::StreamState reagent = solution(slate, 1.0, {{"NaOH", 2.0}});
  const std::vector<std::pair<int, double>> log_beta{{0, 0.0}, {1, -3.57}, {3, -16.19}, {4, -27.65}};
  constexpr double log_ks = 9.35;
  constexpr double chromium_molar_mass = 51.9961;  // g/mol, IUPAC atomic weight
  std::map<double, double> found;                   // pH -> mg/L
  for (const double ph : {6.5, 8.5, 10.5, 12.5}) {
    const Dose d = run(at_25c({{"mode", std::string("target_ph")}, {"target_ph", ph}}), slate, feed, reagent);
    check_mass_balance(d);
    check_element_balance(d);
    const thermo::Speciation s = product_state(d);
    REQUIRE(s.solid_amount[0] > 0.0);  // 0.5 mmol/kg is far above the solubility at every one of these pH
    double total = 0.0;
    for (const auto& [n, beta] : log_beta)
      total += std::pow(10.0, log_ks + beta + (n - 3) * ph) / davies_gamma(3 - n, s.ionic_strength);
    const double closed_form = total * chromium_molar_mass * 1e3 * thermo::water_density(t25) / 1e3;  // mg/L
    found[ph] = d.solution.results[dissolved_cr];
    INFO("Cr(III) at pH " << ph << " (rai-1987): " << found[ph] << " mg/L, closed form " << closed_form);
    CHECK(found[ph] == Approx(closed_form).epsilon(0.01));
  }
  // Least soluble from pH 7 to 10 at the Cr(OH)3(aq) floor, 10^(9.35 - 16.19) mol/kg = 7.5 µg/L; higher at pH 6.5
  // (CrOH^2+) and re-dissolving as Cr(OH)4^- at pH 12.5.
  CHECK(found[8.5] == Approx(std::pow(10.0, log_ks - 16.19) * chromium_molar_mass * 1e3).epsilon(0.05));
  CHECK(found[8.5] < found[6.5]);
  CHECK(found[12.5] > 5.0 * found[10.5]);
}
