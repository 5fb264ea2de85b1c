// A chemical system: the slate of formula components, the basis and secondary species they reach,
// and the stoichiometry that ties them together. Built once; solved many times.
#pragma once

#include <string>
#include <vector>

#include "protonflow/thermo/activity_model.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/temperature_function.hpp"

namespace protonflow::thermo {

struct SystemOptions {
  ActivityModelKind activity = ActivityModelKind::davies;
  // If not empty, only these secondary species are considered (basis species are always present).
  std::vector<std::string> secondary_species;
};

// A solute of the system. Index 0 is H+; basis solutes come first, then secondary ones.
struct Solute {
  std::string name;
  int charge = 0;
  double ion_size_angstrom = 0.0;
  bool is_basis = false;
  std::vector<double> stoichiometry;  // per basis solute (formation reaction); unit vector for a basis solute
  double water_coefficient = 0.0;     // H2O in the formation reaction
  TemperatureFunction log_k;
  double minimum_temperature = 0.0;
  double maximum_temperature = 0.0;
};

class ChemicalSystem {
 public:
  ChemicalSystem(const Database& database, std::vector<std::string> components, SystemOptions options = {});

  const std::vector<std::string>& components() const noexcept { return components_; }
  const std::vector<Solute>& solutes() const noexcept { return solutes_; }
  std::size_t basis_count() const noexcept { return basis_count_; }
  // Basis solute amounts (and water) per mole of component c: composition(c)[b], water_in(c).
  const std::vector<double>& composition(std::size_t component) const { return composition_[component]; }
  double water_in(std::size_t component) const { return water_in_[component]; }
  // Molar mass of each component, kg/mol.
  double component_molar_mass(std::size_t component) const { return molar_mass_[component]; }
  std::size_t index_of_solute(std::string_view name) const;  // throws ThermoError(unknown_species)
  std::size_t index_of_component(std::string_view name) const;  // throws ThermoError(unknown_species)
  const SystemOptions& options() const noexcept { return options_; }
  // The temperature range every species' data covers (K).
  double minimum_temperature() const noexcept { return minimum_temperature_; }
  double maximum_temperature() const noexcept { return maximum_temperature_; }

 private:
  std::vector<std::string> components_;
  std::vector<Solute> solutes_;
  std::size_t basis_count_ = 0;
  std::vector<std::vector<double>> composition_;
  std::vector<double> water_in_;
  std::vector<double> molar_mass_;
  SystemOptions options_;
  double minimum_temperature_ = 0.0;
  double maximum_temperature_ = 0.0;
};

}  // namespace protonflow::thermo
