// libFuzzer target for the species-data loader (thermo/src/database.cpp): any bytes, read as one
// data file beside the solvent and its ions, must end in a database or in a DataError that names the
// file, never in a crash, a hang, undefined behaviour (UBSan), a memory error (ASan) or another
// exception escaping. Built with clang by tests/host/CMakeLists.txt; ctest runs it briefly, seeded
// with the snippets of real data in species-seeds/ (docs/species-data.md, "Fuzzing the loader").
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/errors.hpp"

namespace {

// H2O, H^+ and OH^-, which every database must define, as thermo/data/water.yaml gives them, without
// its comments and the properties the loader only stores. Parsing the whole bundled file on every
// input cost more than the input itself and exercised nothing new: its text never changes.
constexpr const char* water_ions = R"(species:
  - name: H2O
    basis: true
    phase: l
  - name: H^+
    basis: true
    ion_size_angstrom: {value: 9.0, source: kielland-1937}
  - name: OH^-
    ion_size_angstrom: {value: 3.5, source: kielland-1937}
    reaction: {H2O: 1, H^+: -1}
    log10_K_298K: {value: -13.9945, source: bandura-lvov-2006}
    temperature_function:
      water_ionization: bandura-lvov-2006
)";

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  using namespace protonflow::thermo;
  const std::vector<DataText> texts{{"water.yaml", water_ions}, {"fuzz.yaml", std::string(reinterpret_cast<const char*>(data), size)}};
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
