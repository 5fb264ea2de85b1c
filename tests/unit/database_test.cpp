#include <catch2/catch.hpp>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <memory>
#include <string>
#include <thread>
#include <vector>

#include "../support/temporary_directory.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/shared_database.hpp"
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

namespace {

// One species of the test's own whose log10 K at 298.15 K is the given text (same length each time).
std::string species_with_log_k(const std::string& log_k, const std::string& name = "HOH") {
  return "species:\n  - name: " + name + "\n    formula: H2O\n    reaction: {H2O: 1}\n    log10_K_298K: {value: " +
         log_k + ", source: x}\n    temperature_function: {van_t_hoff: {reaction_enthalpy_kJ_mol: {value: 0, source: x}}}\n";
}

double log_k_298(const Database& db) { return log_k(db.find("HOH")->log_k, 298.15, 101325.0); }

}  // namespace

TEST_CASE("the species data of a directory are parsed once per process while the files are unchanged") {
  // A directory of its own for each run of the case (once per section), so that none starts cached.
  static int run = 0;
  const std::string name = "shared-" + std::to_string(run++);
  const auto dir = directory_with(name, species_with_log_k("2.5"));
  const auto own_file = dir / (name + ".yaml");
  const long parses_before = shared_database_parses();
  const std::shared_ptr<const Database> first = shared_database(dir);
  CHECK(shared_database_parses() == parses_before + 1);
  CHECK(log_k_298(*first) == Approx(2.5).epsilon(1e-14));

  SECTION("the same files give the same database, and load_database a copy of it") {
    CHECK(shared_database(dir).get() == first.get());
    const Database copy = load_database(dir);
    CHECK(shared_database_parses() == parses_before + 1);
    REQUIRE(copy.species().size() == first->species().size());
    for (std::size_t i = 0; i < copy.species().size(); ++i) {
      CHECK(copy.species()[i].name == first->species()[i].name);
      CHECK(copy.species()[i].file == first->species()[i].file);
      CHECK(copy.species()[i].line == first->species()[i].line);
    }
  }
  SECTION("a file changed in place to the same size is parsed again: contents are compared, not times") {
    std::ofstream(own_file) << species_with_log_k("3.5");
    const std::shared_ptr<const Database> changed = shared_database(dir);
    CHECK(shared_database_parses() == parses_before + 2);
    CHECK(changed.get() != first.get());
    CHECK(log_k_298(*changed) == Approx(3.5).epsilon(1e-14));
    // Whoever holds the first database still holds it as it was read.
    CHECK(log_k_298(*first) == Approx(2.5).epsilon(1e-14));
    CHECK(shared_database(dir).get() == changed.get());
  }
  SECTION("a file added or removed is parsed again") {
    std::ofstream(dir / "extra.yaml") << species_with_log_k("4.5", "HOH2");
    const std::shared_ptr<const Database> added = shared_database(dir);
    CHECK(added->find("HOH2") != nullptr);
    CHECK(first->find("HOH2") == nullptr);
    std::filesystem::remove(dir / "extra.yaml");
    const std::shared_ptr<const Database> removed = shared_database(dir);
    CHECK(removed->find("HOH2") == nullptr);
    CHECK(shared_database_parses() == parses_before + 3);
  }
  SECTION("a broken file is reported at every call, and the last good parse is kept") {
    std::ofstream(own_file) << "species:\n  - name: HOH\n    colour: red\n";
    CHECK_THROWS_WITH(shared_database(dir), Catch::Contains(name + ".yaml:3:5"));
    CHECK_THROWS_WITH(shared_database(dir), Catch::Contains(name + ".yaml:3:5"));
    std::ofstream(own_file) << species_with_log_k("2.5");
    CHECK(shared_database(dir).get() == first.get());
  }
}

TEST_CASE("threads asking for the same species data at once share one parse") {
  const auto dir = directory_with("threads", species_with_log_k("1.5"));
  const long parses_before = shared_database_parses();
  std::vector<std::shared_ptr<const Database>> databases(4);
  std::vector<std::thread> threads;
  for (auto& database : databases) threads.emplace_back([&database, &dir] { database = shared_database(dir); });
  for (std::thread& thread : threads) thread.join();
  CHECK(shared_database_parses() == parses_before + 1);
  for (const auto& database : databases) CHECK(database.get() == databases.front().get());
}
