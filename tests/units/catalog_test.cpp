// The host finds the units by type name in its built-in module directory, as a flowsheet names them.
#include <catch2/catch.hpp>

#include <filesystem>
#include <vector>

#include "module_search.hpp"

namespace search = protonflow::host;

TEST_CASE("the host's built-in directory offers the splitter, the heater and the acid mixer, each from its own module") {
  CHECK(search::builtin_unit_directory() == std::filesystem::path(UNITS_BUILT_IN_DIRECTORY));
  const std::vector<std::filesystem::path> path{search::builtin_unit_directory()};
  const search::UnitCatalog catalog = search::UnitCatalog::scan(path);
  CHECK(catalog.problems().empty());
  CHECK(catalog.shadowed().empty());  // no type offered twice
  REQUIRE(catalog.module_for("splitter") != nullptr);
  REQUIRE(catalog.module_for("heater") != nullptr);
  REQUIRE(catalog.module_for("acid_mixer") != nullptr);
  CHECK(catalog.module_for("mixer") == nullptr);  // the acid mixer took over its job
  CHECK(catalog.module_for("splitter")->file() == std::filesystem::path(UNITS_SPLITTER_MODULE));
  CHECK(catalog.module_for("heater")->file() == std::filesystem::path(UNITS_HEATER_MODULE));
  CHECK(catalog.module_for("splitter")->name() == "protonflow-splitter");
  CHECK(catalog.module_for("heater")->name() == "protonflow-heater");
  CHECK(catalog.module_for("acid_mixer")->file() == std::filesystem::path(UNITS_ACID_MIXER_MODULE));
  CHECK(catalog.module_for("acid_mixer")->name() == "protonflow-acid-mixer");
}
