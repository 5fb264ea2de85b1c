#include "expectations.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <fstream>
#include <sstream>

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include "nearest_name.hpp"

namespace protonflow::host {
namespace {

constexpr std::array<std::string_view, 8> kind_keys{"default", "temperature", "pressure", "flow",
                                                    "mass_flow", "pH",         "results",  "series"};

SourcePosition position_of(const std::string& file, const YAML::Node& node) {
  const YAML::Mark mark = node.Mark();
  if (mark.is_null()) return {file, 0, 0};
  return {file, mark.line + 1, mark.column + 1};
}

std::string default_tolerances_block() {
  return "tolerances:\n"
         "  # A value passes if |actual - expected| <= max(absolute, relative * |expected|). The most\n"
         "  # specific entry wins, field by field: a path (streams.NAME, streams.NAME.temperature_K,\n"
         "  # units.NAME.results.RESULT, units.NAME.series.SERIES, ...), then a kind (temperature,\n"
         "  # pressure, flow, mass_flow, pH, results, series), then default. An absolute tolerance may carry a unit: {absolute: 0.01 K}.\n"
         "  default: {relative: 1e-6, absolute: 1e-12}\n";
}

class ExpectationReader {
 public:
  ExpectationReader(std::string file, const QuantityReader& quantities) : file_(std::move(file)), quantities_(quantities) {}

  Expectations read() {
    std::ifstream stream(file_);
    if (!stream) {
      throw InputError({file_, 0, 0}, "cannot open the expectations file; record it first with 'protonflow check "
                                      "FLOWSHEET --expect FILE --write-expect'");
    }
    std::ostringstream buffer;
    buffer << stream.rdbuf();
    const std::string text = buffer.str();
    YAML::Node document;
    try {
      document = YAML::Load(text);
    } catch (const YAML::ParserException& error) {
      throw InputError({file_, error.mark.line + 1, error.mark.column + 1}, fmt::format("invalid YAML: {}", error.msg));
    }
    if (!document.IsMap()) throw InputError({file_, 1, 1}, "expected a mapping with 'tolerances', 'streams' and 'units'");
    Expectations expectations;
    expectations.file = file_;
    try {
      read_document(document, text, expectations);
    } catch (const YAML::Exception& error) {
      throw InputError({file_, error.mark.line + 1, error.mark.column + 1}, fmt::format("cannot read this: {}", error.msg));
    }
    return expectations;
  }

 private:
  SourcePosition at(const YAML::Node& node) const { return position_of(file_, node); }

  double number(const YAML::Node& node, const std::string& path) const {
    if (!node.IsScalar()) throw InputError(at(node), fmt::format("{} must be a number", path));
    try {
      return node.as<double>();
    } catch (const YAML::Exception&) {
      throw InputError(at(node), fmt::format("{} must be a number, not '{}'", path, node.Scalar()));
    }
  }

  void add(Expectations& expectations, const std::string& path, const YAML::Node& node) const {
    expectations.values.push_back({path, number(node, path), at(node), {}});
  }

