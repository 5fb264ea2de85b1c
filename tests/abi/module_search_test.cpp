// Module search: the search path's order, which files count as modules, and the map from unit
// type to the module that offers it, with broken and shadowing modules on the path.
#include <catch2/catch.hpp>

#include <fstream>
#include <string>
#include <vector>

#include "abi_test_support.hpp"
#include "module_search.hpp"

using Catch::Matchers::Contains;
using protonflow::abi_test::TemporaryDirectory;
namespace fs = std::filesystem;
namespace search = protonflow::host;

TEST_CASE("the search path is --unit-dir, then PROTONFLOW_UNIT_PATH, then the built-in directory") {
  const std::vector<std::string> unit_dirs{"/opt/a", "/opt/b/"};
  const auto path = search::unit_search_path(unit_dirs, "/env/one::/env/two:/opt/a:", "/usr/lib/protonflow/units");
  CHECK(path == std::vector<fs::path>{"/opt/a", "/opt/b/", "/env/one", "/env/two", "/usr/lib/protonflow/units"});
  CHECK(search::unit_search_path({}, "", "/builtin") == std::vector<fs::path>{"/builtin"});
  CHECK_FALSE(search::builtin_unit_directory().empty());
}

TEST_CASE("a directory's modules are its files with the shared-library suffix, in name order") {
  const TemporaryDirectory directory;
  const fs::path root = directory.path();
  fs::copy_file(ABI_GOOD_MODULE, root / "b_units.so");
  fs::copy_file(ABI_OLD_MINOR_MODULE, root / "a_units.so");
  std::ofstream(root / "notes.txt") << "not a module\n";
  fs::create_directory(root / "nested.so");  // a directory, however named, is not a module
  CHECK(search::module_files(root) == std::vector<fs::path>{root / "a_units.so", root / "b_units.so"});
  CHECK(search::module_files(root / "absent").empty());
}

TEST_CASE("the catalog maps each unit type to the first module offering it and keeps broken modules as problems") {
  const TemporaryDirectory first;
  const TemporaryDirectory second;
  fs::copy_file(ABI_GOOD_MODULE, first.path() / "good.so");
  fs::copy_file(ABI_WRONG_MAJOR_MODULE, first.path() / "major.so");
  fs::copy_file(ABI_OLD_MINOR_MODULE, second.path() / "old.so");
  fs::copy_file(ABI_GOOD_MODULE, second.path() / "good_again.so");
  const std::vector<fs::path> path{first.path(), second.path(), first.path() / "absent"};

  const search::UnitCatalog catalog = search::UnitCatalog::scan(path);
  CHECK(catalog.types() == std::vector<std::string>{"blender", "mixer", "old_copy", "passthrough", "probe"});
  REQUIRE(catalog.module_for("mixer") != nullptr);
  CHECK(catalog.module_for("mixer")->file() == first.path() / "good.so");
  CHECK(catalog.module_for("old_copy")->file() == second.path() / "old.so");
  CHECK(catalog.module_for("major_two_copy") == nullptr);
  REQUIRE(catalog.unit_class("old_copy") != nullptr);
  CHECK(catalog.unit_class("old_copy")->parameters.size() == 2);
  CHECK(catalog.modules().size() == 3);

  REQUIRE(catalog.problems().size() == 1);
  CHECK(catalog.problems()[0].file == first.path() / "major.so");
  CHECK_THAT(catalog.problems()[0].message, Contains("unit ABI 2.0"));

  REQUIRE(catalog.shadowed().size() == 4);
  CHECK(catalog.shadowed()[0].type == "passthrough");
  CHECK(catalog.shadowed()[0].used == first.path() / "good.so");
  CHECK(catalog.shadowed()[0].ignored == second.path() / "good_again.so");

  CHECK(&catalog.require("probe") == catalog.module_for("probe"));
  try {
    (void)catalog.require("neutraliser");
    FAIL("found a unit type that is not on the path");
  } catch (const std::runtime_error& error) {
    const std::string message = error.what();
    CHECK_THAT(message, Contains("unknown unit type 'neutraliser'; known types: blender mixer old_copy passthrough probe"));
    CHECK_THAT(message, Contains("searched: " + first.path().string() + " " + second.path().string()));
    CHECK_THAT(message, Contains("not loaded: " + (first.path() / "major.so").string()));
  }
}
