#include <catch2/catch.hpp>

#include <map>

#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/tableau.hpp"

using namespace protonflow::thermo;

namespace {

const Database& database() {
  static const Database db = load_database(default_data_directory());
  return db;
}

std::map<std::string, double> decomposition(std::string_view component) {
  std::map<std::string, double> by_name;
  for (const auto& [index, k] : decompose(database(), component)) by_name[database().species()[index].name] = k;
  return by_name;
}

}  // namespace

TEST_CASE("neutral components decompose onto basis species") {
  CHECK(decomposition("H2SO4") == std::map<std::string, double>{{"H^+", 2}, {"SO4^2-", 1}});
  CHECK(decomposition("NaOH") == std::map<std::string, double>{{"Na^+", 1}, {"H2O", 1}, {"H^+", -1}});
  CHECK(decomposition("CaSO4.2H2O") == std::map<std::string, double>{{"Ca^2+", 1}, {"SO4^2-", 1}, {"H2O", 2}});
  CHECK(decomposition("CO2") == std::map<std::string, double>{{"CO3^2-", 1}, {"H^+", 2}, {"H2O", -1}});
  CHECK(decomposition("NaHCO3") == std::map<std::string, double>{{"Na^+", 1}, {"CO3^2-", 1}, {"H^+", 1}});
  CHECK(decomposition("CH3COOH") == std::map<std::string, double>{{"CH3COO^-", 1}, {"H^+", 1}});
  CHECK(decomposition("NH3") == std::map<std::string, double>{{"NH4^+", 1}, {"H^+", -1}});
  CHECK(decomposition("H2O") == std::map<std::string, double>{{"H2O", 1}});
  CHECK(decomposition("Na2SO3") == std::map<std::string, double>{{"Na^+", 2}, {"SO3^2-", 1}});
}

TEST_CASE("a change of oxidation state is not a decomposition") {
  // Peroxide and thiosulfate need electrons no basis species offers: no hidden redox.
  CHECK_THROWS_WITH(decompose(database(), "H2O2"), Catch::Contains("oxidation state"));
  CHECK_THROWS_WITH(decompose(database(), "Na2S2O3"), Catch::Contains("oxidation state"));
  CHECK_THROWS_WITH(decompose(database(), "NaCl^+"), Catch::Contains("charged"));
  CHECK_THROWS_WITH(decompose(database(), "UO2"), Catch::Contains("unknown element"));
}
