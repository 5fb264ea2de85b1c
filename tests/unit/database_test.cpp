#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>

#include "../support/temporary_directory.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/errors.hpp"

using namespace protonflow::thermo;

namespace {

// A data directory holding the bundled water.yaml plus one file of the test's own, inside this
// run's own temporary directory (removed at exit), so that two runs never share one.
std::filesystem::path directory_with(const std::string& name, const std::string& text) {
  static const protonflow::test_support::TemporaryDirectory root;
  const auto dir = root.path() / ("db-" + name);
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  std::filesystem::copy_file(default_data_directory() / "water.yaml", dir / "water.yaml");
  std::ofstream(dir / (name + ".yaml")) << text;
  return dir;
}

}  // namespace

TEST_CASE("the bundled species data loads and every reaction balances") {
  const Database db = load_database(default_data_directory());
  CHECK(db.species().size() >= 50);
  for (const Species& s : db.species()) {
    INFO(s.name << " from " << s.file << ":" << s.line);
    if (!s.is_basis && s.phase != Phase::liquid) CHECK_FALSE(s.log_k_source.empty());
    if (s.formula.charge != 0) CHECK(s.ion_size_angstrom.has_value());
  }
}

TEST_CASE("a broken data file is reported with file, line and column") {
  SECTION("unknown key") {
    const auto dir = directory_with("unknown-key", "species:\n  - name: Na+\n    basis: true\n    colour: red\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("unknown-key.yaml:4:5") && Catch::Contains("unknown key 'colour'"));
  }
  SECTION("unbalanced reaction") {
    const auto dir = directory_with("unbalanced",
                                    "species:\n  - name: Cl-\n    basis: true\n    ion_size_angstrom: {value: 3, source: x}\n"
                                    "  - name: HCl(aq)\n    formula: HCl\n    reaction: {Cl-: 1}\n"
                                    "    log_k: {value: -6, source: x}\n"
                                    "    temperature_function: {van_t_hoff: {reaction_enthalpy_kJ_mol: {value: 0, source: x}}}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("unbalanced.yaml:5") && Catch::Contains("does not balance"));
  }
  SECTION("value without a source") {
    const auto dir = directory_with("no-source", "species:\n  - name: Na+\n    basis: true\n    ion_size_angstrom: {value: 4}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("no-source.yaml:4:24") && Catch::Contains("'source'"));
  }
  SECTION("YAML syntax") {
    const auto dir = directory_with("syntax", "species:\n  - name: [Na+\n");
    CHECK_THROWS_AS(load_database(dir), DataError);
  }
  SECTION("a species defined twice") {
    const auto dir = directory_with("twice", "species:\n  - name: H+\n    basis: true\n    ion_size_angstrom: {value: 9, source: x}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("defined twice"));
  }
}