  void read_tolerances(const YAML::Node& node, Expectations& expectations) const {
    if (!node.IsMap()) throw InputError(at(node), "'tolerances' must be a mapping, e.g. 'default: {relative: 1e-6}'");
    for (const auto& pair : node) {
      const std::string key = pair.first.Scalar();
      const bool path = key.starts_with("streams.") || key.starts_with("units.");
      if (!path && std::ranges::find(kind_keys, key) == kind_keys.end()) {
        const auto suggestion = nearest_name(key, kind_keys);
        throw InputError(at(pair.first),
                         fmt::format("unknown tolerance key '{}'; {}", key,
                                     suggestion ? fmt::format("did you mean '{}'?", *suggestion)
                                                : fmt::format("expected {}, or a path such as streams.NAME or "
                                                              "units.NAME.results.RESULT",
                                                              list_choices(kind_keys))));
      }
      if (!pair.second.IsMap()) {
        throw InputError(at(pair.second), fmt::format("tolerance '{}' must be a mapping such as {{relative: 1e-6, "
                                                      "absolute: 0.01 K}}",
                                                      key));
      }
      ToleranceEntry entry;
      entry.at = at(pair.first);
      for (const auto& field : pair.second) {
        const std::string name = field.first.Scalar();
        if (name == "relative") {
          entry.relative = number(field.second, fmt::format("tolerance '{}' relative", key));
          if (*entry.relative < 0.0) throw InputError(at(field.second), "a relative tolerance must be zero or more");
        } else if (name == "absolute") {
          if (!field.second.IsScalar()) throw InputError(at(field.second), "an absolute tolerance must be a number");
          try {
            const QuantityText written = split_quantity(field.second.Scalar());
            entry.absolute = written.value;
            entry.absolute_unit = written.unit;
          } catch (const QuantityError&) {
            throw InputError(at(field.second), fmt::format("an absolute tolerance must be a number, with a unit if "
                                                           "need be, not '{}'",
                                                           field.second.Scalar()));
          }
          if (*entry.absolute < 0.0) throw InputError(at(field.second), "an absolute tolerance must be zero or more");
        } else {
          throw InputError(at(field.first), fmt::format("unknown key '{}' in tolerance '{}'; expected 'relative' or "
                                                        "'absolute'",
                                                        name, key));
        }
      }
      expectations.tolerances[key] = entry;
    }
  }

  void read_document(const YAML::Node& document, const std::string& text, Expectations& expectations) const {
    std::vector<int> top_lines;  // line (0-based) of every top-level key, to cut the tolerances block out
    for (const auto& pair : document) top_lines.push_back(pair.first.Mark().line);
    for (const auto& pair : document) {
      const std::string key = pair.first.Scalar();
      if (key == "tolerances") {
        read_tolerances(pair.second, expectations);
        const int first = pair.first.Mark().line;
        int end = -1;
        for (const int line : top_lines) {
          if (line > first && (end < 0 || line < end)) end = line;
        }
        std::istringstream lines(text);
        std::string line;
        for (int n = 0; std::getline(lines, line); ++n) {
          if (n >= first && (end < 0 || n < end)) expectations.tolerances_text += line + "\n";
        }
      } else if (key == "streams") {
        if (!pair.second.IsMap()) throw InputError(at(pair.second), "'streams' must be a mapping");
        for (const auto& stream : pair.second) read_stream(stream.first.Scalar(), stream.second, expectations);
      } else if (key == "units") {
        if (!pair.second.IsMap()) throw InputError(at(pair.second), "'units' must be a mapping");
        for (const auto& unit : pair.second) read_unit(unit.first.Scalar(), unit.second, expectations);
      }
      // Everything else (flowsheet, components, recycle, ...) records how the results came about; it is not compared.
    }
  }

  void read_stream(const std::string& name, const YAML::Node& node, Expectations& expectations) const {
    if (!node.IsMap()) throw InputError(at(node), fmt::format("stream '{}' must be a mapping", name));
    const std::string base = "streams." + name;
    for (const auto& pair : node) {
      const std::string key = pair.first.Scalar();
      if (key == "temperature_K" || key == "pressure_Pa" || key == "molar_flow_mol_per_s" ||
          key == "mass_flow_kg_per_s" || key == "pH") {
        add(expectations, base + "." + key, pair.second);
      } else if (key == "flows_mol_per_s") {
        if (!pair.second.IsMap()) throw InputError(at(pair.second), "flows_mol_per_s must map phases to flows");
        for (const auto& phase : pair.second) {
          if (!phase.second.IsMap()) throw InputError(at(phase.second), "a phase must map components to flows");
          for (const auto& component : phase.second) {
            add(expectations,
                fmt::format("{}.flows_mol_per_s.{}.{}", base, phase.first.Scalar(), component.first.Scalar()),
                component.second);
          }
        }
      }
    }
  }

