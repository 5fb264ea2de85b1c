// What `protonflow run` prints for people: the recycle's convergence, a stream table and every
// unit's results and warnings. The YAML (flowsheet_results.hpp) is what programs read.
#pragma once

#include <string>

#include "flowsheet_results.hpp"

namespace protonflow::host {

// The whole report: a heading, the recycle summary, the stream table, the units.
std::string flowsheet_report(const SolvedFlowsheet& solved);

// One line per stream: name, from, to, T (°C), P (kPa, absolute), flow (kg/h and mol/s), pH of the
// aqueous phase, phase split and main components (mass %).
// One series as a small table of x and y with their units (every point up to 21, else 21 of them).
std::string series_table(const unit_host::SeriesInfo& info, const unit_host::SeriesValues& values);

std::string stream_table(const SolvedFlowsheet& solved);

// Each unit's results with their units, then its warnings, each on a line of its own.
std::string unit_report(const SolvedFlowsheet& solved);

// The history of a recycle: iteration, largest relative change, where.
std::string recycle_history(const RecycleReport& report);

}  // namespace protonflow::host
