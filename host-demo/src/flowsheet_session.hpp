// One flowsheet made ready to solve: the file read, the species data and the unit modules loaded,
// the flowsheet bound and planned, its units created. The order is chosen so that each error is
// found where it is cheapest and points at its cause: YAML first, then species, then modules.
#pragma once

#include <functional>
#include <iosfwd>
#include <memory>
#include <stdexcept>
#include <string>
#include <vector>

#include "flowsheet_commands.hpp"
#include "flowsheet_model.hpp"
#include "flowsheet_solver.hpp"
#include "module_search.hpp"
#include "protonflow/thermo/database.hpp"
#include "species_data.hpp"
#include "quantity.hpp"

namespace protonflow::host {

// A failure during the solve, placed in the flowsheet: where, what, the exit code, and details
// (a recycle's history) to print after the message.
class FlowsheetFailure : public std::runtime_error {
 public:
  FlowsheetFailure(SourcePosition where, const std::string& message, int exit_code, std::string details = {})
      : std::runtime_error(message), where_(std::move(where)), exit_code_(exit_code), details_(std::move(details)) {}
  const SourcePosition& where() const noexcept { return where_; }
  int exit_code() const noexcept { return exit_code_; }
  const std::string& details() const noexcept { return details_; }

 private:
  SourcePosition where_;
  int exit_code_;
  std::string details_;
};

class FlowsheetSession {
 public:
  explicit FlowsheetSession(const FlowsheetOptions& options);

  // Solves; throws FlowsheetFailure naming the unit or the recycle that failed.
  FlowsheetSolution solve();

  const UnitConverter& units() const noexcept { return *units_; }
  const thermo::Database& database() const noexcept { return *database_; }
  const UnitCatalog& catalog() const noexcept { return catalog_; }
  const Flowsheet& flowsheet() const noexcept { return flowsheet_; }
  const SolveOrder& order() const noexcept { return order_; }
  // Warnings about the flowsheet itself (an estimate that is not a tear stream, ...), with positions.
  const std::vector<std::string>& notes() const noexcept { return notes_; }

 private:
  void check_unconnected_outlets(const FlowsheetSolution& solution) const;

  std::unique_ptr<UnitConverter> units_;  // first: everything below converts with it
  std::shared_ptr<const thermo::Database> database_;
  UnitCatalog catalog_;
  Flowsheet flowsheet_;
  SolveOrder order_;
  std::vector<unit_host::Instance> instances_;
  std::vector<std::string> notes_;
};

// Runs work, turning every exception into a diagnostic on err and its exit code: InputError at
// its position (1), FlowsheetFailure at its position with its own code (a unit's failure: 1, 2 or
// 4; a recycle that did not converge, with its history: 2), anything else as an unexpected error (4).
int report_errors(const std::string& file, std::ostream& err, const std::function<int()>& work) noexcept;

// Prints every unit's warnings to err, each at the unit's position in the flowsheet, so that a
// user who sends the report to a file still sees them.
void print_unit_warnings(const Flowsheet& flowsheet, const FlowsheetSolution& solution, std::ostream& err);

}  // namespace protonflow::host
