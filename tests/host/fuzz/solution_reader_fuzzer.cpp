// libFuzzer target for the solution-file reader (host-demo/src/solution_file.cpp): any bytes must end
// in a solution input or in an InputError with a position in the file, never in a crash, a hang,
// undefined behaviour (UBSan), a memory error (ASan) or another exception escaping. Built with clang
// by tests/host/CMakeLists.txt; ctest runs it briefly, seeded with the solution files of the tests
// and the examples.
#include <cstddef>
#include <cstdint>
#include <string>

#include "quantity.hpp"
#include "solution_file.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  // Reading the UDUNITS-2 database takes milliseconds; once per process is what the host does too.
  static const protonflow::host::UnitConverter units;
  const std::string text(reinterpret_cast<const char*>(data), size);
  try {
    const protonflow::host::SolutionInput input = protonflow::host::parse_solution(text, "fuzz.yaml", units);
    // Whatever is accepted must be physical: the reader's promise to the speciate command.
    if (input.components.empty()) __builtin_trap();
    if (!input.enthalpy && !(input.temperature > 0.0)) __builtin_trap();
    if (!(input.pressure > 0.0)) __builtin_trap();
    for (const auto& component : input.components)
      if (!(component.amount >= 0.0)) __builtin_trap();
  } catch (const protonflow::host::InputError& error) {
    if (error.where().file != "fuzz.yaml") __builtin_trap();
  }
  return 0;
}
