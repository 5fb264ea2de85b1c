// The results of a solved flowsheet: every stream and unit result as a flat list of named
// quantities (what `check` compares), and the full results YAML (what `run -o` writes). Layout of
// the file: docs/flowsheet-format.md, "Results".
#pragma once

#include <string>
#include <vector>

#include "flowsheet_model.hpp"
#include "flowsheet_solver.hpp"
#include "stream_properties.hpp"

namespace protonflow::host {

// What kind of quantity a value is; tolerances can be set per kind.
enum class QuantityClass { temperature, pressure, flow, mass_flow, ph, result, warnings, series };

std::string_view to_string(QuantityClass kind) noexcept;

struct ResultQuantity {
  // "streams.feed.temperature_K", "units.heat.results.duty", "units.heat.warnings",
  // "units.mix.series.mixing_path.points", "units.mix.series.mixing_path.x.3" (0-based), ".y.3"
  std::string path;
  QuantityClass kind;
  double value;      // SI; for warnings, how many; for a series' points, how many
  std::string unit;  // UDUNITS-2 text of the SI unit; "1" if dimensionless
  std::vector<std::string> texts;  // for warnings: the lines themselves
};

struct SolvedFlowsheet {
  const Flowsheet& flowsheet;
  const FlowsheetSolution& solution;
  std::vector<StreamSummary> summaries;  // per stream
};

// Analyses every stream (pH, mass flows) for the reports.
SolvedFlowsheet summarise(const Flowsheet& flowsheet, const FlowsheetSolution& solution, StreamAnalyser& analyser);

// Every compared quantity, streams in flowsheet order, then units.
std::vector<ResultQuantity> flatten(const SolvedFlowsheet& solved);

// The results YAML. header: comment lines to put first (each without '#').
std::string results_yaml(const SolvedFlowsheet& solved, const std::vector<std::string>& header);

// The CSV text of one series of a unit: a header naming x and y with their SI units, then one
// line per point, numbers written to read back exactly.
std::string series_csv(const unit_host::SeriesInfo& info, const unit_host::SeriesValues& values);

// "from" and "to" of a stream: "feed", "product" or "unit.port".
std::string stream_source(const Flowsheet& flowsheet, std::size_t stream);
std::string stream_destination(const Flowsheet& flowsheet, std::size_t stream);

// A number as the shortest text that reads back to the same double; YAML's .nan and .inf.
std::string yaml_number(double value);
// A string as a YAML scalar: plain when that is safe, else double-quoted with escapes.
std::string yaml_string(std::string_view text);

}  // namespace protonflow::host
