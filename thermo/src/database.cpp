#include "protonflow/thermo/database.hpp"

#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdlib>
#include <fmt/format.h>
#include <set>
#include <unordered_map>

#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/formula.hpp"

namespace protonflow::thermo {

namespace {

// Reads one data file; every complaint carries the position of the node it is about.
class DataFileReader {
 public:
  // Reads the text of one file, reported under the file's name.
  DataFileReader(std::string file, const std::string& text) : file_(std::move(file)), text_(text) {}

  std::vector<Species> read() {
    try {
      return read_document();
    } catch (const YAML::ParserException& e) {
      throw DataError(file_, e.mark.line + 1, e.mark.column + 1, e.msg);
    } catch (const YAML::Exception& e) {
      // A node of the wrong kind where a name was expected (a list as a reaction's key, say).
      throw DataError(file_, e.mark.line + 1, e.mark.column + 1, e.msg);
    }
  }

 private:
  std::vector<Species> read_document() {
    const YAML::Node root = YAML::Load(text_);
    if (!root.IsMap() || !root["species"] || !root["species"].IsSequence())
      fail(root, "a data file holds one key, 'species', with a list of species");
    check_keys(root, {"species"});
    std::vector<Species> species;
    for (const auto& node : root["species"]) species.push_back(read_species(node));
    return species;
  }

  Species read_species(const YAML::Node& node) {
    if (!node.IsMap()) fail(node, "each species is a map of keys");
    check_keys(node, {"name", "formula", "phase", "basis", "ion_size_angstrom", "formation_enthalpy_kJ_mol",
                      "entropy_J_mol_K", "heat_capacity_J_mol_K", "reaction", "log10_K_298K", "temperature_function",
                      "temperature_range_K", "precipitate_age", "note"});
    Species s;
    s.file = file_;
    s.line = node.Mark().line + 1;
    s.name = scalar(node, "name");
    check_notation(node["name"], s.name);
    const std::string formula_text = node["formula"] ? scalar(node, "formula") : s.name;
    try {
      s.formula = parse_formula(formula_text);
    } catch (const ThermoError& e) {
      fail(node["formula"] ? node["formula"] : node["name"],
           fmt::format("{} (give an explicit 'formula' where the name is not one)", e.what()));
    }
    const std::string phase = node["phase"] ? scalar(node, "phase") : "aq";
    if (phase == "aq") {
      s.phase = Phase::aqueous;
    } else if (phase == "l") {
      s.phase = s.name == "H2O" ? Phase::solvent : Phase::liquid;
    } else if (phase == "s") {
      s.phase = Phase::solid;
    } else if (phase == "g") {
      s.phase = Phase::gas;
    } else {
      fail(node["phase"], fmt::format("phase '{}' is not one of: aq, l, s, g", phase));
    }
    s.is_basis = node["basis"] && boolean(node["basis"]);
    if (s.is_basis && (s.phase == Phase::solid || s.phase == Phase::gas))
      fail(node["basis"], "solids and gases are never basis species: give their formation reaction instead");
    if (node["ion_size_angstrom"]) s.ion_size_angstrom = sourced(node["ion_size_angstrom"], 1.0).value;
    if (node["formation_enthalpy_kJ_mol"]) s.formation_enthalpy = sourced(node["formation_enthalpy_kJ_mol"], 1e3);
    if (node["entropy_J_mol_K"]) s.entropy = sourced(node["entropy_J_mol_K"], 1.0);
    if (node["heat_capacity_J_mol_K"]) s.heat_capacity = sourced(node["heat_capacity_J_mol_K"], 1.0);
    if (node["temperature_range_K"]) read_range(node["temperature_range_K"], s);
    if (node["precipitate_age"]) {
      if (s.phase != Phase::solid) fail(node["precipitate_age"], "only a solid has a 'precipitate_age'");
      const std::string age = scalar(node, "precipitate_age");
      if (age == "fresh") {
        s.precipitate_age = PrecipitateAge::fresh;
      } else if (age == "aged") {
        s.precipitate_age = PrecipitateAge::aged;
      } else {
        fail(node["precipitate_age"], fmt::format("'precipitate_age' is fresh or aged, not '{}'", age));
      }
    }

    if (s.is_basis || s.phase == Phase::liquid) {
      for (const char* key : {"reaction", "log10_K_298K", "temperature_function"})
        if (node[key]) fail(node[key], fmt::format("a {} has no '{}'", s.is_basis ? "basis species" : "pure liquid", key));
      return s;
    }
    if (!node["reaction"] || !node["reaction"].IsMap() || node["reaction"].size() == 0)
      fail(node, fmt::format("'{}' is not a basis species, so it needs a 'reaction' from basis species", s.name));
    for (const auto& term : node["reaction"]) {
      const auto reactant = term.first.as<std::string>();
      check_notation(term.first, reactant);
      s.reaction.emplace_back(reactant, number(term.second));
    }
    read_log_k(node, s);
    return s;
  }

