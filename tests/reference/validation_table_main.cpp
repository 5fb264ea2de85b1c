// Prints docs/validation.md as the engine computes it today.
#include <cstdio>

#include "reference_cases.hpp"

int main() {
  std::fputs(protonflow::reference::render_validation_table().c_str(), stdout);
  return 0;
}
