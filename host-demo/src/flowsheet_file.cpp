#include "flowsheet_file.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <fstream>
#include <map>
#include <optional>
#include <span>
#include <sstream>

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include "nearest_name.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/formula.hpp"
#include "protonflow/thermo/water_properties.hpp"

namespace protonflow::host {
namespace {

constexpr std::array<std::string_view, 7> top_level_keys{"name",    "components", "solids", "gauge_reference",
                                                          "streams", "units",      "solver"};
constexpr std::array<std::string_view, 6> stream_keys{"temperature", "pressure", "aqueous", "gas", "solids", "estimate"};
constexpr std::array<std::string_view, 5> phase_keys{"flow", "flows", "basis", "composition", "density"};
constexpr std::array<std::string_view, 3> unit_keys{"type", "parameters", "ports"};
constexpr std::array<std::string_view, 5> solver_keys{"tolerance", "max_iterations", "acceleration_depth", "damping",
                                                      "tear_streams"};
constexpr std::array<std::string_view, 6> basis_names{"mass_fraction", "mole_fraction",      "volume_fraction",
                                                      "molality",      "molarity",           "mass_concentration"};
constexpr std::array<CompositionBasis, 6> bases{CompositionBasis::mass_fraction, CompositionBasis::mole_fraction,
                                               CompositionBasis::volume_fraction, CompositionBasis::molality,
                                               CompositionBasis::molarity, CompositionBasis::mass_concentration};

// Kell's water density, the default for per-volume compositions, holds over 0–150 °C (water_properties.hpp).
constexpr double kell_minimum_temperature = 273.15;  // K
constexpr double kell_maximum_temperature = 423.15;  // K

SourcePosition position_of(const std::string& file, const YAML::Mark& mark) {
  if (mark.is_null()) return SourcePosition{file, 0, 0};
  return SourcePosition{file, mark.line + 1, mark.column + 1};  // yaml-cpp counts from 0
}

SourcePosition position_of(const std::string& file, const YAML::Node& node) { return position_of(file, node.Mark()); }

struct Entry {
  YAML::Node key;
  YAML::Node value;
};

// A mapping read in file order, with its keys checked.
using Entries = std::vector<std::pair<std::string, Entry>>;

std::string unknown_message(std::string_view what, std::string_view given, std::string_view context,
                            std::span<const std::string_view> choices) {
  const std::string unknown = fmt::format("unknown {} '{}'{}{}", what, given, context.empty() ? "" : " ", context);
  if (const auto suggestion = nearest_name(given, choices)) return fmt::format("{}; did you mean '{}'?", unknown, *suggestion);
  return fmt::format("{}; expected {}", unknown, list_choices(choices));
}

class Reader {
 public:
  Reader(std::string file, const UnitConverter& units) : file_(std::move(file)), units_(&units), quantities_(units) {}

  FlowsheetInput read(const YAML::Node& document);

 private:
  SourcePosition at(const YAML::Node& node) const { return position_of(file_, node); }

  // The entries of a mapping; duplicate keys and (with valid_keys) unknown ones are errors.
  Entries entries(const YAML::Node& mapping, std::string_view context, std::span<const std::string_view> valid_keys,
                  bool check_keys = true) const {
    Entries result;
    std::map<std::string, int> first_line;
    for (const auto& pair : mapping) {
      const YAML::Node key = pair.first;
      if (!key.IsScalar() || key.Scalar().empty()) {
        throw InputError(at(key), fmt::format("a key in {} must be a plain name", context));
      }
      const std::string& name = key.Scalar();
      if (check_keys && std::ranges::find(valid_keys, name) == valid_keys.end()) {
        throw InputError(at(key), unknown_message("key", name, fmt::format("in {}", context), valid_keys));
      }
      const auto [previous, inserted] = first_line.emplace(name, at(key).line);
      if (!inserted) {
        throw InputError(at(key), fmt::format("'{}' is given twice in {} (first at line {})", name, context,
                                              previous->second));
      }
      result.emplace_back(name, Entry{key, pair.second});
    }
    return result;
  }

  static const Entry* find(const Entries& entries, std::string_view key) {
    const auto found = std::ranges::find(entries, key, &Entries::value_type::first);
    return found == entries.end() ? nullptr : &found->second;
  }