  void read_log_k(const YAML::Node& node, Species& s) {
    const YAML::Node function = node["temperature_function"];
    if (!function || !function.IsMap() || function.size() != 1)
      fail(function ? function : node,
           "'temperature_function' takes exactly one of: van_t_hoff, five_term_log10_K, water_ionization, water_vapour");
    const auto key = function.begin()->first.as<std::string>();
    const YAML::Node body = function.begin()->second;
    using Form = TemperatureFunction::Form;
    if (key == "five_term_log10_K") {
      read_five_term(body, s);
      if (node["log10_K_298K"]) s.log_k.log_k_reference = sourced(node["log10_K_298K"], 1.0).value;
      return;
    }
    if (key == "analytic")
      fail(function.begin()->first,
           "'analytic' with a list of coefficients is the older form: write 'five_term_log10_K' with the named "
           "terms constant, linear_per_K, reciprocal_K, log10_T and reciprocal_square_K2 (docs/species-data.md)");
    if (!node["log10_K_298K"]) fail(node, fmt::format("'{}' needs 'log10_K_298K', log10 K at 298.15 K", s.name));
    const SourcedValue log_k = sourced(node["log10_K_298K"], 1.0);
    s.log_k.log_k_reference = log_k.value;
    s.log_k_source = log_k.source;
    if (key == "van_t_hoff") {
      check_keys(body, {"reaction_enthalpy_kJ_mol", "note"});
      if (!body["reaction_enthalpy_kJ_mol"]) fail(body, "'van_t_hoff' needs 'reaction_enthalpy_kJ_mol'");
      s.log_k.form = Form::van_t_hoff;
      s.log_k.reaction_enthalpy = sourced(body["reaction_enthalpy_kJ_mol"], 1e3).value;
    } else if (key == "water_ionization") {
      s.log_k.form = Form::water_ionization;
    } else if (key == "water_vapour") {
      s.log_k.form = Form::water_vapour;
    } else {
      fail(function, fmt::format("unknown temperature function '{}' (van_t_hoff, five_term_log10_K, water_ionization, "
                                 "water_vapour)", key));
    }
  }

  // log10 K = constant + linear_per_K T + reciprocal_K / T + log10_T log10(T) + reciprocal_square_K2 / T²,
  // the five-term form of Plummer & Busenberg (1982) and Nordstrom et al. (1990); a term left out is 0.
  void read_five_term(const YAML::Node& body, Species& s) {
    static constexpr std::array<const char*, 5> terms{"constant", "linear_per_K", "reciprocal_K", "log10_T",
                                                      "reciprocal_square_K2"};
    check_keys(body, {"constant", "linear_per_K", "reciprocal_K", "log10_T", "reciprocal_square_K2", "source", "note"});
    bool any_term = false;
    for (std::size_t i = 0; i < terms.size(); ++i) {
      any_term = any_term || body[terms[i]];
      s.log_k.coefficients[i] = body[terms[i]] ? number(body[terms[i]]) : 0.0;
    }
    if (!any_term)
      fail(body, "'five_term_log10_K' needs at least one of constant, linear_per_K, reciprocal_K, log10_T, "
                 "reciprocal_square_K2");
    s.log_k.form = TemperatureFunction::Form::five_term;
    s.log_k_source = scalar(body, "source");
  }

  // A species name in the older notation ("Ca^2+", "CaSO4.2H2O") is refused with the name to write.
  void check_notation(const YAML::Node& node, const std::string& name) {
    if (const auto replacement = notation_replacement(name))
      fail(node, fmt::format("'{}' is written in the older notation: write '{}' (charge after '^', hydrate water "
                             "after '.'; docs/species-data.md)", name, *replacement));
  }

  void read_range(const YAML::Node& node, Species& s) {
    check_keys(node, {"min", "max", "source", "note"});
    if (!node["min"] || !node["max"] || !node["source"]) fail(node, "'temperature_range_K' needs min, max and source");
    s.minimum_temperature = number(node["min"]);
    s.maximum_temperature = number(node["max"]);
    if (!(s.minimum_temperature < s.maximum_temperature)) fail(node, "'min' must be below 'max'");
  }

  // {value: x, source: key}, value times the factor that makes it SI.
  SourcedValue sourced(const YAML::Node& node, double to_si) {
    if (!node.IsMap()) fail(node, "expected {value: ..., source: ...}");
    check_keys(node, {"value", "source", "note"});
    if (!node["value"] || !node["source"]) fail(node, "a data value needs both 'value' and 'source'");
    return {number(node["value"]) * to_si, scalar(node, "source")};
  }

