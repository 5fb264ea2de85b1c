// libFuzzer target for the species-data loader (thermo/src/database.cpp): any bytes, read as one
// data file beside the bundled water.yaml, must end in a database or in a DataError that names the
// file, never in a crash, a hang, undefined behaviour (UBSan), a memory error (ASan) or another
// exception escaping. Built with clang by tests/host/CMakeLists.txt; ctest runs it briefly, seeded
// with the bundled data files.
#include <cstddef>
#include <cstdint>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/errors.hpp"

namespace {

std::string bundled_water() {
  std::ifstream file(PROTONFLOW_DATA_DIR "/water.yaml");
  std::ostringstream text;
  text << file.rdbuf();
  if (text.str().empty()) __builtin_trap();  // the fuzzer is useless without H2O, H^+ and OH^-
  return text.str();
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const std::string water = bundled_water();
  using namespace protonflow::thermo;
  const std::vector<DataText> texts{{"water.yaml", water}, {"fuzz.yaml", std::string(reinterpret_cast<const char*>(data), size)}};
  try {
    const Database database = load_database(texts);
    // What is accepted is consistent: every secondary species reacts from basis species it names.
    for (const Species& s : database.species()) {
      if (s.name.empty()) __builtin_trap();
      for (const auto& [name, coefficient] : s.reaction) {
        const Species* basis = database.find(name);
        if (name != "H2O" && (basis == nullptr || !basis->is_basis)) __builtin_trap();
        if (coefficient != coefficient) __builtin_trap();
      }
    }
  } catch (const DataError& error) {
    // The expected outcome for nonsense; it must say which file.
    if (error.file() != "fuzz.yaml" && error.file() != "water.yaml") __builtin_trap();
  } catch (const ThermoError& error) {
    // Only the whole-database checks (no water ions, say) may answer without a file.
    if (error.kind() != ErrorKind::bad_data) __builtin_trap();
  }
  return 0;
}