  const Entry& require(const Entries& entries, std::string_view key, const SourcePosition& parent,
                       std::string_view context, std::string_view hint) const {
    const Entry* entry = find(entries, key);
    if (entry == nullptr) throw InputError(parent, fmt::format("missing key '{}' in {}: {}", key, context, hint));
    return *entry;
  }

  const YAML::Node& mapping(const Entry& entry, std::string_view what) const {
    if (!entry.value.IsMap()) {
      throw InputError(at(entry.value.IsNull() ? entry.key : entry.value),
                       fmt::format("'{}' must be a mapping: {}", entry.key.Scalar(), what));
    }
    return entry.value;
  }

  std::string scalar(const Entry& entry, std::string_view expected) const {
    if (entry.value.IsNull()) {
      throw InputError(at(entry.key), fmt::format("'{}' needs a value: {}", entry.key.Scalar(), expected));
    }
    if (!entry.value.IsScalar()) {
      throw InputError(at(entry.value), fmt::format("'{}' must be a single value, not a list or mapping: {}",
                                                    entry.key.Scalar(), expected));
    }
    return entry.value.Scalar();
  }

  // A quantity that must carry its unit, converted to si_unit.
  double quantity(const Entry& entry, std::string_view si_unit, std::string_view example, std::string_view why) const {
    const std::string key = entry.key.Scalar();
    const std::string text = scalar(entry, fmt::format("a quantity with a unit, e.g. '{}'", example));
    const SourcePosition where = at(entry.value);
    QuantityText written;
    try {
      written = split_quantity(text);
    } catch (const QuantityError&) {
      throw InputError(where, fmt::format("{} '{}' must be a number with a unit, e.g. '{}'", key, text, example));
    }
    if (written.unit.empty()) {
      throw InputError(where, fmt::format("{} '{}' needs a unit, e.g. '{}': {}", key, text, example, why));
    }
    try {
      return quantities_.to_si(written, si_unit);
    } catch (const QuantityError& error) {
      throw InputError(where, fmt::format("{} '{}': {} (expected a quantity convertible to {}, e.g. '{}')", key, text,
                                          error.what(), si_unit, example));
    }
  }

  std::string name_of(const YAML::Node& key, std::string_view what) const {
    if (!key.IsScalar() || !valid_name(key.Scalar())) {
      throw InputError(at(key), fmt::format("{} name '{}' may use only letters, digits, '_' and '-'", what,
                                            key.IsScalar() ? key.Scalar() : std::string("?")));
    }
    return key.Scalar();
  }

  double molar_mass(const std::string& formula, const SourcePosition& where) const {
    // Water by the value the equilibrium solver uses, so a stream means the same mass everywhere.
    if (formula == "H2O") return thermo::constants::water_molar_mass;  // kg/mol, IAPWS-95
    try {
      const thermo::Formula parsed = thermo::parse_formula(formula);
      if (parsed.charge != 0) {
        throw InputError(where, fmt::format("component {} is charged; components are neutral compounds such as NaCl "
                                            "or H2SO4 (ions follow from them)",
                                            formula));
      }
      const double mass = thermo::molar_mass(parsed);
      if (!(mass > 0.0) || !std::isfinite(mass)) throw InputError(where, fmt::format("{} has no mass", formula));
      return mass;
    } catch (const thermo::ThermoError& error) {
      throw InputError(where, fmt::format("bad formula: {}", error.what()));
    }
  }

  std::vector<NamedAt> name_list(const Entry& entry, std::string_view what) const;
  void read_solver(const Entry& entry, SolverInput& solver) const;
  StreamInput read_stream(const YAML::Node& key, const YAML::Node& value) const;
  PhaseInput read_phase(const Entry& entry, PhaseKind kind, const std::string& solid, const StreamInput& stream) const;
  void read_component_flows(const Entry& entry, PhaseInput& phase) const;
  CompositionItem read_item(const YAML::Node& key, const YAML::Node& value, CompositionBasis basis, PhaseKind kind) const;
  UnitInput read_unit(const YAML::Node& key, const YAML::Node& value) const;

