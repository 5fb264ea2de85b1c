#include "flowsheet_report.hpp"

#include <algorithm>
#include <cmath>

#include <fmt/format.h>

namespace protonflow::host {
namespace {

constexpr double celsius_offset = 273.15;  // K at 0 °C, by definition of the Celsius scale (SI Brochure)
constexpr double seconds_per_hour = 3600.0;

std::string short_phase(const unit_host::Slate& slate, std::size_t row) {
  if (row == PFU_AQUEOUS_ROW) return "aq";
  if (row == PFU_GAS_ROW) return "gas";
  return slate.solids[row - PFU_FIRST_SOLID_ROW];
}

std::string percent(double fraction) {
  const double value = 100.0 * fraction;
  if (value >= 99.95 && fraction < 1.0) return "99.9";  // never print 100 for what is not all
  if (value > 0.0 && value < 0.05) return "<0.1";
  return fmt::format("{:.1f}", value);
}

}  // namespace

std::string series_table(const unit_host::SeriesInfo& info, const unit_host::SeriesValues& values) {
  // Every point up to 21; beyond that 21 evenly spaced ones, the first and the last among them.
  constexpr std::size_t shown = 21;
  const std::size_t count = values.x.size();
  std::string out = fmt::format("  series {}: {} point{} ({})\n", info.name, count, count == 1 ? "" : "s", info.meaning);
  if (count == 0) return out;
  const std::string x_head = fmt::format("{} [{}]", info.x_name, info.x_unit);
  const std::string y_head = fmt::format("{} [{}]", info.y_name, info.y_unit);
  const std::size_t width = std::max<std::size_t>(x_head.size(), 12);
  out += fmt::format("    {:>{}}  {:>12}\n", x_head, width, y_head);
  const std::size_t rows = std::min(count, shown);
  for (std::size_t r = 0; r < rows; ++r) {
    const std::size_t i = rows == count ? r : r * (count - 1) / (rows - 1);
    out += fmt::format("    {:>{}.6g}  {:>12.6g}\n", values.x[i], width, values.y[i]);
  }
  if (rows < count) out += fmt::format("    ({} of {} points shown; all in the results file and --series-dir)\n", rows, count);
  return out;
}

std::string stream_table(const SolvedFlowsheet& solved) {
  const Flowsheet& flowsheet = solved.flowsheet;
  const unit_host::Slate& slate = flowsheet.slate;
  struct Row {
    std::vector<std::string> cells;
  };
  const std::vector<std::string> heading{"stream", "from", "to", "T/°C", "P/kPa", "kg/h", "mol/s", "pH",
                                         "phases (mass %)", "main components (mass %)"};
  std::vector<Row> rows;
  for (std::size_t s = 0; s < flowsheet.streams.size(); ++s) {
    if (flowsheet.streams[s].unconnected) continue;
    const unit_host::StreamState& state = solved.solution.streams[s];
    const StreamSummary& summary = solved.summaries[s];
    std::string phases;
    for (std::size_t row = 0; row < slate.phase_count(); ++row) {
      if (summary.phase_mass_flow[row] > 0.0) {
        phases += fmt::format("{}{} {}", phases.empty() ? "" : ", ", short_phase(slate, row),
                              percent(summary.phase_mass_flow[row] / summary.mass_flow));
      }
    }
    std::string components;
    for (const auto& [formula, fraction] : summary.main_components) {
      components += fmt::format("{}{} {}", components.empty() ? "" : ", ", formula, percent(fraction));
    }
    rows.push_back({{flowsheet.streams[s].name, stream_source(flowsheet, s), stream_destination(flowsheet, s),
                     fmt::format("{:.2f}", state.temperature - celsius_offset), fmt::format("{:.2f}", state.pressure / 1e3),
                     fmt::format("{:.4g}", summary.mass_flow * seconds_per_hour), fmt::format("{:.4g}", summary.molar_flow),
                     summary.ph ? fmt::format("{:.2f}", *summary.ph) : (summary.ph_note.empty() ? "" : "-"),
                     phases.empty() ? "(no flow)" : phases, components}});
  }
  std::vector<std::size_t> width(heading.size());
  // Width in characters, not bytes: "°" is two bytes of UTF-8.
  const auto length = [](const std::string& text) {
    return static_cast<std::size_t>(std::ranges::count_if(text, [](char c) { return (static_cast<unsigned char>(c) & 0xC0) != 0x80; }));
  };
  for (std::size_t i = 0; i < heading.size(); ++i) width[i] = length(heading[i]);
  for (const Row& row : rows) {
    for (std::size_t i = 0; i < row.cells.size(); ++i) width[i] = std::max(width[i], length(row.cells[i]));
  }
  const auto line = [&](const std::vector<std::string>& cells) {
    std::string text;
    for (std::size_t i = 0; i < cells.size(); ++i) {
      const std::size_t pad = width[i] - length(cells[i]);
      const bool numeric = i >= 3 && i <= 7;
      if (i > 0) text += "  ";
      text += numeric ? std::string(pad, ' ') + cells[i] : cells[i] + (i + 1 < cells.size() ? std::string(pad, ' ') : "");
    }
    return text + "\n";
  };
  std::string out = line(heading);
  for (const Row& row : rows) out += line(row.cells);
  std::string notes;
  for (std::size_t s = 0; s < flowsheet.streams.size(); ++s) {
    if (!flowsheet.streams[s].unconnected && !solved.summaries[s].ph_note.empty()) {
      notes += fmt::format("  no pH for stream '{}': {}\n", flowsheet.streams[s].name, solved.summaries[s].ph_note);
    }
  }
  return out + notes;
}

std::string unit_report(const SolvedFlowsheet& solved) {
  const Flowsheet& flowsheet = solved.flowsheet;
  std::string out;
  for (const std::size_t u : solved.solution.order.sequence) {
    const UnitNode& unit = flowsheet.units[u];
    const UnitOutcome& outcome = solved.solution.units[u];
    out += fmt::format("{} ({}, {} {})\n", unit.name, unit.type, unit.module.name(), unit.module.version());
    std::size_t width = 0;
    for (const auto& result : unit.info.results) width = std::max(width, result.name.size());
    for (std::size_t r = 0; r < unit.info.results.size(); ++r) {
      const unit_host::ResultInfo& result = unit.info.results[r];
      const double value = r < outcome.results.size() ? outcome.results[r] : std::nan("");
      out += fmt::format("  {:<{}}  {}{}   {}\n", result.name, width,
                         std::isnan(value) ? std::string("n/a") : fmt::format("{:.6g}", value),
                         std::isnan(value) || result.unit == "1" ? "" : " " + result.unit, result.meaning);
    }
    if (unit.info.results.empty()) out += "  (no results)\n";
    for (std::size_t s = 0; s < unit.info.series.size() && s < outcome.series.size(); ++s) {
      out += series_table(unit.info.series[s], outcome.series[s]);
    }
    // Warnings are printed once, where they belong: at the unit's line of the flowsheet.
    if (!outcome.warnings.empty()) {
      out += fmt::format("  {} warning{}: see {}:{}\n", outcome.warnings.size(), outcome.warnings.size() == 1 ? "" : "s",
                         unit.at.file, unit.at.line);
    }
  }
  return out;
}

std::string recycle_history(const RecycleReport& report) {
  std::string out = fmt::format("  {:>9}  {:>23}  {}\n", "iteration", "largest relative change", "at");
  for (const RecycleIteration& step : report.history) {
    out += fmt::format("  {:>9}  {:>23.3e}  {}\n", step.iteration, step.largest_relative_change,
                       step.variable < report.variables.size() ? report.variables[step.variable] : "?");
  }
  return out;
}

std::string flowsheet_report(const SolvedFlowsheet& solved) {
  const Flowsheet& flowsheet = solved.flowsheet;
  std::string out = fmt::format("Flowsheet {}{}\n", flowsheet.input.file,
                                flowsheet.input.name.empty() ? "" : fmt::format(" ({})", flowsheet.input.name));
  std::vector<std::string> order;
  for (const std::size_t u : solved.solution.order.sequence) order.push_back(flowsheet.units[u].name);
  out += fmt::format("Solve order: {}\n", fmt::join(order, " → "));
  if (const auto& recycle = solved.solution.recycle) {
    std::vector<std::string> tears;
    for (const std::size_t s : recycle->tears) tears.push_back(flowsheet.streams[s].name);
    out += fmt::format("Recycle: tear stream{} {}; converged in {} iterations (KINSOL fixed point, Anderson depth {}); "
                       "largest relative change {:.3g} at {}\n",
                       tears.size() == 1 ? "" : "s", fmt::join(tears, ", "), recycle->iterations,
                       flowsheet.input.solver.acceleration_depth, recycle->largest_relative_change,
                       recycle->largest_change_at);
  }
  out += "\nStreams\n";
  out += stream_table(solved);
  out += "\nUnits\n";
  out += unit_report(solved);
  return out;
}

}  // namespace protonflow::host
