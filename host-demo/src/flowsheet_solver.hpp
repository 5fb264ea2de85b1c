// Solving a bound flowsheet, sequential-modular: units in order, each from its inlets to its
// outlets through the unit ABI; recycles closed through tear streams by converge_recycle.
#pragma once

#include <cstddef>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

#include <protonflow/unit_host.hpp>

#include "flowsheet_graph.hpp"
#include "flowsheet_model.hpp"
#include "recycle_solver.hpp"

namespace protonflow::host {

struct UnitOutcome {
  std::vector<double> results;        // of the last solve, in the descriptor's order
  std::vector<std::string> warnings;  // of the last solve
  std::vector<unit_host::SeriesValues> series;  // of the last solve, in the descriptor's order
  std::vector<double> solve_seconds;  // wall time of every solve of the run, in order
};

struct RecycleReport {
  std::vector<std::size_t> tears;  // stream indices
  long iterations = 0;
  double largest_relative_change = 0.0;  // at the last iteration
  std::string largest_change_at;         // which variable, in words
  std::vector<RecycleIteration> history;
  std::vector<std::string> variables;    // the name of every tear variable, for the history
  double closure = 0.0;  // largest relative change of the tears in the final, reporting pass
};

struct FlowsheetSolution {
  SolveOrder order;
  std::vector<unit_host::StreamState> streams;  // per stream of the flowsheet
  std::vector<UnitOutcome> units;               // per unit
  std::optional<RecycleReport> recycle;         // when there are tear streams
};

// A unit's solve returned an error status.
class UnitSolveFailure : public std::runtime_error {
 public:
  UnitSolveFailure(std::size_t unit, pfu_status status, const std::string& message, std::string when)
      : std::runtime_error(message), unit_(unit), status_(status), when_(std::move(when)) {}
  std::size_t unit() const noexcept { return unit_; }
  pfu_status status() const noexcept { return status_; }
  const std::string& when() const noexcept { return when_; }  // "in iteration 4 of the recycle", ...

 private:
  std::size_t unit_;
  pfu_status status_;
  std::string when_;
};

// The recycle did not converge: no result, but the history of how it went.
class RecycleFailure : public std::runtime_error {
 public:
  RecycleFailure(const std::string& message, RecycleReport report)
      : std::runtime_error(message), report_(std::move(report)) {}
  const RecycleReport& report() const noexcept { return report_; }

 private:
  RecycleReport report_;
};

// The solve order and tear streams of a flowsheet. Throws InputError when the user's tear streams
// leave a recycle closed.
SolveOrder plan_flowsheet(const Flowsheet& flowsheet);

// Solves every unit; instances are those of create_instances(flowsheet), in the same order.
// Throws UnitSolveFailure or RecycleFailure.
FlowsheetSolution solve_flowsheet(const Flowsheet& flowsheet, std::vector<unit_host::Instance>& instances,
                                  const SolveOrder& order);

}  // namespace protonflow::host