  std::string file_;
  const UnitConverter* units_;
  QuantityReader quantities_;
};

std::vector<NamedAt> Reader::name_list(const Entry& entry, std::string_view what) const {
  if (!entry.value.IsSequence()) {
    throw InputError(at(entry.value.IsNull() ? entry.key : entry.value),
                     fmt::format("'{}' must be a list of {}, e.g. [a, b]", entry.key.Scalar(), what));
  }
  std::vector<NamedAt> names;
  for (const YAML::Node& item : entry.value) {
    if (!item.IsScalar() || item.Scalar().empty()) {
      throw InputError(at(item), fmt::format("each entry of '{}' must be a name", entry.key.Scalar()));
    }
    const auto previous = std::ranges::find(names, item.Scalar(), &NamedAt::name);
    if (previous != names.end()) {
      throw InputError(at(item), fmt::format("'{}' is listed twice in '{}' (first at line {})", item.Scalar(),
                                             entry.key.Scalar(), previous->at.line));
    }
    names.push_back({item.Scalar(), at(item)});
  }
  return names;
}

void Reader::read_solver(const Entry& entry, SolverInput& solver) const {
  solver.at = at(entry.key);
  const auto items = entries(mapping(entry, "tolerance, max_iterations, acceleration_depth, damping, tear_streams"),
                             "solver", solver_keys);
  const auto number = [&](const Entry& e, double low, double high, bool integral) {
    const std::string text = scalar(e, "a number");
    double value = 0.0;
    try {
      const QuantityText q = split_quantity(text);
      if (!q.unit.empty()) throw QuantityError("has a unit");
      value = q.value;
    } catch (const QuantityError&) {
      throw InputError(at(e.value), fmt::format("{} must be a plain number, not '{}'", e.key.Scalar(), text));
    }
    if (!(value >= low && value <= high) || (integral && value != std::floor(value))) {
      throw InputError(at(e.value), fmt::format("{} is {}; it must be {} from {:g} to {:g}", e.key.Scalar(), text,
                                                integral ? "a whole number" : "a number", low, high));
    }
    return value;
  };
  if (const Entry* e = find(items, "tolerance")) {
    solver.tolerance = number(*e, 1e-15, 0.1, false);
    if (!(solver.tolerance > 0.0)) throw InputError(at(e->value), "tolerance must be above zero");
  }
  if (const Entry* e = find(items, "max_iterations")) solver.max_iterations = static_cast<long>(number(*e, 1, 100000, true));
  if (const Entry* e = find(items, "acceleration_depth")) {
    solver.acceleration_depth = static_cast<long>(number(*e, 0, 50, true));
  }
  if (const Entry* e = find(items, "damping")) {
    solver.damping = number(*e, 0.0, 1.0, false);
    if (!(solver.damping > 0.0)) throw InputError(at(e->value), "damping must be above zero (1 means none)");
  }
  if (const Entry* e = find(items, "tear_streams")) solver.tear_streams = name_list(*e, "stream names");
}

CompositionItem Reader::read_item(const YAML::Node& key, const YAML::Node& value, CompositionBasis basis,
                                  PhaseKind kind) const {
  CompositionItem item;
  item.formula = key.Scalar();
  item.molar_mass = molar_mass(item.formula, at(key));
  if (!value.IsScalar()) {
    throw InputError(at(value.IsNull() ? key : value),
                     fmt::format("the amount of {} must be a number{}", item.formula,
                                 basis == CompositionBasis::mass_fraction || basis == CompositionBasis::mole_fraction ||
                                         basis == CompositionBasis::volume_fraction
                                     ? " or 'balance'"
                                     : ""));
  }
  const std::string& text = value.Scalar();
  const SourcePosition where = at(value);
  if (text == "balance") {
    item.balance = true;
    return item;
  }
  QuantityText written;
  try {
    written = split_quantity(text);
  } catch (const QuantityError&) {
    throw InputError(where, fmt::format("the amount of {} must be a number, not '{}'", item.formula, text));
  }
  // The SI unit of each basis, and what a bare number means in it.
  std::string_view si_unit = "1";
  double bare_factor = 1.0;
  switch (basis) {
    case CompositionBasis::molality: si_unit = "mol/kg"; break;
    case CompositionBasis::molarity:
      si_unit = "mol/m3";
      bare_factor = 1e3;  // a bare number is mol/L: 1 mol/L = 1000 mol/m³
      break;
    case CompositionBasis::mass_concentration:
      si_unit = "kg/m3";
      bare_factor = 1e-3;  // a bare number is mg/L: 1 mg/L = 1e-3 kg/m³
      break;
    default: break;
  }
  const bool volume_unit = written.unit.find("ppmv") != std::string::npos || written.unit.find("ppbv") != std::string::npos;
  if (volume_unit && !(kind == PhaseKind::gas && basis != CompositionBasis::mass_fraction)) {
    throw InputError(where, fmt::format("the amount of {} '{}': ppmv and ppbv are parts by volume of a gas; {}",
                                        item.formula, text,
                                        kind == PhaseKind::gas ? "with basis mass_fraction write ppm (by mass), or use "
                                                                 "basis volume_fraction"
                                                               : "this phase is not a gas"));
  }
  if (written.unit.empty()) {
    item.value = written.value * bare_factor;
  } else {
    try {
      item.value = quantities_.to_si(written, si_unit);
    } catch (const QuantityError& error) {
      throw InputError(where, fmt::format("the amount of {} '{}': {} (basis {} takes amounts convertible to {})",
                                          item.formula, text, error.what(), to_string(basis), si_unit));
    }
  }
  if (item.value < 0.0) {
    throw InputError(where, fmt::format("the amount of {} is negative ({}); amounts must be zero or more", item.formula, text));
  }
  return item;
}

void Reader::read_component_flows(const Entry& entry, PhaseInput& phase) const {
  const YAML::Node& map = mapping(entry, "formula to flow, e.g. 'H2O: 2 kg/s'");
  if (map.size() == 0) throw InputError(at(entry.key), "'flows' lists no component");
  std::map<std::string, int> first_line;
  for (const auto& pair : map) {
    const YAML::Node key = pair.first;
    if (!key.IsScalar() || key.Scalar().empty()) throw InputError(at(key), "a component must be named by its formula");
    const std::string formula = key.Scalar();
    if (const auto [previous, inserted] = first_line.emplace(formula, at(key).line); !inserted) {
      throw InputError(at(key), fmt::format("component {} is listed twice (first at line {})", formula, previous->second));
    }
    const double mass = molar_mass(formula, at(key));
    const Entry item{key, pair.second};
    const std::string text = scalar(item, "a flow with its unit, e.g. '2 kg/s' or '10 mol/s'");
    const SourcePosition where = at(pair.second);
    QuantityText written;
    try {
      written = split_quantity(text);
    } catch (const QuantityError&) {
      throw InputError(where, fmt::format("the flow of {} must be a number with a unit, not '{}'", formula, text));
    }
    if (written.unit.empty()) {
      throw InputError(where, fmt::format("the flow of {} '{}' needs a unit, e.g. '{} kmol/h' or '{} kg/h'", formula,
                                          text, written.value, written.value));
    }
    if (written.value < 0.0) {
      throw InputError(where, fmt::format("the flow of {} is negative ({}); flows must be zero or more", formula, text));
    }
    double flow = 0.0;
    if (QuantityReader::kind_of(written.unit) == QuantityKind::normal_volume && phase.kind != PhaseKind::gas) {
      throw InputError(where, fmt::format("the flow of {} '{}': a normal volume is a gas flow, and this is the {} "
                                          "phase",
                                          formula, text, phase.kind == PhaseKind::aqueous ? "aqueous" : "solid"));
    }
    if (quantities_.convertible(written.unit, "mol/s")) {
      flow = quantities_.to_si(written, "mol/s");
    } else if (quantities_.convertible(written.unit, "kg/s")) {
      flow = quantities_.to_si(written, "kg/s") / mass;
    } else {
      throw InputError(where, fmt::format("the flow of {} '{}': '{}' is neither a molar flow (mol/s, kmol/h) nor a "
                                          "mass flow (kg/s, t/h){}",
                                          formula, text, written.unit,
                                          phase.kind == PhaseKind::gas ? " nor a normal-volume flow (Nm3/h)" : ""));
    }
    phase.flows.push_back({formula, flow});
    phase.flow_at.push_back(at(key));
  }
}

PhaseInput Reader::read_phase(const Entry& entry, PhaseKind kind, const std::string& solid,
                              const StreamInput& stream) const {
  PhaseInput phase;
  phase.kind = kind;
  phase.solid = solid;
  phase.at = at(entry.key);
  const std::string context =
      kind == PhaseKind::solid ? fmt::format("solid '{}' of stream '{}'", solid, stream.name)
                               : fmt::format("the {} phase of stream '{}'", to_string(kind), stream.name);
  const auto items = entries(mapping(entry, "its flow and composition (flow, basis, composition) or 'flows'"), context,
                             phase_keys);
  const Entry* flows = find(items, "flows");
  const Entry* flow = find(items, "flow");
  const Entry* basis = find(items, "basis");
  const Entry* composition = find(items, "composition");
  const Entry* density = find(items, "density");

  if (density != nullptr && kind != PhaseKind::aqueous) {
    throw InputError(at(density->key), "'density' applies to the aqueous phase only (a gas is ideal here)");
  }
  if (flows != nullptr) {
    for (const Entry* other : {flow, basis, composition}) {
      if (other != nullptr) {
        throw InputError(at(other->key), fmt::format("'{}' cannot be combined with 'flows': give either each "
                                                     "component's flow, or a total 'flow' with 'basis' and "
                                                     "'composition'",
                                                     other->key.Scalar()));
      }
    }
    phase.basis = CompositionBasis::flows;
    read_component_flows(*flows, phase);
    return phase;
  }
  if (flow == nullptr) {
    throw InputError(phase.at, fmt::format("missing key 'flow' in {}: give the total flow (e.g. '2 m3/h', '1.5 kg/s', "
                                           "'1200 Nm3/h'), or each component's flow under 'flows'",
                                           context));
  }
  const Entry& basis_entry =
      require(items, "basis", phase.at, context, fmt::format("what the composition's numbers mean: {}", list_choices(basis_names)));
  const std::string basis_text = scalar(basis_entry, fmt::format("one of {}", list_choices(basis_names)));
  const auto found = std::ranges::find(basis_names, basis_text);
  if (found == basis_names.end()) throw InputError(at(basis_entry.value), unknown_message("basis", basis_text, "", basis_names));
  phase.basis = bases[static_cast<std::size_t>(found - basis_names.begin())];
  const bool aqueous_only = phase.basis == CompositionBasis::molality || phase.basis == CompositionBasis::molarity ||
                            phase.basis == CompositionBasis::mass_concentration;
  if (aqueous_only && kind != PhaseKind::aqueous) {
    throw InputError(at(basis_entry.value), fmt::format("basis {} is for aqueous solutions (water is its solvent); "
                                                        "for the {} phase use mass_fraction or mole_fraction",
                                                        basis_text, to_string(kind)));
  }
  if (phase.basis == CompositionBasis::volume_fraction && kind != PhaseKind::gas) {
    throw InputError(at(basis_entry.value), "basis volume_fraction is for gases; use mass_fraction or mole_fraction");
  }

  PhaseComposition spec;
  spec.phase = kind;
  spec.basis = phase.basis;
  spec.temperature = stream.temperature;
  spec.pressure = stream.pressure;

  // The total flow: its dimension says whether it is molar, mass or volume.
  const std::string flow_text = scalar(*flow, "a flow with its unit, e.g. '2 m3/h'");
  const SourcePosition flow_at = at(flow->value);
  QuantityText written;
  try {
    written = split_quantity(flow_text);
  } catch (const QuantityError&) {
    throw InputError(flow_at, fmt::format("flow '{}' must be a number with a unit, e.g. '2 m3/h'", flow_text));
  }
  if (written.unit.empty()) {
    throw InputError(flow_at, fmt::format("flow '{}' needs a unit: a molar (kmol/h), mass (t/h) or volume (m3/h) flow",
                                          flow_text));
  }
  if (written.value < 0.0) {
    throw InputError(flow_at, fmt::format("flow is negative ({}); flows must be zero or more", flow_text));
  }
  const bool normal = QuantityReader::kind_of(written.unit) == QuantityKind::normal_volume;
  if (normal && kind != PhaseKind::gas) {
    throw InputError(flow_at, fmt::format("flow '{}': a normal volume (DIN 1343) measures a gas; give the {} phase's "
                                          "flow as a volume (m3/h), mass or molar flow",
                                          flow_text, to_string(kind)));
  }
  if (quantities_.convertible(written.unit, "mol/s")) {
    spec.total_kind = TotalFlowKind::molar;
    spec.total = quantities_.to_si(written, "mol/s");
  } else if (quantities_.convertible(written.unit, "kg/s")) {
    spec.total_kind = TotalFlowKind::mass;
    spec.total = quantities_.to_si(written, "kg/s");
  } else if (quantities_.convertible(written.unit, "m3/s")) {
    if (kind == PhaseKind::solid) {
      throw InputError(flow_at, "a solid's flow must be a mass or molar flow: its volume depends on how it is packed");
    }
    spec.total_kind = TotalFlowKind::volume;
    spec.total = quantities_.to_si(written, "m3/s");
  } else {
    throw InputError(flow_at, fmt::format("flow '{}': '{}' is not a molar (kmol/h), mass (t/h) or volume (m3/h) flow{}",
                                          flow_text, written.unit, kind == PhaseKind::gas ? " nor a normal volume flow (Nm3/h)" : ""));
  }

  // The density, where the arithmetic needs one.
  const bool needs_density = kind == PhaseKind::aqueous &&
                             (spec.total_kind == TotalFlowKind::volume || phase.basis == CompositionBasis::molarity ||
                              phase.basis == CompositionBasis::mass_concentration);
  if (density != nullptr) {
    spec.density = quantity(*density, "kg/m3", "1.05 kg/L", "a bare number could be kg/m³ or kg/L");
    if (!(spec.density > 0.0)) throw InputError(at(density->value), "density must be above zero");
  } else if (needs_density) {
    if (stream.temperature < kell_minimum_temperature || stream.temperature > kell_maximum_temperature) {
      throw InputError(phase.at, fmt::format("{} needs a density, and the default (pure water, Kell 1975) covers 0 "
                                             "to 150 °C only; give 'density'",
                                             context));
    }
    // Pure water at the stream's temperature (Kell 1975): right for dilute solutions; a
    // concentrated one must give its measured density.
    spec.density = thermo::water_density(stream.temperature);
  }

  const Entry& composition_entry =
      require(items, "composition", phase.at, context, "a mapping from formula to amount, e.g. 'H2SO4: 0.05'");
  const YAML::Node& components = mapping(composition_entry, "formula to amount, e.g. 'H2SO4: 0.05'");
  if (components.size() == 0) throw InputError(at(composition_entry.key), "'composition' lists no component");
  std::vector<SourcePosition> item_at;
  std::map<std::string, int> first_line;
  for (const auto& pair : components) {
    const YAML::Node key = pair.first;
    if (!key.IsScalar() || key.Scalar().empty()) throw InputError(at(key), "a component must be named by its formula");
    if (const auto [previous, inserted] = first_line.emplace(key.Scalar(), at(key).line); !inserted) {
      throw InputError(at(key), fmt::format("component {} is listed twice (first at line {})", key.Scalar(), previous->second));
    }
    spec.items.push_back(read_item(key, pair.second, phase.basis, kind));
    item_at.push_back(at(key));
  }
  try {
    phase.flows = component_flows(spec);
  } catch (const CompositionError& error) {
    const SourcePosition where = error.item() < item_at.size() ? item_at[error.item()] : at(composition_entry.key);
    throw InputError(where, fmt::format("{}: {}", context, error.what()));
  }
  phase.flow_at = item_at;
  phase.flow_at.resize(phase.flows.size(), phase.at);  // appended water: the phase's own key
  return phase;
}

StreamInput Reader::read_stream(const YAML::Node& key, const YAML::Node& value) const {
  StreamInput stream;
  stream.name = name_of(key, "a stream");
  stream.at = at(key);
  const std::string context = fmt::format("stream '{}'", stream.name);
  const Entry self{key, value};
  const auto items = entries(mapping(self, "temperature, pressure and its phases (aqueous, gas, solids)"), context,
                             stream_keys);
  const Entry& temperature =
      require(items, "temperature", stream.at, context, "give it with a unit, e.g. '25 degC'");
  stream.temperature = quantity(temperature, "K", "25 degC", "a bare number could mean kelvin or degrees Celsius");
  stream.temperature_at = at(temperature.value);
  if (!(stream.temperature > 0.0)) throw InputError(stream.temperature_at, "temperature is at or below absolute zero");
  const Entry& pressure = require(items, "pressure", stream.at, context,
                                  "give it absolute ('101.325 kPa', '2 bar') or gauge ('1 barg', '15 psig')");
  stream.pressure = quantity(pressure, "Pa", "1.5 barg", "a bare number could mean Pa, kPa, bar, absolute or gauge");
  stream.pressure_at = at(pressure.value);
  if (!(stream.pressure > 0.0)) {
    throw InputError(stream.pressure_at, fmt::format("the absolute pressure is {:.6g} Pa; it must be above zero (a "
                                                     "gauge pressure is measured from {:.6g} Pa)",
                                                     stream.pressure, quantities_.gauge_reference()));
  }
  if (const Entry* estimate = find(items, "estimate")) {
    try {
      stream.estimate = estimate->value.as<bool>();
    } catch (const YAML::Exception&) {
      throw InputError(at(estimate->value.IsNull() ? estimate->key : estimate->value), "estimate must be true or false");
    }
  }
  if (const Entry* aqueous = find(items, "aqueous")) stream.phases.push_back(read_phase(*aqueous, PhaseKind::aqueous, "", stream));
  if (const Entry* gas = find(items, "gas")) stream.phases.push_back(read_phase(*gas, PhaseKind::gas, "", stream));
  if (const Entry* solids = find(items, "solids")) {
    const auto phases = entries(mapping(*solids, "solid phase name to its flow, e.g. 'gypsum: {flows: ...}'"),
                                fmt::format("the solids of stream '{}'", stream.name), {}, false);
    for (const auto& [name, entry] : phases) stream.phases.push_back(read_phase(entry, PhaseKind::solid, name, stream));
  }
  if (stream.phases.empty()) {
    throw InputError(stream.at, fmt::format("stream '{}' has no phase: give 'aqueous', 'gas' or 'solids'", stream.name));
  }
  return stream;
}

UnitInput Reader::read_unit(const YAML::Node& key, const YAML::Node& value) const {
  UnitInput unit;
  unit.name = name_of(key, "a unit");
  unit.at = at(key);
  const std::string context = fmt::format("unit '{}'", unit.name);
  const Entry self{key, value};
  const auto items = entries(mapping(self, "its type, parameters and ports"), context, unit_keys);
  const Entry& type = require(items, "type", unit.at, context, "the unit type, e.g. 'heater' (see 'protonflow units')");
  unit.type = scalar(type, "a unit type, e.g. 'heater'");
  unit.type_at = at(type.value);
  if (const Entry* parameters = find(items, "parameters")) {
    for (const auto& [name, entry] :
         entries(mapping(*parameters, "parameter name to value"), fmt::format("the parameters of unit '{}'", unit.name), {}, false)) {
      if (!entry.value.IsScalar()) {
        throw InputError(at(entry.value.IsNull() ? entry.key : entry.value),
                         fmt::format("parameter '{}' of unit '{}' needs a single value, e.g. '60 degC' or a name", name,
                                     unit.name));
      }
      unit.parameters.push_back({name, entry.value.Scalar(), entry.value.Tag() == "!", at(entry.key), at(entry.value)});
    }
  }
  const Entry& ports = require(items, "ports", unit.at, context, "a mapping from each port to a stream, e.g. 'feed: raw'");
  for (const auto& [name, entry] :
       entries(mapping(ports, "port name to stream name, e.g. 'feed: raw'"), fmt::format("the ports of unit '{}'", unit.name), {}, false)) {
    PortConnection connection{name, at(entry.key), {}, entry.value.IsSequence()};
    const YAML::Node& port_key = entry.key;  // clang (the fuzz build) cannot capture a structured binding
    const auto stream_name = [&](const YAML::Node& node) {
      if (!node.IsScalar()) {
        throw InputError(at(node.IsNull() ? port_key : node),
                         fmt::format("port '{}' of unit '{}' needs the name of a stream, or a list of names for a port "
                                     "that takes several, e.g. '[acid, water]'",
                                     connection.port, unit.name));
      }
      if (!valid_name(node.Scalar())) {
        throw InputError(at(node), fmt::format("stream name '{}' may use only letters, digits, '_' and '-'", node.Scalar()));
      }
      connection.streams.push_back({node.Scalar(), at(node)});
    };
    if (connection.list) {
      for (const YAML::Node& item : entry.value) stream_name(item);
    } else {
      stream_name(entry.value);
    }
    unit.ports.push_back(std::move(connection));
  }
  return unit;
}

FlowsheetInput Reader::read(const YAML::Node& document) {
  FlowsheetInput input;
  input.file = file_;
  const SourcePosition file_start{file_, 1, 1};
  if (!document.IsMap()) {
    throw InputError(document.IsNull() ? file_start : at(document),
                     "expected a mapping with the keys 'streams', 'units' and, if needed, 'solver'");
  }
  const auto top = entries(document, "the flowsheet", top_level_keys);
  input.solver.at = SourcePosition{file_, 0, 0};
  if (const Entry* name = find(top, "name")) input.name = scalar(*name, "a label for the reports");
  // The gauge reference first: stream pressures may be gauge pressures.
  if (const Entry* reference = find(top, "gauge_reference")) {
    const double pressure = quantity(*reference, "Pa", "101.325 kPa", "give the local atmospheric pressure with a unit");
    if (QuantityReader::kind_of(split_quantity(reference->value.Scalar()).unit) == QuantityKind::gauge) {
      throw InputError(at(reference->value), "gauge_reference must be an absolute pressure");
    }
    if (!(pressure > 0.0)) throw InputError(at(reference->value), "gauge_reference must be above zero");
    input.gauge_reference = pressure;
    quantities_ = QuantityReader(*units_, pressure);
  }
  if (const Entry* components = find(top, "components")) {
    input.components = name_list(*components, "formulas");
    for (const NamedAt& component : input.components) static_cast<void>(molar_mass(component.name, component.at));
  }
  if (const Entry* solids = find(top, "solids")) input.solids = name_list(*solids, "solid phase names");
  if (const Entry* streams = find(top, "streams")) {
    for (const auto& pair : mapping(*streams, "stream name to its state")) input.streams.push_back(read_stream(pair.first, pair.second));
    for (std::size_t i = 0; i < input.streams.size(); ++i) {
      for (std::size_t j = 0; j < i; ++j) {
        if (input.streams[i].name == input.streams[j].name) {
          throw InputError(input.streams[i].at, fmt::format("stream '{}' is given twice (first at line {})",
                                                            input.streams[i].name, input.streams[j].at.line));
        }
      }
    }
  }
  const Entry& units = require(top, "units", file_start, "the flowsheet", "the unit operations and how they connect");
  for (const auto& pair : mapping(units, "unit name to its type, parameters and ports")) {
    input.units.push_back(read_unit(pair.first, pair.second));
    const UnitInput& added = input.units.back();
    for (std::size_t j = 0; j + 1 < input.units.size(); ++j) {
      if (input.units[j].name == added.name) {
        throw InputError(added.at, fmt::format("unit '{}' is given twice (first at line {})", added.name, input.units[j].at.line));
      }
    }
  }
  if (input.units.empty()) throw InputError(at(units.key), "'units' lists no unit");
  if (const Entry* solver = find(top, "solver")) read_solver(*solver, input.solver);
  return input;
}

}  // namespace

bool valid_name(std::string_view name) noexcept {
  if (name.empty()) return false;
  return std::ranges::all_of(name, [](char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_' || c == '-';
  });
}

FlowsheetInput parse_flowsheet(const std::string& text, const std::string& file, const UnitConverter& units) {
  YAML::Node document;
  try {
    document = YAML::Load(text);
  } catch (const YAML::ParserException& error) {
    throw InputError(position_of(file, error.mark), fmt::format("invalid YAML: {}", error.msg));
  }
  try {
    return Reader(file, units).read(document);
  } catch (const YAML::Exception& error) {
    // A node yaml-cpp could not convert: still the user's input, so still an input error.
    throw InputError(position_of(file, error.mark), fmt::format("cannot read this: {}", error.msg));
  }
}

FlowsheetInput read_flowsheet_file(const std::string& file, const UnitConverter& units) {
  std::ifstream stream(file);
  if (!stream) throw InputError(SourcePosition{file, 0, 0}, "cannot open the flowsheet file");
  std::ostringstream text;
  text << stream.rdbuf();
  return parse_flowsheet(text.str(), file, units);
}

}  // namespace protonflow::host