  void read_unit(const std::string& name, const YAML::Node& node, Expectations& expectations) const {
    if (!node.IsMap()) throw InputError(at(node), fmt::format("unit '{}' must be a mapping", name));
    const std::string base = "units." + name;
    if (const YAML::Node results = node["results"]; results && results.IsMap()) {
      for (const auto& result : results) {
        const std::string path = fmt::format("{}.results.{}", base, result.first.Scalar());
        if (!result.second.IsMap() || !result.second["value"]) {
          throw InputError(at(result.second), fmt::format("{} must be a mapping with 'value'", path));
        }
        add(expectations, path, result.second["value"]);
      }
    }
    if (const YAML::Node series = node["series"]; series) {
      if (!series.IsMap()) throw InputError(at(series), "'series' must map each series to its points");
      for (const auto& one : series) {
        const std::string path = fmt::format("{}.series.{}", base, one.first.Scalar());
        const YAML::Node points = one.second.IsMap() ? one.second["points"] : YAML::Node();
        if (!points || !points.IsSequence()) throw InputError(at(one.second), fmt::format("{} must have a list 'points'", path));
        expectations.values.push_back({path + ".points", static_cast<double>(points.size()), at(points), {}});
        for (std::size_t i = 0; i < points.size(); ++i) {
          const YAML::Node point = points[i];
          if (!point.IsSequence() || point.size() != 2) {
            throw InputError(at(point), fmt::format("point {} of {} must be a pair [x, y]", i, path));
          }
          add(expectations, fmt::format("{}.x.{}", path, i), point[0]);
          add(expectations, fmt::format("{}.y.{}", path, i), point[1]);
        }
      }
    }
    if (const YAML::Node warnings = node["warnings"]; warnings) {
      if (!warnings.IsSequence()) throw InputError(at(warnings), "'warnings' must be a list");
      ExpectedValue value{base + ".warnings", static_cast<double>(warnings.size()), at(warnings), {}};
      for (const YAML::Node& warning : warnings) value.texts.push_back(warning.Scalar());
      expectations.values.push_back(std::move(value));
    }
  }

