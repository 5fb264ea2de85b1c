// Stored expectations for `protonflow check`: the results of a flowsheet as recorded once, with
// the tolerances a user allows, and the comparison of a fresh solve against them. Format:
// docs/flowsheet-format.md, "Checking results against expectations".
#pragma once

#include <map>
#include <optional>
#include <string>
#include <vector>

#include "flowsheet_quantity.hpp"
#include "flowsheet_results.hpp"
#include "input_error.hpp"

namespace protonflow::host {

// One entry of 'tolerances'; a field left out falls back to the next less specific entry.
struct ToleranceEntry {
  std::optional<double> relative;
  std::optional<double> absolute;  // in absolute_unit (or the quantity's SI unit when that is empty)
  std::string absolute_unit;
  SourcePosition at;
};

// When nothing more specific is given: a millionth of the value, or 1e-12 in the quantity's SI unit
// for values at or near zero (a flow of a component that is absent, say).
inline constexpr double default_relative_tolerance = 1e-6;
inline constexpr double default_absolute_tolerance = 1e-12;

struct ExpectedValue {
  std::string path;
  double value;
  SourcePosition at;
  std::vector<std::string> texts;  // warnings: the recorded lines
};

struct Expectations {
  std::string file;
  std::map<std::string, ToleranceEntry, std::less<>> tolerances;  // "default", a kind, or a path
  std::string tolerances_text;  // the 'tolerances' block as written, kept when re-recording
  std::vector<ExpectedValue> values;
};

// Reads an expectations file; throws InputError naming its line and column.
Expectations read_expectations(const std::string& file, const QuantityReader& quantities);

struct Difference {
  std::string path;
  std::string expected;
  std::string actual;
  std::string difference;
  std::string allowed;
  std::string note;  // "missing from the results", a warning's text, ...
};

struct Comparison {
  std::size_t compared = 0;
  std::vector<std::string> matched;  // paths of the expected quantities within their tolerance
  std::vector<Difference> differences;
};

// Compares actual results with the expectations: |actual − expected| ≤ max(absolute,
// relative·|expected|), NaN equal only to NaN, warnings by their number. Throws InputError for a
// tolerance whose unit does not fit the quantity it applies to.
Comparison compare(const Expectations& expected, const std::vector<ResultQuantity>& actual,
                   const QuantityReader& quantities);

// The expectations file for these results; tolerances_text (from an earlier file) is kept as it
// was, else a default block with an explanation is written.
std::string expectations_yaml(const SolvedFlowsheet& solved, const std::string& tolerances_text);

// The table of differences, for people.
std::string differences_table(const Comparison& comparison);

}  // namespace protonflow::host
