// The project's published check values: one list, asserted by the tests and shown in docs/validation.md.
#pragma once

#include <functional>
#include <string>
#include <vector>

namespace protonflow::reference {

struct ReferenceCase {
  std::string group;      // table section, e.g. "Equilibrium constants, 25 °C"
  std::string quantity;   // what is compared, e.g. "pKa of acetic acid"
  std::string source;     // the published source in words, with its status; docs/references.md cites it
  double published;
  double tolerance;       // absolute, in the quantity's own unit
  std::function<double()> model;  // what the engine computes today
  std::string note = {};          // why a tolerance differs from the published one, where it does
};

const std::vector<ReferenceCase>& reference_cases();

// docs/validation.md as the engine computes it today.
std::string render_validation_table();

}  // namespace protonflow::reference