  std::string file_;
  const QuantityReader& quantities_;
};

// The entries that apply to a path, most specific first: the path and its prefixes (down to
// streams.NAME or units.NAME), the kind, default.
std::vector<const ToleranceEntry*> applicable(const Expectations& expected, const ResultQuantity& quantity) {
  std::vector<const ToleranceEntry*> entries;
  std::string path = quantity.path;
  while (std::ranges::count(path, '.') >= 1) {
    if (const auto found = expected.tolerances.find(path); found != expected.tolerances.end()) entries.push_back(&found->second);
    path = path.substr(0, path.rfind('.'));
  }
  if (const auto found = expected.tolerances.find(to_string(quantity.kind)); found != expected.tolerances.end()) {
    entries.push_back(&found->second);
  }
  if (const auto found = expected.tolerances.find("default"); found != expected.tolerances.end()) {
    entries.push_back(&found->second);
  }
  return entries;
}

std::string show(double value) { return fmt::format("{:.10g}", value); }

}  // namespace

Expectations read_expectations(const std::string& file, const QuantityReader& quantities) {
  return ExpectationReader(file, quantities).read();
}

Comparison compare(const Expectations& expected, const std::vector<ResultQuantity>& actual,
                   const QuantityReader& quantities) {
  Comparison comparison;
  std::map<std::string, const ResultQuantity*, std::less<>> by_path;
  for (const ResultQuantity& quantity : actual) by_path.emplace(quantity.path, &quantity);
  std::map<std::string, bool, std::less<>> seen;
  for (const ExpectedValue& value : expected.values) {
    seen[value.path] = true;
    ++comparison.compared;
    const auto found = by_path.find(value.path);
    if (found == by_path.end()) {
      comparison.differences.push_back({value.path, show(value.value), "-", "", "",
                                        "missing from the results (the flowsheet changed? record again with "
                                        "--write-expect)"});
      continue;
    }
    const ResultQuantity& quantity = *found->second;
    if (quantity.kind == QuantityClass::warnings) {
      if (quantity.value != value.value) {
        std::string note;
        for (const std::string& text : quantity.texts) {
          if (std::ranges::find(value.texts, text) == value.texts.end()) note += (note.empty() ? "new: " : "; ") + text;
        }
        comparison.differences.push_back({value.path, fmt::format("{} warnings", value.value),
                                          fmt::format("{} warnings", quantity.value), "", "exact", note});
      } else {
        comparison.matched.push_back(value.path);
      }
      continue;
    }
    double relative = default_relative_tolerance;
    double absolute = default_absolute_tolerance;
    bool relative_set = false;
    bool absolute_set = false;
    for (const ToleranceEntry* entry : applicable(expected, quantity)) {
      if (!relative_set && entry->relative) {
        relative = *entry->relative;
        relative_set = true;
      }
      if (!absolute_set && entry->absolute) {
        absolute = *entry->absolute;
        if (!entry->absolute_unit.empty()) {
          try {
            absolute = quantities.difference_to_si(*entry->absolute, entry->absolute_unit, quantity.unit);
          } catch (const QuantityError& error) {
            throw InputError(entry->at, fmt::format("the absolute tolerance in '{}' cannot apply to {} ({}): {}",
                                                    entry->absolute_unit, quantity.path, quantity.unit, error.what()));
          }
        }
        absolute_set = true;
      }
    }
    const double allowed = std::max(absolute, relative * std::abs(value.value));
    const bool both_nan = std::isnan(value.value) && std::isnan(quantity.value);
    const double difference = quantity.value - value.value;
    if (!both_nan && !(std::abs(difference) <= allowed)) {
      comparison.differences.push_back({value.path, show(value.value), show(quantity.value),
                                        std::isfinite(difference) ? fmt::format("{:.3g}", difference) : "-",
                                        fmt::format("{:.3g}", allowed), ""});
    } else {
      comparison.matched.push_back(value.path);
    }
  }
  for (const ResultQuantity& quantity : actual) {
    if (!seen.contains(quantity.path)) {
      comparison.differences.push_back({quantity.path, "-", show(quantity.value), "", "",
                                        "not in the expectations (record again with --write-expect)"});
    }
  }
  return comparison;
}

std::string expectations_yaml(const SolvedFlowsheet& solved, const std::string& tolerances_text) {
  std::string text = fmt::format("# Expected results of {}, recorded by protonflow check --write-expect.\n"
                                 "# Edit the tolerances as needed; record the values again with --write-expect (the\n"
                                 "# tolerances block is kept as it is).\n",
                                 solved.flowsheet.input.file);
  text += tolerances_text.empty() ? default_tolerances_block() : tolerances_text;
  if (!text.ends_with('\n')) text += '\n';
  return text + results_yaml(solved, {});
}

std::string differences_table(const Comparison& comparison) {
  std::size_t path_width = std::string_view("quantity").size();
  for (const Difference& d : comparison.differences) path_width = std::max(path_width, d.path.size());
  std::string out = fmt::format("{:<{}}  {:>17}  {:>17}  {:>10}  {:>10}\n", "quantity", path_width, "expected", "actual",
                                "difference", "allowed");
  for (const Difference& d : comparison.differences) {
    out += fmt::format("{:<{}}  {:>17}  {:>17}  {:>10}  {:>10}{}\n", d.path, path_width, d.expected, d.actual,
                       d.difference, d.allowed, d.note.empty() ? "" : "  " + d.note);
  }
  return out;
}

}  // namespace protonflow::host
