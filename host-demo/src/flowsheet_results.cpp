#include "flowsheet_results.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>

#include <fmt/format.h>

namespace protonflow::host {
namespace {

bool plain_safe(std::string_view text) {
  if (text.empty()) return false;
  // Words YAML would read as something else, or a leading character with a meaning of its own.
  for (const std::string_view word : {"true", "false", "yes", "no", "on", "off", "null", "~", "y", "n"}) {
    if (text.size() == word.size() && std::equal(text.begin(), text.end(), word.begin(), [](char a, char b) {
          return std::tolower(static_cast<unsigned char>(a)) == b;
        })) {
      return false;
    }
  }
  if (!((text[0] >= 'A' && text[0] <= 'Z') || (text[0] >= 'a' && text[0] <= 'z'))) return false;
  return std::ranges::all_of(text, [](char c) {
    return (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '_' || c == '-' ||
           c == '(' || c == ')' || c == '.' || c == '+' || c == '^';
  });
}

std::string flows_key(const Flowsheet& flowsheet, std::size_t stream) {
  return fmt::format("streams.{}", flowsheet.streams[stream].name);
}

}  // namespace

std::string_view to_string(QuantityClass kind) noexcept {
  switch (kind) {
    case QuantityClass::temperature: return "temperature";
    case QuantityClass::pressure: return "pressure";
    case QuantityClass::flow: return "flow";
    case QuantityClass::mass_flow: return "mass_flow";
    case QuantityClass::ph: return "pH";
    case QuantityClass::result: return "results";
    case QuantityClass::warnings: return "warnings";
    case QuantityClass::series: return "series";
  }
  return "?";
}

std::string yaml_number(double value) {
  if (std::isnan(value)) return ".nan";
  if (std::isinf(value)) return value > 0 ? ".inf" : "-.inf";
  return fmt::format("{}", value);  // fmt writes the shortest text that reads back exactly
}

std::string yaml_string(std::string_view text) {
  if (plain_safe(text)) return std::string(text);
  std::string quoted = "\"";
  for (const char c : text) {
    switch (c) {
      case '"': quoted += "\\\""; break;
      case '\\': quoted += "\\\\"; break;
      case '\n': quoted += "\\n"; break;
      case '\t': quoted += "\\t"; break;
      default:
        if (static_cast<unsigned char>(c) < 0x20) {
          quoted += fmt::format("\\x{:02x}", static_cast<unsigned char>(c));
        } else {
          quoted += c;
        }
    }
  }
  return quoted + "\"";
}

std::string stream_source(const Flowsheet& flowsheet, std::size_t stream) {
  const StreamNode& node = flowsheet.streams[stream];
  return node.source_unit ? flowsheet.port_label(*node.source_unit, false, node.source_port) : "feed";
}

std::string stream_destination(const Flowsheet& flowsheet, std::size_t stream) {
  const StreamNode& node = flowsheet.streams[stream];
  return node.sink_unit ? flowsheet.port_label(*node.sink_unit, true, node.sink_port) : "product";
}

SolvedFlowsheet summarise(const Flowsheet& flowsheet, const FlowsheetSolution& solution, StreamAnalyser& analyser) {
  SolvedFlowsheet solved{flowsheet, solution, {}};
  for (const unit_host::StreamState& stream : solution.streams) solved.summaries.push_back(analyser.summarise(stream));
  return solved;
}

std::vector<ResultQuantity> flatten(const SolvedFlowsheet& solved) {
  const Flowsheet& flowsheet = solved.flowsheet;
  const unit_host::Slate& slate = flowsheet.slate;
  std::vector<ResultQuantity> quantities;
  for (std::size_t s = 0; s < flowsheet.streams.size(); ++s) {
    if (flowsheet.streams[s].unconnected) continue;
    const unit_host::StreamState& state = solved.solution.streams[s];
    const StreamSummary& summary = solved.summaries[s];
    const std::string base = flows_key(flowsheet, s);
    quantities.push_back({base + ".temperature_K", QuantityClass::temperature, state.temperature, "K", {}});
    quantities.push_back({base + ".pressure_Pa", QuantityClass::pressure, state.pressure, "Pa", {}});
    quantities.push_back({base + ".molar_flow_mol_per_s", QuantityClass::flow, summary.molar_flow, "mol/s", {}});
    quantities.push_back({base + ".mass_flow_kg_per_s", QuantityClass::mass_flow, summary.mass_flow, "kg/s", {}});
    if (summary.ph) quantities.push_back({base + ".pH", QuantityClass::ph, *summary.ph, "1", {}});
    for (std::size_t row = 0; row < slate.phase_count(); ++row) {
      for (std::size_t c = 0; c < slate.components.size(); ++c) {
        quantities.push_back({fmt::format("{}.flows_mol_per_s.{}.{}", base, phase_name(slate, row), slate.components[c]),
                              QuantityClass::flow, state.flows[row * slate.components.size() + c], "mol/s", {}});
      }
    }
  }
  for (std::size_t u = 0; u < flowsheet.units.size(); ++u) {
    const UnitNode& unit = flowsheet.units[u];
    const UnitOutcome& outcome = solved.solution.units[u];
    for (std::size_t r = 0; r < unit.info.results.size(); ++r) {
      const unit_host::ResultInfo& result = unit.info.results[r];
      quantities.push_back({fmt::format("units.{}.results.{}", unit.name, result.name), QuantityClass::result,
                            r < outcome.results.size() ? outcome.results[r] : std::nan(""), result.unit, {}});
    }
    quantities.push_back({fmt::format("units.{}.warnings", unit.name), QuantityClass::warnings,
                          static_cast<double>(outcome.warnings.size()), "1", outcome.warnings});
    for (std::size_t s = 0; s < unit.info.series.size() && s < outcome.series.size(); ++s) {
      const unit_host::SeriesInfo& info = unit.info.series[s];
      const unit_host::SeriesValues& values = outcome.series[s];
      const std::string base = fmt::format("units.{}.series.{}", unit.name, info.name);
      quantities.push_back({base + ".points", QuantityClass::series, static_cast<double>(values.x.size()), "1", {}});
      for (std::size_t i = 0; i < values.x.size(); ++i) {
        quantities.push_back({fmt::format("{}.x.{}", base, i), QuantityClass::series, values.x[i], info.x_unit, {}});
        quantities.push_back({fmt::format("{}.y.{}", base, i), QuantityClass::series, values.y[i], info.y_unit, {}});
      }
    }
  }
  return quantities;
}

std::string series_csv(const unit_host::SeriesInfo& info, const unit_host::SeriesValues& values) {
  std::string out = fmt::format("{} [{}],{} [{}]\n", info.x_name, info.x_unit, info.y_name, info.y_unit);
  for (std::size_t i = 0; i < values.x.size(); ++i) out += fmt::format("{},{}\n", values.x[i], values.y[i]);
  return out;
}

std::string results_yaml(const SolvedFlowsheet& solved, const std::vector<std::string>& header) {
  const Flowsheet& flowsheet = solved.flowsheet;
  const FlowsheetSolution& solution = solved.solution;
  const unit_host::Slate& slate = flowsheet.slate;
  std::string out;
  for (const std::string& line : header) out += fmt::format("#{}{}\n", line.empty() ? "" : " ", line);
  out += fmt::format("flowsheet: {}\n", yaml_string(flowsheet.input.file));
  if (!flowsheet.input.name.empty()) out += fmt::format("name: {}\n", yaml_string(flowsheet.input.name));
  const auto list = [](const std::vector<std::string>& items) {
    std::string text;
    for (const std::string& item : items) text += (text.empty() ? "" : ", ") + yaml_string(item);
    return "[" + text + "]";
  };
  out += fmt::format("components: {}\n", list(slate.components));
  out += fmt::format("solids: {}\n", list(slate.solids));
  std::vector<std::string> order;
  for (const std::size_t u : solution.order.sequence) order.push_back(flowsheet.units[u].name);
  out += fmt::format("solve_order: {}\n", list(order));
  if (solution.recycle) {
    const RecycleReport& recycle = *solution.recycle;
    std::vector<std::string> tears;
    for (const std::size_t s : recycle.tears) tears.push_back(flowsheet.streams[s].name);
    out += "recycle:\n";
    out += fmt::format("  tear_streams: {}\n", list(tears));
    out += fmt::format("  iterations: {}\n", recycle.iterations);
    out += fmt::format("  largest_relative_change: {}\n", yaml_number(recycle.largest_relative_change));
    out += fmt::format("  largest_change_at: {}\n", yaml_string(recycle.largest_change_at));
    out += fmt::format("  final_pass_change: {}\n", yaml_number(recycle.closure));
    out += "  history:\n";
    for (const RecycleIteration& step : recycle.history) {
      out += fmt::format("    - {{iteration: {}, largest_relative_change: {}, at: {}}}\n", step.iteration,
                         yaml_number(step.largest_relative_change), yaml_string(recycle.variables.at(step.variable)));
    }
  }
  out += "streams:\n";
  for (std::size_t s = 0; s < flowsheet.streams.size(); ++s) {
    if (flowsheet.streams[s].unconnected) continue;
    const unit_host::StreamState& state = solution.streams[s];
    const StreamSummary& summary = solved.summaries[s];
    out += fmt::format("  {}:\n", yaml_string(flowsheet.streams[s].name));
    out += fmt::format("    from: {}\n", yaml_string(stream_source(flowsheet, s)));
    out += fmt::format("    to: {}\n", yaml_string(stream_destination(flowsheet, s)));
    out += fmt::format("    temperature_K: {}\n", yaml_number(state.temperature));
    out += fmt::format("    pressure_Pa: {}\n", yaml_number(state.pressure));
    out += fmt::format("    molar_flow_mol_per_s: {}\n", yaml_number(summary.molar_flow));
    out += fmt::format("    mass_flow_kg_per_s: {}\n", yaml_number(summary.mass_flow));
    if (summary.ph) out += fmt::format("    pH: {}\n", yaml_number(*summary.ph));
    if (!summary.ph_note.empty()) out += fmt::format("    pH_note: {}\n", yaml_string(summary.ph_note));
    out += "    flows_mol_per_s:\n";
    for (std::size_t row = 0; row < slate.phase_count(); ++row) {
      out += fmt::format("      {}:\n", yaml_string(phase_name(slate, row)));
      for (std::size_t c = 0; c < slate.components.size(); ++c) {
        out += fmt::format("        {}: {}\n", yaml_string(slate.components[c]),
                           yaml_number(state.flows[row * slate.components.size() + c]));
      }
    }
  }
  out += "units:\n";
  for (std::size_t u = 0; u < flowsheet.units.size(); ++u) {
    const UnitNode& unit = flowsheet.units[u];
    const UnitOutcome& outcome = solution.units[u];
    out += fmt::format("  {}:\n", yaml_string(unit.name));
    out += fmt::format("    type: {}\n", yaml_string(unit.type));
    out += fmt::format("    module: {}\n", yaml_string(fmt::format("{} {}", unit.module.name(), unit.module.version())));
    out += unit.info.results.empty() ? "    results: {}\n" : "    results:\n";
    for (std::size_t r = 0; r < unit.info.results.size(); ++r) {
      const unit_host::ResultInfo& result = unit.info.results[r];
      out += fmt::format("      {}: {{value: {}, unit: {}}}\n", yaml_string(result.name),
                         yaml_number(r < outcome.results.size() ? outcome.results[r] : std::nan("")),
                         yaml_string(result.unit));
    }
    out += outcome.warnings.empty() ? "    warnings: []\n" : "    warnings:\n";
    for (const std::string& warning : outcome.warnings) out += fmt::format("      - {}\n", yaml_string(warning));
    if (unit.info.series.empty()) continue;
    out += "    series:\n";
    for (std::size_t s = 0; s < unit.info.series.size(); ++s) {
      const unit_host::SeriesInfo& info = unit.info.series[s];
      out += fmt::format("      {}:\n", yaml_string(info.name));
      out += fmt::format("        x: {{name: {}, unit: {}}}\n", yaml_string(info.x_name), yaml_string(info.x_unit));
      out += fmt::format("        y: {{name: {}, unit: {}}}\n", yaml_string(info.y_name), yaml_string(info.y_unit));
      const unit_host::SeriesValues none;
      const unit_host::SeriesValues& values = s < outcome.series.size() ? outcome.series[s] : none;
      out += values.x.empty() ? "        points: []\n" : "        points:\n";
      for (std::size_t i = 0; i < values.x.size(); ++i) {
        out += fmt::format("          - [{}, {}]\n", yaml_number(values.x[i]), yaml_number(values.y[i]));
      }
    }
  }
  return out;
}

}  // namespace protonflow::host
