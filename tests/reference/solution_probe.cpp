#include "solution_probe.hpp"

#include <cmath>
#include <stdexcept>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/stream_enthalpy.hpp"
#include "protonflow/thermo/temperature_function.hpp"

namespace protonflow::reference {

namespace {

// The slate and amounts of a recipe on 1 kg of water.
std::pair<std::vector<std::string>, std::vector<double>> slate_of(const Recipe& recipe) {
  std::vector<std::string> components{"H2O"};
  std::vector<double> amounts{1.0 / thermo::constants::water_molar_mass};  // 1 kg of water
  for (const auto& [component, molality] : recipe) {
    components.push_back(component);
    amounts.push_back(molality);
  }
  return {components, amounts};
}

}  // namespace

const thermo::Database& bundled_database() {
  static const thermo::Database database = thermo::load_database(thermo::default_data_directory());
  return database;
}

double ProbeResult::molality(const std::string& solute) const {
  return speciation.molality[system.index_of_solute(solute)];
}

double ProbeResult::log10_gamma(const std::string& solute) const {
  return speciation.log10_gamma[system.index_of_solute(solute)];
}

ProbeResult solve_recipe(const Recipe& recipe, thermo::ActivityModelKind model, double temperature) {
  std::vector<std::string> components{"H2O"};
  std::vector<double> amounts{1.0 / thermo::constants::water_molar_mass};  // 1 kg of water
  for (const auto& [component, molality] : recipe) {
    components.push_back(component);
    amounts.push_back(molality);
  }
  thermo::SystemOptions options;
  options.activity = model;
  thermo::ChemicalSystem system(bundled_database(), components, options);
  thermo::EquilibriumSolver solver(system);
  thermo::Speciation speciation = solver.solve(temperature, thermo::constants::standard_atmosphere, amounts);
  return {std::move(system), std::move(speciation)};
}

ProbeResult solve_open_to(const Recipe& recipe, const std::string& gas, double partial_pressure,
                          thermo::ActivityModelKind model) {
  const auto [components, amounts] = slate_of(recipe);
  thermo::SystemOptions options;
  options.activity = model;
  options.open_gases = {gas};
  thermo::ChemicalSystem system(bundled_database(), components, options);
  thermo::EquilibriumSolver solver(system);
  thermo::Speciation speciation;
  solver.solve(298.15, thermo::constants::standard_atmosphere, amounts, std::vector<double>{partial_pressure}, speciation);
  return {std::move(system), std::move(speciation)};
}

double equilibrium_partial_pressure(const Recipe& recipe, const std::string& gas, thermo::ActivityModelKind model) {
  const auto [components, amounts] = slate_of(recipe);
  thermo::SystemOptions options;
  options.activity = model;
  options.gas_phase = true;
  thermo::ChemicalSystem system(bundled_database(), components, options);
  thermo::EquilibriumSolver solver(system);
  const thermo::Speciation s = solver.solve(298.15, thermo::constants::standard_atmosphere, amounts);
  for (std::size_t g = 0; g < system.phase_gases().size(); ++g)
    if (system.phase_gases()[g].name == gas) return s.partial_pressure[g];
  throw std::runtime_error(gas + " is not a gas of this system");
}

namespace {

double enthalpy_of(const Recipe& recipe) {
  const ProbeResult r = solve_recipe(recipe, thermo::ActivityModelKind::davies);
  return thermo::state_enthalpy(r.system, r.speciation);
}

}  // namespace

double dissolution_enthalpy(const std::string& component, const std::string& pure_species, double amount) {
  const double pure = bundled_database().find(pure_species)->formation_enthalpy->value;
  return (enthalpy_of({{component, amount}}) - enthalpy_of({}) - amount * pure) / amount;
}

double standard_dissolution_enthalpy(const std::string& component, const std::string& pure_species) {
  const thermo::ChemicalSystem system(bundled_database(), {"H2O", component});
  const std::size_t c = system.index_of_component(component);
  double products = system.water_in(c) * system.water_formation_enthalpy();
  for (std::size_t b = 0; b < system.basis_count(); ++b)
    products += system.composition(c)[b] * system.solutes()[b].reference_enthalpy;
  return products - bundled_database().find(pure_species)->formation_enthalpy->value;
}

double neutralisation_enthalpy(double molality) {
  // 2 kg of water holding `molality` mol of each: twice the state of 1 kg at half the molality.
  const double mixed = 2.0 * enthalpy_of({{"HCl", 0.5 * molality}, {"NaOH", 0.5 * molality}});
  return (mixed - enthalpy_of({{"HCl", molality}}) - enthalpy_of({{"NaOH", molality}})) / molality;
}

double formation_log_k(const std::string& species, double temperature) {
  const thermo::Species* s = bundled_database().find(species);
  return thermo::log_k(s->log_k, temperature, thermo::constants::standard_atmosphere);
}

double mean_activity_coefficient(const std::string& salt, const std::string& cation, int cations,
                                 const std::string& anion, int anions, double molality, thermo::ActivityModelKind model) {
  const ProbeResult r = solve_recipe({{salt, molality}}, model);
  const double log_mean = (cations * r.log10_gamma(cation) + anions * r.log10_gamma(anion)) / (cations + anions);
  return std::pow(10.0, log_mean);
}

}  // namespace protonflow::reference

namespace protonflow::reference {

double gypsum_solubility(double nacl_molality, thermo::ActivityModelKind model, double temperature) {
  constexpr double gypsum_fed = 0.2;  // mol, several times what dissolves
  const std::vector<std::string> components{"H2O", "NaCl", "CaSO4.2H2O"};
  const std::vector<double> amounts{1.0 / thermo::constants::water_molar_mass, nacl_molality, gypsum_fed};
  thermo::SystemOptions options;
  options.activity = model;
  options.allowed_solids = {"gypsum"};
  const thermo::ChemicalSystem system(bundled_database(), components, options);
  thermo::EquilibriumSolver solver(system);
  const thermo::Speciation s = solver.solve(temperature, thermo::constants::standard_atmosphere, amounts);
  std::size_t gypsum = 0;
  while (system.solids()[gypsum].name != "gypsum") ++gypsum;
  return (gypsum_fed - s.solid_amount[gypsum]) / s.water_mass;
}

double salt_solubility(const std::string& component, const std::string& solid, double feed, double temperature) {
  thermo::SystemOptions options;
  options.activity = thermo::ActivityModelKind::pitzer;
  options.allowed_solids = {solid};
  const thermo::ChemicalSystem system(bundled_database(), {"H2O", component}, options);
  thermo::EquilibriumSolver solver(system);
  const thermo::Speciation s = solver.solve(temperature, thermo::constants::standard_atmosphere,
                                            std::vector<double>{1.0 / thermo::constants::water_molar_mass, feed});
  std::size_t index = 0;
  while (system.solids()[index].name != solid) ++index;
  if (s.solid_amount[index] <= 0.0) throw std::runtime_error(component + ": the feed dissolved entirely; feed more");
  return (feed - s.solid_amount[index]) / s.water_mass;
}

}  // namespace protonflow::reference
