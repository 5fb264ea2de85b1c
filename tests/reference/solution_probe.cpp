#include "solution_probe.hpp"

#include <cmath>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/temperature_function.hpp"

namespace protonflow::reference {

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
