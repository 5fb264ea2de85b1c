#include <catch2/catch.hpp>

#include <cmath>
#include <filesystem>
#include <fstream>

#include "../support/temporary_directory.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/temperature_function.hpp"

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
    const auto dir = directory_with("unknown-key", "species:\n  - name: Na^+\n    basis: true\n    colour: red\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("unknown-key.yaml:4:5") && Catch::Contains("unknown key 'colour'"));
  }
  SECTION("unbalanced reaction") {
    const auto dir = directory_with("unbalanced",
                                    "species:\n  - name: Cl^-\n    basis: true\n    ion_size_angstrom: {value: 3, source: x}\n"
                                    "  - name: HCl(aq)\n    formula: HCl\n    reaction: {Cl^-: 1}\n"
                                    "    log10_K_298K: {value: -6, source: x}\n"
                                    "    temperature_function: {van_t_hoff: {reaction_enthalpy_kJ_mol: {value: 0, source: x}}}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("unbalanced.yaml:5") && Catch::Contains("does not balance"));
  }
  SECTION("value without a source") {
    const auto dir = directory_with("no-source", "species:\n  - name: Na^+\n    basis: true\n    ion_size_angstrom: {value: 4}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("no-source.yaml:4:24") && Catch::Contains("'source'"));
  }
  SECTION("YAML syntax") {
    const auto dir = directory_with("syntax", "species:\n  - name: [Na^+\n");
    CHECK_THROWS_AS(load_database(dir), DataError);
  }
  SECTION("a species defined twice") {
    const auto dir = directory_with("twice", "species:\n  - name: H^+\n    basis: true\n    ion_size_angstrom: {value: 9, source: x}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("defined twice"));
  }
}

TEST_CASE("a data file in the older notation is refused with what to write instead") {
  SECTION("a charge without '^' in a name") {
    const auto dir = directory_with("old-charge", "species:\n  - name: Ca+2\n    basis: true\n"
                                                  "    ion_size_angstrom: {value: 6, source: x}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("old-charge.yaml:2:11") && Catch::Contains("'Ca+2'") &&
                                              Catch::Contains("write 'Ca^2+'"));
  }
  SECTION("a charge without '^' in a reaction") {
    const auto dir = directory_with("old-reaction",
                                    "species:\n  - name: CaOH^+\n    ion_size_angstrom: {value: 4, source: x}\n"
                                    "    reaction: {Ca+2: 1, H2O: 1, H^+: -1}\n"
                                    "    log10_K_298K: {value: -12.8, source: x}\n"
                                    "    temperature_function: {van_t_hoff: {reaction_enthalpy_kJ_mol: {value: 0, source: x}}}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("old-reaction.yaml:4:16") && Catch::Contains("write 'Ca^2+'"));
  }
  SECTION("a single charge with its sign alone") {
    const auto dir = directory_with("old-single", "species:\n  - name: Cl-\n    basis: true\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("old-single.yaml:2:11") && Catch::Contains("write 'Cl^-'"));
  }
  SECTION("a hydrate joined with ':'") {
    const auto dir = directory_with("old-hydrate", "species:\n  - name: gypsum\n    formula: CaSO4:2H2O\n    phase: s\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("old-hydrate.yaml:3:14") && Catch::Contains("write 'CaSO4.2H2O'"));
  }
  SECTION("the key log_k") {
    const auto dir = directory_with("old-log-k",
                                    "species:\n  - name: HOH\n    formula: H2O\n    reaction: {H2O: 1}\n"
                                    "    log_k: {value: 0, source: x}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("old-log-k.yaml:5:5") && Catch::Contains("write 'log10_K_298K'"));
  }
  SECTION("a list of nameless coefficients") {
    const auto dir = directory_with("old-analytic",
                                    "species:\n  - name: HOH\n    formula: H2O\n    reaction: {H2O: 1}\n"
                                    "    temperature_function:\n      analytic: {coefficients: [1, 0, 0, 0, 0], source: x}\n");
    CHECK_THROWS_WITH(load_database(dir), Catch::Contains("old-analytic.yaml:6:7") && Catch::Contains("five_term_log10_K") &&
                                              Catch::Contains("reciprocal_K"));
  }
}

TEST_CASE("the five-term form is read by the names of its terms") {
  // log10 K = 2 + 0.001 T - 300/T + 0.5 log10 T + 1e4/T^2, evaluated here by hand at 298.15 K.
  const auto dir = directory_with("five-term",
                                  "species:\n  - name: HOH\n    formula: H2O\n    reaction: {H2O: 1}\n"
                                  "    temperature_function:\n      five_term_log10_K: {constant: 2, linear_per_K: 0.001, "
                                  "reciprocal_K: -300, log10_T: 0.5, reciprocal_square_K2: 1e4, source: x}\n");
  const Database db = load_database(dir);
  const double t = 298.15;
  const double expected = 2 + 0.001 * t - 300 / t + 0.5 * std::log10(t) + 1e4 / (t * t);
  CHECK(log_k(db.find("HOH")->log_k, t, 101325.0) == Approx(expected).epsilon(1e-12));
}