  std::string scalar(const YAML::Node& parent, const char* key) {
    const YAML::Node node = parent[key];
    if (!node) fail(parent, fmt::format("missing '{}'", key));
    if (!node.IsScalar()) fail(node, fmt::format("'{}' must be a single value", key));
    return node.as<std::string>();
  }

  double number(const YAML::Node& node) {
    double value = 0.0;
    if (!node.IsScalar() || !YAML::convert<double>::decode(node, value) || !std::isfinite(value))
      fail(node, fmt::format("'{}' is not a number", node.IsScalar() ? node.Scalar() : std::string("(a list or map)")));
    return value;
  }

  bool boolean(const YAML::Node& node) {
    bool value = false;
    if (!node.IsScalar() || !YAML::convert<bool>::decode(node, value)) fail(node, "expected true or false");
    return value;
  }

  void check_keys(const YAML::Node& node, std::initializer_list<std::string_view> allowed) {
    if (!node.IsMap()) fail(node, "expected a map");
    for (const auto& entry : node) {
      const auto key = entry.first.as<std::string>();
      if (std::find(allowed.begin(), allowed.end(), key) != allowed.end()) continue;
      if (key == "log_k") fail(entry.first, "unknown key 'log_k': write 'log10_K_298K' (log10 K at 298.15 K)");
      fail(entry.first, fmt::format("unknown key '{}'", key));
    }
  }

  [[noreturn]] void fail(const YAML::Node& node, const std::string& what) const {
    const YAML::Mark mark = node.Mark();
    throw DataError(file_, mark.line + 1, mark.column + 1, what);
  }

  std::string file_;
  const std::string& text_;
};

// A reaction must conserve every element and the charge: that catches typing errors in the data.
void check_reaction_balance(const Database& database, const Species& s) {
  std::map<std::string, double> elements = s.formula.elements;
  double charge = s.formula.charge;
  for (const auto& [name, coefficient] : s.reaction) {
    const Species* basis = database.find(name);
    if (!basis) throw DataError(s.file, s.line, 1, fmt::format("'{}' reacts from unknown species '{}'", s.name, name));
    if (!basis->is_basis)
      throw DataError(s.file, s.line, 1,
                      fmt::format("'{}' reacts from '{}', which is not a basis species", s.name, name));
    for (const auto& [element, count] : basis->formula.elements) elements[element] -= coefficient * count;
    charge -= coefficient * basis->formula.charge;
  }
  for (const auto& [element, count] : elements)
    if (std::abs(count) > 1e-9)
      throw DataError(s.file, s.line, 1, fmt::format("the reaction for '{}' does not balance {}", s.name, element));
  if (std::abs(charge) > 1e-9)
    throw DataError(s.file, s.line, 1, fmt::format("the reaction for '{}' does not balance charge", s.name));
}

}  // namespace

const char* to_string(PrecipitateAge age) noexcept {
  switch (age) {
    case PrecipitateAge::fresh: return "fresh";
    case PrecipitateAge::aged: return "aged";
    case PrecipitateAge::any: return "any";
  }
  return "any";
}

Database::Database(std::vector<Species> species) : species_(std::move(species)) {}

const Species* Database::find(std::string_view name) const noexcept {
  for (const Species& s : species_)
    if (s.name == name) return &s;
  return nullptr;
}

std::size_t Database::index_of(std::string_view name) const {
  for (std::size_t i = 0; i < species_.size(); ++i)
    if (species_[i].name == name) return i;
  throw ThermoError(ErrorKind::unknown_species, fmt::format("unknown species '{}'", name));
}

namespace {

// The checks across files: unique names, reactions from basis species that balance, water's ions.
Database checked_database(std::vector<Species> all) {
  std::unordered_map<std::string, const Species*> seen;
  for (const Species& s : all) {
    const auto [it, fresh] = seen.emplace(s.name, &s);
    if (!fresh)
      throw DataError(s.file, s.line, 1,
                      fmt::format("species '{}' is defined twice (first at {}:{})", s.name, it->second->file, it->second->line));
  }
  Database database(std::move(all));
  for (const Species& s : database.species())
    if (!s.is_basis && s.phase != Phase::liquid) check_reaction_balance(database, s);
  if (!database.find("H2O") || !database.find("H^+") || !database.find("OH^-"))
    throw ThermoError(ErrorKind::bad_data, "the species data must define H2O, H^+ and OH^-");
  return database;
}

}  // namespace

Database load_database(const std::vector<DataText>& texts) {
  std::vector<Species> all;
  for (const DataText& text : texts) {
    for (Species& s : DataFileReader(text.file, text.text).read()) all.push_back(std::move(s));
  }
  return checked_database(std::move(all));
}

std::filesystem::path default_data_directory() {
  if (const char* override_dir = std::getenv("PROTONFLOW_DATA_DIR"); override_dir && *override_dir) return override_dir;
  return PROTONFLOW_DATA_DIR;
}

}  // namespace protonflow::thermo
