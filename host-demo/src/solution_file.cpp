#include "solution_file.hpp"

#include <algorithm>
#include <array>
#include <fstream>
#include <map>
#include <span>
#include <sstream>

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include "nearest_name.hpp"
#include "protonflow/thermo/constants.hpp"

namespace protonflow::host {
namespace {

constexpr std::array<std::string_view, 1> top_level_keys{"solution"};
constexpr std::array<std::string_view, 12> solution_keys{
    "name",       "temperature", "pressure",  "activity_model", "amounts_as", "water_mass",
    "components", "may_precipitate", "open_to", "gas_phase",   "enthalpy", "precipitates"};
constexpr std::array<std::string_view, 4> activity_model_names{"davies", "b-dot", "ideal", "pitzer"};
constexpr std::array<std::string_view, 3> basis_names{"molality", "moles", "mass_fraction"};

SourcePosition position_of(const std::string& file, const YAML::Mark& mark) {
  if (mark.is_null()) {
    return SourcePosition{file, 0, 0};
  }
  return SourcePosition{file, mark.line + 1, mark.column + 1};  // yaml-cpp counts from 0
}

SourcePosition position_of(const std::string& file, const YAML::Node& node) { return position_of(file, node.Mark()); }

struct Entry {
  YAML::Node key;
  YAML::Node value;
};

// "unknown WHAT 'given' CONTEXT; did you mean ...?" (context may be empty).
std::string unknown_choice_message(std::string_view what, std::string_view given, std::string_view context,
                                   std::span<const std::string_view> choices) {
  const std::string unknown = fmt::format("unknown {} '{}'{}{}", what, given, context.empty() ? "" : " ", context);
  if (const auto suggestion = nearest_name(given, choices)) {
    return fmt::format("{}; did you mean '{}'?", unknown, *suggestion);
  }
  return fmt::format("{}; expected {}", unknown, list_choices(choices));
}

// The entries of a mapping by key, rejecting non-scalar, duplicate and unknown keys.
std::map<std::string, Entry> read_entries(const std::string& file, const YAML::Node& mapping, std::string_view context,
                                          std::span<const std::string_view> valid_keys) {
  std::map<std::string, Entry> entries;
  for (const auto& pair : mapping) {
    const YAML::Node key = pair.first;
    if (!key.IsScalar()) {
      throw InputError(position_of(file, key), fmt::format("a key in {} must be a plain name", context));
    }
    const std::string& name = key.Scalar();
    if (std::find(valid_keys.begin(), valid_keys.end(), name) == valid_keys.end()) {
      throw InputError(position_of(file, key),
                       unknown_choice_message("key", name, fmt::format("in {}", context), valid_keys));
    }
    const auto [where, inserted] = entries.emplace(name, Entry{key, pair.second});
    if (!inserted) {
      throw InputError(position_of(file, key), fmt::format("'{}' is given twice in {} (first at line {})", name,
                                                            context, position_of(file, where->second.key).line));
    }
  }
  return entries;
}

const Entry* find_entry(const std::map<std::string, Entry>& entries, const std::string& key) {
  const auto found = entries.find(key);
  return found == entries.end() ? nullptr : &found->second;
}

const Entry& require_entry(const std::map<std::string, Entry>& entries, const std::string& key,
                           const SourcePosition& parent_at, std::string_view hint) {
  const Entry* const entry = find_entry(entries, key);
  if (entry == nullptr) {
    throw InputError(parent_at, fmt::format("missing key '{}' in solution: {}", key, hint));
  }
  return *entry;
}

std::string scalar_text(const std::string& file, const Entry& entry, std::string_view expected) {
  if (entry.value.IsNull()) {
    throw InputError(position_of(file, entry.key), fmt::format("'{}' needs a value: {}", entry.key.Scalar(), expected));
  }
  if (!entry.value.IsScalar()) {
    throw InputError(position_of(file, entry.value),
                     fmt::format("'{}' must be a single value, not a list or mapping: {}", entry.key.Scalar(), expected));
  }
  return entry.value.Scalar();
}

// A dimensional quantity with an explicit unit, converted to si_unit.
double read_quantity(const std::string& file, const Entry& entry, const UnitConverter& units, std::string_view si_unit,
                     std::string_view example, std::string_view why_unit_needed) {
  const std::string key = entry.key.Scalar();
  const std::string text = scalar_text(file, entry, fmt::format("a quantity with a unit, e.g. '{}'", example));
  const SourcePosition at = position_of(file, entry.value);
  try {
    const QuantityText quantity = split_quantity(text);
    if (quantity.unit.empty()) {
      throw InputError(at, fmt::format("{} '{}' needs a unit, e.g. '{}': {}", key, text, example, why_unit_needed));
    }
    return units.convert(quantity.value, quantity.unit, si_unit);
  } catch (const QuantityError& error) {
    throw InputError(at, fmt::format("{} '{}': {} (expected a quantity convertible to {}, e.g. '{}')", key, text,
                                     error.what(), si_unit, example));
  }
}

template <typename Kind, std::size_t N>
Kind read_choice(const std::string& file, const Entry& entry, const std::array<std::string_view, N>& names,
                 const std::array<Kind, N>& kinds) {
  const std::string key = entry.key.Scalar();
  const std::string text = scalar_text(file, entry, fmt::format("one of {}", list_choices(names)));
  for (std::size_t i = 0; i < N; ++i) {
    if (names[i] == text) {
      return kinds[i];
    }
  }
  throw InputError(position_of(file, entry.value), unknown_choice_message(key, text, "", names));
}

// The SI unit the numbers of a basis are in, which a unit written beside an amount must match.
std::string_view basis_unit(AmountBasis basis) {
  switch (basis) {
    case AmountBasis::molality: return "mol/kg";
    case AmountBasis::moles: return "mol";
    case AmountBasis::mass_fraction: return "1";
  }
  return "1";
}

double read_amount(const std::string& file, const YAML::Node& key, const YAML::Node& value, AmountBasis basis,
                   const UnitConverter& units) {
  const std::string& formula = key.Scalar();
  if (!value.IsScalar()) {
    throw InputError(position_of(file, value.IsNull() ? key : value),
                     fmt::format("the amount of {} must be a number", formula));
  }
  const std::string& text = value.Scalar();
  const SourcePosition at = position_of(file, value);
  QuantityText quantity;
  try {
    quantity = split_quantity(text);
  } catch (const QuantityError&) {
    throw InputError(at, fmt::format("the amount of {} must be a number, not '{}'", formula, text));
  }
  double amount = quantity.value;
  if (!quantity.unit.empty()) {
    // A unit is optional; when written, it must fit the basis ("50 mmol/kg" for molality, "2 %"
    // for mass fraction).
    try {
      amount = units.convert(quantity.value, quantity.unit, basis_unit(basis));
    } catch (const QuantityError& error) {
      throw InputError(at, fmt::format("the amount of {} '{}': {} (amounts_as: {})", formula, text, error.what(),
                                       to_string(basis)));
    }
  }
  if (amount < 0.0) {
    throw InputError(at, fmt::format("the amount of {} is negative ({}); amounts must be zero or more", formula, text));
  }
  return amount;
}

std::vector<ComponentEntry> read_components(const std::string& file, const Entry& entry, AmountBasis basis,
                                            const UnitConverter& units) {
  if (!entry.value.IsMap() || entry.value.size() == 0) {
    throw InputError(position_of(file, entry.value.IsNull() ? entry.key : entry.value),
                     "'components' must be a mapping of formula to amount, e.g. 'NaCl: 0.1'");
  }
  std::vector<ComponentEntry> components;
  std::map<std::string, int> first_line;
  for (const auto& pair : entry.value) {
    const YAML::Node key = pair.first;
    if (!key.IsScalar() || key.Scalar().empty()) {
      throw InputError(position_of(file, key), "a component must be named by its formula, e.g. 'H2SO4'");
    }
    const SourcePosition key_at = position_of(file, key);
    const auto [previous, inserted] = first_line.emplace(key.Scalar(), key_at.line);
    if (!inserted) {
      throw InputError(key_at, fmt::format("component {} is listed twice (first at line {})", key.Scalar(),
                                           previous->second));
    }
    components.push_back(ComponentEntry{key.Scalar(), read_amount(file, key, pair.second, basis, units), key_at,
                                        position_of(file, pair.second)});
  }
  return components;
}

YAML::Node load_yaml(const std::string& text, const std::string& file) {
  try {
    return YAML::Load(text);
  } catch (const YAML::ParserException& error) {
    throw InputError(position_of(file, error.mark), fmt::format("invalid YAML: {}", error.msg));
  }
}

}  // namespace

std::string_view to_string(AmountBasis basis) noexcept {
  switch (basis) {
    case AmountBasis::molality: return "molality";
    case AmountBasis::moles: return "moles";
    case AmountBasis::mass_fraction: return "mass_fraction";
  }
  return "?";
}

std::string_view to_string(thermo::ActivityModelKind kind) noexcept {
  switch (kind) {
    case thermo::ActivityModelKind::davies: return "davies";
    case thermo::ActivityModelKind::b_dot: return "b-dot";
    case thermo::ActivityModelKind::ideal: return "ideal";
    case thermo::ActivityModelKind::pitzer: return "pitzer";
  }
  return "?";
}

SolutionInput read_solution_file(const std::string& file, const UnitConverter& units) {
  std::ifstream stream(file);
  if (!stream) {
    throw InputError(SourcePosition{file, 0, 0}, "cannot open the file");
  }
  std::ostringstream text;
  text << stream.rdbuf();
  return parse_solution(text.str(), file, units);
}

SolutionInput parse_solution(const std::string& text, const std::string& file, const UnitConverter& units) {
  const YAML::Node document = load_yaml(text, file);
  const SourcePosition file_start{file, 1, 1};
  if (!document.IsMap()) {
    throw InputError(document.IsNull() ? file_start : position_of(file, document),
                     "expected a mapping with the key 'solution' at the top of the file");
  }
  const auto top = read_entries(file, document, "the file", top_level_keys);
  const Entry* const solution_entry = find_entry(top, "solution");
  if (solution_entry == nullptr) {
    throw InputError(file_start, "missing key 'solution'");
  }
  SolutionInput input;
  input.file = file;
  input.solution_at = position_of(file, solution_entry->key);
  if (!solution_entry->value.IsMap()) {
    throw InputError(input.solution_at, "'solution' must be a mapping of keys such as 'temperature' and 'components'");
  }
  const auto entries = read_entries(file, solution_entry->value, "solution", solution_keys);

  if (const Entry* const name = find_entry(entries, "name")) {
    input.name = scalar_text(file, *name, "a label for the report");
  }

  // The temperature is given, or found from the enthalpy: one of the two, never both.
  if (const Entry* const enthalpy = find_entry(entries, "enthalpy")) {
    if (find_entry(entries, "temperature") != nullptr) {
      throw InputError(position_of(file, enthalpy->key),
                       "give 'temperature' or 'enthalpy', not both: with an enthalpy the temperature is the answer");
    }
    input.enthalpy = read_quantity(file, *enthalpy, units, "J", "-15.87 MJ", "an enthalpy needs its unit (J, kJ, MJ)");
    input.enthalpy_at = position_of(file, enthalpy->value);
    input.temperature_at = input.enthalpy_at;
  } else {
    const Entry& temperature = require_entry(entries, "temperature", input.solution_at,
                                             "give it with a unit, e.g. '25 degC' (or give 'enthalpy' instead)");
    input.temperature = read_quantity(file, temperature, units, "K", "25 degC",
                                      "a bare number could mean kelvin or degrees Celsius");
    input.temperature_at = position_of(file, temperature.value);
    if (input.temperature <= 0.0) {
      throw InputError(input.temperature_at, "temperature is at or below absolute zero");
    }
  }

  if (const Entry* const pressure = find_entry(entries, "pressure")) {
    input.pressure = read_quantity(file, *pressure, units, "Pa", "101.325 kPa",
                                   "a bare number could mean Pa, kPa, bar or atm");
    input.pressure_at = position_of(file, pressure->value);
    if (input.pressure <= 0.0) {
      throw InputError(input.pressure_at, "pressure must be an absolute pressure above zero");
    }
  } else {
    input.pressure = thermo::constants::standard_atmosphere;  // default: 1 atm, exact by definition
    input.pressure_at = input.solution_at;
  }

  if (const Entry* const model = find_entry(entries, "activity_model")) {
    input.activity_model = read_choice(
        file, *model, activity_model_names,
        std::array{thermo::ActivityModelKind::davies, thermo::ActivityModelKind::b_dot, thermo::ActivityModelKind::ideal,
                   thermo::ActivityModelKind::pitzer});
  }

  const Entry& basis = require_entry(entries, "amounts_as", input.solution_at,
                                     "say what the numbers mean: molality, moles or mass_fraction");
  input.basis = read_choice(file, basis, basis_names,
                            std::array{AmountBasis::molality, AmountBasis::moles, AmountBasis::mass_fraction});

  if (const Entry* const water = find_entry(entries, "water_mass")) {
    if (input.basis != AmountBasis::molality) {
      throw InputError(position_of(file, water->key),
                       fmt::format("'water_mass' applies only to amounts_as: molality; with {} {}", to_string(input.basis),
                                   input.basis == AmountBasis::moles ? "list H2O in components (mol)"
                                                                     : "water is the remainder or listed as H2O"));
    }
    input.water_mass = read_quantity(file, *water, units, "kg", "1 kg", "the mass of water needs its unit");
    if (*input.water_mass <= 0.0) {
      throw InputError(position_of(file, water->value), "water_mass must be above zero");
    }
  }

  const Entry& components = require_entry(entries, "components", input.solution_at,
                                          "list each formula with its amount, e.g. 'NaCl: 0.1'");
  input.components_at = position_of(file, components.key);
  input.components = read_components(file, components, input.basis, units);

  if (const Entry* const solids = find_entry(entries, "may_precipitate")) {
    if (solids->value.IsScalar() && solids->value.Scalar() == "all") {
      input.all_solids = true;
    } else if (solids->value.IsSequence()) {
      for (const auto& item : solids->value) {
        if (!item.IsScalar()) throw InputError(position_of(file, item), "each solid is named, e.g. 'gypsum'");
        input.solids.push_back(PhaseEntry{item.Scalar(), 0.0, position_of(file, item)});
      }
    } else {
      throw InputError(position_of(file, solids->value.IsNull() ? solids->key : solids->value),
                       "'may_precipitate' is 'all' or a list of solids, e.g. [gypsum, calcite]");
    }
  }
  if (const Entry* const open = find_entry(entries, "open_to")) {
    if (!open->value.IsMap() || open->value.size() == 0) {
      throw InputError(position_of(file, open->value.IsNull() ? open->key : open->value),
                       "'open_to' maps each gas to its partial pressure, e.g. 'CO2(g): 40 Pa'");
    }
    for (const auto& pair : open->value) {
      const Entry gas{pair.first, pair.second};
      const double pressure = read_quantity(file, gas, units, "Pa", "40 Pa", "a partial pressure needs its unit");
      if (!(pressure > 0.0)) throw InputError(position_of(file, pair.second), "a partial pressure must be above zero");
      input.open_gases.push_back(PhaseEntry{pair.first.Scalar(), pressure, position_of(file, pair.first)});
    }
  }
  if (const Entry* const age = find_entry(entries, "precipitates")) {
    const std::string value = age->value.IsScalar() ? age->value.Scalar() : std::string();
    if (value == "fresh") {
      input.precipitates = thermo::PrecipitateAge::fresh;
    } else if (value == "aged") {
      input.precipitates = thermo::PrecipitateAge::aged;
    } else {
      throw InputError(position_of(file, age->value.IsNull() ? age->key : age->value),
                       "'precipitates' is fresh (amorphous, freshly precipitated solids) or aged (crystalline forms)");
    }
  }
  if (const Entry* const gas = find_entry(entries, "gas_phase")) {
    bool value = false;
    if (!gas->value.IsScalar() || !YAML::convert<bool>::decode(gas->value, value)) {
      throw InputError(position_of(file, gas->value.IsNull() ? gas->key : gas->value), "'gas_phase' is true or false");
    }
    input.gas_phase = value;
  }
  return input;
}

}  // namespace protonflow::host
