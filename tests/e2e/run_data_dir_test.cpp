// End-to-end: `protonflow run --data-dir DIR` computes every unit with the species data in DIR, not
// only the host's stream table: the unit modules are told the directory before they load.
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include <catch2/catch.hpp>
#include <yaml-cpp/yaml.h>

#include "../support/temporary_directory.hpp"
#include "run_program.hpp"

namespace fs = std::filesystem;

namespace {

std::string read_text(const fs::path& file) {
  std::ifstream in(file);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// Dissolved calcium leaving the neutraliser of the lime demo, mol/s, with the given extra options.
double dissolved_calcium(const fs::path& results, const std::vector<std::string>& options) {
  std::vector<std::string> arguments{"run", std::string(PROTONFLOW_EXAMPLES) + "/flowsheets/acid-waste-neutralisation.yaml",
                                     "-o", results.string()};
  arguments.insert(arguments.end(), options.begin(), options.end());
  const auto run = protonflow::e2e::run_program(PROTONFLOW_BINARY, arguments);
  INFO("stderr: " << run.err);
  REQUIRE(run.exit_code == 0);
  const YAML::Node report = YAML::LoadFile(results.string());
  return report["streams"]["treated"]["flows_mol_per_s"]["aqueous"]["Ca(OH)2"].as<double>();
}

}  // namespace

TEST_CASE("run --data-dir: the units compute with the given species data, not the bundled data") {
  const protonflow::test_support::TemporaryDirectory scratch;
  const fs::path data = scratch.path() / "data";
  fs::copy(PROTONFLOW_DATA_SOURCE, data, fs::copy_options::recursive);

  // Gypsum made ten times more soluble in the copy: its formation log K one unit lower.
  const fs::path solids = data / "solids.yaml";
  std::string text = read_text(solids);
  const std::string gypsum_term = "five_term_log10_K: {constant: -68.2401,";
  const auto at = text.find(gypsum_term);
  REQUIRE(at != std::string::npos);
  text.replace(at, gypsum_term.size(), "five_term_log10_K: {constant: -69.2401,");
  std::ofstream(solids) << text;

  const double bundled = dissolved_calcium(scratch.path() / "bundled.yaml", {});
  const double changed = dissolved_calcium(scratch.path() / "changed.yaml", {"--data-dir", data.string()});
  // The neutraliser's outlet is saturated with gypsum: a Ksp ten times larger leaves more calcium
  // dissolved (about √10 times at fixed sulfate). Before the directory reached the modules, the
  // two runs gave the same outlet.
  CHECK(changed > 1.5 * bundled);
}
