// Reading one solution from a YAML file (format: docs/solution-format.md). Quantities are
// converted to SI here; what the numbers of each component mean depends on the amount basis.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "input_error.hpp"
#include "protonflow/thermo/activity_model.hpp"
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

struct SolutionInput {
  std::string file;
  std::string name;                   // optional label, empty if not given
  double temperature = 0.0;           // K
  double pressure = 0.0;              // Pa
  thermo::ActivityModelKind activity_model = thermo::ActivityModelKind::davies;
  AmountBasis basis = AmountBasis::molality;
  std::optional<double> water_mass;   // kg; molality basis only
  std::vector<ComponentEntry> components;  // in file order
  SourcePosition solution_at;
  SourcePosition temperature_at;
  SourcePosition pressure_at;         // the solution key when pressure took its default
  SourcePosition components_at;
};

// Reads and checks the file. Throws InputError naming the file, line and column.
SolutionInput read_solution_file(const std::string& file, const UnitConverter& units);

}  // namespace protonflow::host
