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
  // If not empty, only these secondary aqueous species are considered (basis species always are).
  std::vector<std::string> secondary_species;
  // Solids that may precipitate (database names, e.g. "gypsum"). Every other solid the basis
  // reaches is reported by its saturation index only.
  std::vector<std::string> allowed_solids;
  // Which form of a solid that has a fresh and an aged form may precipitate. A neutraliser makes fresh,
  // amorphous precipitates (the default); the aged or crystalline forms (gibbsite, zincite, ...) take
  // part only when asked for. Solids with one form only (gypsum, calcite) are not affected.
  PrecipitateAge precipitates = PrecipitateAge::fresh;
  // Gases held at a fixed partial pressure (a liquid open to air or to a gas of known composition);
  // the pressures are given with each solve. The solution exchanges each with an unlimited reservoir.
  std::vector<std::string> open_gases;
  // A closed system in which a gas phase of unknown amount may form at the solve's total pressure,
  // holding every gas the basis reaches and water vapour.
  bool gas_phase = false;
};

// A solute of the system. Index 0 is H^+; basis solutes come first, then secondary ones.
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
  double reference_enthalpy = 0.0;  // J/mol at 298.15 K (NaN where the data cannot give it)
  double heat_capacity = 0.0;       // J/(mol K), constant
};

// A solid or a gas: formation from the basis, like a secondary solute, but a phase of its own.
struct PhaseSpecies {
  std::string name;
  std::vector<double> stoichiometry;  // per basis solute
  double water_coefficient = 0.0;
  TemperatureFunction log_k;
  double minimum_temperature = 0.0;
  double maximum_temperature = 0.0;
  double reference_enthalpy = 0.0;  // J/mol at 298.15 K (NaN where the data cannot give it)
  double heat_capacity = 0.0;       // J/(mol K), constant
  bool allowed = false;  // solids: may precipitate; gases: takes part (open or in the gas phase)
  PrecipitateAge age = PrecipitateAge::any;  // solids: fresh or aged form, or the only form
  std::size_t pivot = 0; // open gases: the basis solute whose mass balance the gas replaces
};

class ChemicalSystem {
 public:
  ChemicalSystem(const Database& database, std::vector<std::string> components, SystemOptions options = {});

  const std::vector<std::string>& components() const noexcept { return components_; }
  const std::vector<Solute>& solutes() const noexcept { return solutes_; }
  // Every solid the basis reaches; allowed ones may precipitate, the rest get a saturation index.
  const std::vector<PhaseSpecies>& solids() const noexcept { return solids_; }
  // Open gases (fixed partial pressure) in the order of SystemOptions::open_gases.
  const std::vector<PhaseSpecies>& open_gases() const noexcept { return open_gases_; }
  // With SystemOptions::gas_phase: every gas the basis reaches, water vapour included.
  const std::vector<PhaseSpecies>& phase_gases() const noexcept { return phase_gases_; }
  std::size_t basis_count() const noexcept { return basis_count_; }
  // Basis solute amounts (and water) per mole of component c: composition(c)[b], water_in(c).
  const std::vector<double>& composition(std::size_t component) const { return composition_[component]; }
  double water_in(std::size_t component) const { return water_in_[component]; }
  // Molar mass of each component, kg/mol.
  double component_molar_mass(std::size_t component) const { return molar_mass_[component]; }
  std::size_t index_of_solute(std::string_view name) const;  // throws ThermoError(unknown_species)
  std::size_t index_of_component(std::string_view name) const;  // throws ThermoError(unknown_species)
  const SystemOptions& options() const noexcept { return options_; }
  // ΔfH° of liquid water at 298.15 K, J/mol, from the data.
  double water_formation_enthalpy() const noexcept { return water_formation_enthalpy_; }
  // The temperature range every species' data covers (K).
  double minimum_temperature() const noexcept { return minimum_temperature_; }
  double maximum_temperature() const noexcept { return maximum_temperature_; }

 private:
  std::vector<std::string> components_;
  std::vector<Solute> solutes_;
  std::vector<PhaseSpecies> solids_;
  std::vector<PhaseSpecies> open_gases_;
  std::vector<PhaseSpecies> phase_gases_;
  std::size_t basis_count_ = 0;
  std::vector<std::vector<double>> composition_;
  std::vector<double> water_in_;
  std::vector<double> molar_mass_;
  SystemOptions options_;
  double water_formation_enthalpy_ = 0.0;
  double minimum_temperature_ = 0.0;
  double maximum_temperature_ = 0.0;
};

}  // namespace protonflow::thermo
