// Reading one solution from a YAML file (format: docs/solution-format.md). Quantities are
// converted to SI here; what the numbers of each component mean depends on the amount basis.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "input_error.hpp"
#include "protonflow/thermo/activity_model.hpp"
#include "protonflow/thermo/species.hpp"
#include "quantity.hpp"

namespace protonflow::host {

// What the number given for each component means.
enum class AmountBasis {
  molality,       // mol per kg of water
  moles,          // mol, water listed as H2O
  mass_fraction,  // kg per kg of the whole solution, water the remainder unless listed
};

std::string_view to_string(AmountBasis basis) noexcept;
std::string_view to_string(thermo::ActivityModelKind kind) noexcept;

struct ComponentEntry {
  std::string formula;  // as written, e.g. "H2SO4"
  double amount = 0.0;  // SI in the basis: mol/kg, mol or kg/kg
  SourcePosition key_at;
  SourcePosition value_at;
};

// A named phase the solution may form or is open to, where the file names it.
struct PhaseEntry {
  std::string name;           // database name, e.g. "gypsum", "CO2(g)"
  double partial_pressure = 0.0;  // Pa, open gases only
  SourcePosition at;
};

struct SolutionInput {
  std::string file;
  std::string name;                   // optional label, empty if not given
  double temperature = 0.0;           // K
  double pressure = 0.0;              // Pa
  thermo::ActivityModelKind activity_model = thermo::ActivityModelKind::davies;
  AmountBasis basis = AmountBasis::molality;
  std::optional<double> water_mass;   // kg; molality basis only
  std::vector<ComponentEntry> components;  // in file order
  // Solids allowed to precipitate; every solid the components reach when may_precipitate is 'all'.
  std::vector<PhaseEntry> solids;
  bool all_solids = false;
  // Fresh (amorphous) or aged (crystalline) forms of the solids that have both.
  thermo::PrecipitateAge precipitates = thermo::PrecipitateAge::fresh;
  std::vector<PhaseEntry> open_gases;  // fixed partial pressures
  bool gas_phase = false;              // a closed gas phase may form at the pressure
  std::optional<double> enthalpy;      // J for the amounts given: find the temperature
  SourcePosition enthalpy_at;
  SourcePosition solution_at;
  SourcePosition temperature_at;
  SourcePosition pressure_at;         // the solution key when pressure took its default
  SourcePosition components_at;
};

// Reads and checks the file. Throws InputError naming the file, line and column.
SolutionInput read_solution_file(const std::string& file, const UnitConverter& units);

// The same for a text already in memory, reported under the name `file`.
SolutionInput parse_solution(const std::string& text, const std::string& file, const UnitConverter& units);

}  // namespace protonflow::host
