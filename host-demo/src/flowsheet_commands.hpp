// `protonflow run`, `protonflow check` and `protonflow units`: flowsheets on the unit modules
// found on the search path. Each command writes its report to out, diagnostics and warnings to err,
// and returns an exit code; none throws.
#pragma once

#include <filesystem>
#include <iosfwd>
#include <string>
#include <vector>

#include "speciate_command.hpp"  // exit_ok, exit_bad_input, exit_not_converged

namespace protonflow::host {

// Beyond speciate's codes (0 ok, 1 bad input, 2 not converged):
inline constexpr int exit_differences = 3;   // check: a result differs from its expectation
inline constexpr int exit_unit_fault = 4;    // a module failed in a way that is its own fault (internal error, ABI misuse)

struct FlowsheetOptions {
  std::string file;
  std::vector<std::string> unit_dirs;        // --unit-dir, in order
  std::filesystem::path data_directory;      // species data, for species checks and pH
};

struct RunOptions : FlowsheetOptions {
  std::string results_file;  // -o; empty: no results file
  std::string series_directory;  // --series-dir: one CSV per unit series, UNIT.SERIES.csv; empty: none
};

struct CheckOptions : FlowsheetOptions {
  std::string expect_file;
  bool write_expect = false;
  std::string junit_file;  // --junit: the comparison as a JUnit XML report; empty: none
};

struct UnitsOptions {
  std::vector<std::string> unit_dirs;
};

int run_flowsheet(const RunOptions& options, std::ostream& out, std::ostream& err) noexcept;
int check_flowsheet(const CheckOptions& options, std::ostream& out, std::ostream& err) noexcept;
int list_units(const UnitsOptions& options, std::ostream& out, std::ostream& err) noexcept;

}  // namespace protonflow::host
