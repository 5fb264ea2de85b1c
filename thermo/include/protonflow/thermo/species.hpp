// One species of the database, as read from thermo/data/*.yaml.
#pragma once

#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "protonflow/thermo/formula.hpp"
#include "protonflow/thermo/temperature_function.hpp"

namespace protonflow::thermo {

// solvent: H2O only; liquid: a pure liquid feed (concentrated acid) that is never a phase of a solve.
enum class Phase { aqueous, solvent, solid, gas, liquid };

// Which precipitate a solid is: a fresh (amorphous, freshly precipitated) form, an aged or crystalline
// form of the same solid, or neither (a solid with one form only, such as gypsum).
enum class PrecipitateAge { any, fresh, aged };

// "fresh", "aged" or "any".
const char* to_string(PrecipitateAge age) noexcept;

struct SourcedValue {
  double value;        // SI: J/mol, J/(mol K)
  std::string source;  // key into docs/references.md
};

struct Species {
  std::string name;  // unique, e.g. "HSO4^-", "CO2(aq)"
  Formula formula;
  Phase phase = Phase::aqueous;
  bool is_basis = false;  // aqueous basis species and the solvent only
  std::optional<double> ion_size_angstrom;  // charged species only
  std::optional<SourcedValue> formation_enthalpy;
  std::optional<SourcedValue> entropy;
  std::optional<SourcedValue> heat_capacity;
  // Formation from basis species (non-basis species only): basis name and coefficient.
  std::vector<std::pair<std::string, double>> reaction;
  TemperatureFunction log_k;
  std::string log_k_source;
  PrecipitateAge precipitate_age = PrecipitateAge::any;  // solids only
  double minimum_temperature = 273.15;  // K
  double maximum_temperature = 373.15;  // K
  std::string file;  // data file and line it came from, for messages
  int line = 0;
};

}  // namespace protonflow::thermo
