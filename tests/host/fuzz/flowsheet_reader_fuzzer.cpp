// libFuzzer target for the flowsheet reader (host-demo/src/flowsheet_file.cpp): any bytes must end
// in a flowsheet or in an InputError with a position, never in a crash, a hang, undefined
// behaviour (UBSan) or a memory error (ASan). Built with clang by tests/host/CMakeLists.txt in a
// configuration of its own; ctest runs it briefly, seeded with the flowsheets of the tests and the
// examples.
#include <cstddef>
#include <cstdint>
#include <string>

#include "flowsheet_file.hpp"
#include "quantity.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  // Reading the UDUNITS-2 database takes milliseconds; once per process is what the host does too.
  static const protonflow::host::UnitConverter units;
  const std::string text(reinterpret_cast<const char*>(data), size);
  try {
    const protonflow::host::FlowsheetInput input = protonflow::host::parse_flowsheet(text, "fuzz.yaml", units);
    // Whatever is accepted must be physical: the reader's promise to the rest of the host.
    for (const auto& stream : input.streams) {
      if (!(stream.temperature > 0.0) || !(stream.pressure > 0.0)) __builtin_trap();
      for (const auto& phase : stream.phases) {
        if (phase.flows.size() != phase.flow_at.size()) __builtin_trap();
        for (const auto& flow : phase.flows) {
          if (!(flow.flow >= 0.0) || flow.flow != flow.flow) __builtin_trap();
        }
      }
    }
  } catch (const protonflow::host::InputError& error) {
    // The expected outcome for nonsense; it must say where.
    if (error.where().file != "fuzz.yaml") __builtin_trap();
  }
  return 0;
}
