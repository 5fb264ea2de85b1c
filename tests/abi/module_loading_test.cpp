// Loading modules through unit_host.hpp: what a host accepts, what it refuses and what it says.
#include <catch2/catch.hpp>

#include <cstddef>
#include <fstream>
#include <optional>
#include <string>
#include <vector>

#include <protonflow/unit_host.hpp>

#include "abi_test_support.hpp"

using Catch::Matchers::Contains;
using protonflow::abi_test::test_slate;
using protonflow::abi_test::test_stream;
namespace host = protonflow::unit_host;

namespace {

std::string load_error(const std::string& file) {
  try {
    const host::Module module(file);
  } catch (const host::LoadError& error) {
    return error.what();
  }
  FAIL("the module loaded: " << file);
  return {};
}

std::vector<std::string> names(const auto& items) {
  std::vector<std::string> result;
  for (const auto& item : items) result.push_back(item.name);
  return result;
}

const std::string this_version = std::to_string(PFU_ABI_MAJOR) + "." + std::to_string(PFU_ABI_MINOR);

}  // namespace

TEST_CASE("a module built with the C++ helper describes its units without creating one") {
  const host::Module module(ABI_GOOD_MODULE);
  CHECK(module.name() == "protonflow-abi-test-units");
  CHECK(module.version() == "1.0.0");
  CHECK(module.abi_major() == PFU_ABI_MAJOR);
  CHECK(module.abi_minor() == PFU_ABI_MINOR);
  REQUIRE(module.classes().size() == 4);
  CHECK(module.classes()[0].type == "passthrough");
  CHECK(module.classes()[2].type == "probe");
  CHECK(module.find("neutraliser") == nullptr);

  const host::UnitClassInfo* mixer = module.find("mixer");
  REQUIRE(mixer != nullptr);
  CHECK(mixer->summary == "Mixes two streams, all phases (a test module)");
  CHECK(names(mixer->ports) == std::vector<std::string>{"feed_1", "feed_2", "product"});
  CHECK(mixer->inlet_count() == 2);
  CHECK(mixer->outlet_count() == 1);
  CHECK(mixer->ports[2].phases == (PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID));
  CHECK(mixer->ports[2].meaning == "the mixed stream");

  REQUIRE(names(mixer->parameters) == std::vector<std::string>{"pressure_drop", "warning_temperature", "pressure_rule"});
  const host::ParameterInfo& drop = mixer->parameters[0];
  CHECK(drop.kind == host::ParameterKind::number);
  CHECK(drop.unit == "Pa");
  CHECK(drop.default_number == 0.0);
  CHECK(drop.lower == 0.0);
  CHECK(drop.upper == 1.0e7);
  CHECK_FALSE(drop.required());
  CHECK(mixer->parameters[1].default_number == 333.15);
  const host::ParameterInfo& rule = mixer->parameters[2];
  CHECK(rule.kind == host::ParameterKind::choice);
  CHECK(rule.default_text == "lowest");
  CHECK(rule.choices == std::vector<std::string>{"lowest", "first"});
  CHECK(names(mixer->results) == std::vector<std::string>{"total_flow", "temperature_spread"});
  CHECK(mixer->results[0].unit == "mol/s");

  const host::UnitClassInfo* probe = module.find("probe");
  REQUIRE(probe != nullptr);
  CHECK(probe->parameters[3].kind == host::ParameterKind::text);
  CHECK(probe->parameters[3].required());    // text without default
  CHECK(probe->parameters[4].required());    // number with NaN default
  CHECK_FALSE(probe->parameters[0].required());
}

TEST_CASE("a module built against an older minor version loads, read as that version's layout") {
  const host::Module module(ABI_OLD_MINOR_MODULE);
  CHECK(module.abi_minor() == 0);
  CHECK(module.version() == "0.9.0");
  const host::UnitClassInfo* unit = module.find("old_copy");
  REQUIRE(unit != nullptr);
  // Its parameters are shorter than this host's pfu_parameter: stepping by its struct_size finds the second.
  REQUIRE(names(unit->parameters) == std::vector<std::string>{"pressure_drop", "note"});
  CHECK(unit->parameters[0].upper == 1.0e6);
  CHECK(unit->parameters[1].kind == host::ParameterKind::text);
  CHECK(unit->parameters[1].default_text == "none");
  CHECK(unit->parameters[1].choices.empty());
  // Its ports end before 1.2's flags: they read as required ports.
  REQUIRE(unit->ports.size() == 2);
  CHECK_FALSE(unit->ports[0].optional);
  CHECK_FALSE(unit->ports[1].optional);

  auto instance = module.create("old_copy", std::vector<host::ParameterValue>{{"pressure_drop", 500.0}, {"note", "old"}},
                                test_slate());
  const std::vector<host::StreamState> inlets{test_stream(300.0, 2.0e5, {{0, 0, 1.0}, {2, 1, 0.25}})};
  std::vector<host::StreamState> outlets(1);
  const host::Solution solution = instance.solve(inlets, outlets);
  CHECK(outlets[0].temperature == 300.0);
  CHECK(outlets[0].pressure == 2.0e5 - 500.0);
  CHECK(outlets[0].flows == inlets[0].flows);
  CHECK(solution.results == std::vector<double>{500.0});
  CHECK(solution.warnings.empty());
}

TEST_CASE("a module built against a newer minor version loads, and the host reads only the fields it knows") {
  const host::Module module(ABI_NEWER_MINOR_MODULE);
  CHECK(module.abi_minor() == PFU_ABI_MINOR + 1);
  CHECK(module.name() == "protonflow-abi-test-newer-minor");
  const host::UnitClassInfo* unit = module.find("future_copy");
  REQUIRE(unit != nullptr);
  // Every array's elements are longer than this host's structs.
  CHECK(names(unit->ports) == std::vector<std::string>{"feed", "product"});
  CHECK_FALSE(unit->ports[1].inlet);
  REQUIRE(names(unit->parameters) == std::vector<std::string>{"pressure_drop", "note"});
  CHECK(unit->parameters[1].choices == std::vector<std::string>{"none", "some"});
  CHECK(names(unit->results) == std::vector<std::string>{"pressure_drop"});

  auto instance = module.create("future_copy", std::vector<host::ParameterValue>{{"pressure_drop", 1000.0}}, test_slate());
  const std::vector<host::StreamState> inlets{test_stream(310.0, 1.5e5, {{0, 0, 2.0}})};
  std::vector<host::StreamState> outlets(1);
  CHECK(instance.solve(inlets, outlets).results == std::vector<double>{1000.0});
  CHECK(outlets[0].pressure == 1.5e5 - 1000.0);
}

TEST_CASE("a module of another major version is refused, naming both versions and the file") {
  const std::string message = load_error(ABI_WRONG_MAJOR_MODULE);
  CHECK_THAT(message, Contains(ABI_WRONG_MAJOR_MODULE));
  CHECK_THAT(message, Contains("unit ABI " + std::to_string(PFU_ABI_MAJOR + 1) + ".0"));
  CHECK_THAT(message, Contains("unit ABI " + this_version));
}

TEST_CASE("a library without the entry symbol is refused, naming the symbol and the file") {
  const std::string message = load_error(ABI_NO_ENTRY_MODULE);
  CHECK_THAT(message, Contains(ABI_NO_ENTRY_MODULE));
  CHECK_THAT(message, Contains("not a protonflow unit module"));
  CHECK_THAT(message, Contains("'protonflow_unit_module'"));
}

TEST_CASE("a class descriptor with a truncated struct_size is refused before anything past it is read") {
  const std::string message = load_error(ABI_TRUNCATED_MODULE);
  CHECK_THAT(message, Contains(ABI_TRUNCATED_MODULE));
  CHECK_THAT(message, Contains("unit class descriptor 1 is truncated"));
  CHECK_THAT(message, Contains("struct_size is " + std::to_string(offsetof(pfu_unit_class, create)) + " bytes"));
  CHECK_THAT(message, Contains("at least " + std::to_string(sizeof(pfu_unit_class))));
}

TEST_CASE("a file that is not a loadable library is refused with the loader's reason") {
  const protonflow::abi_test::TemporaryDirectory directory;
  const std::filesystem::path junk = directory.path() / "junk.so";
  std::ofstream out(junk);
  for (int line = 0; line < 20; ++line) out << "not a shared library, though named like one\n";
  out.close();
  const std::string message = load_error(junk.string());
  CHECK_THAT(message, Contains("cannot load unit module " + junk.string()));
  CHECK_THAT(message, Contains("invalid ELF header"));

  const std::string missing = load_error((directory.path() / "missing.so").string());
  CHECK_THAT(missing, Contains("No such file"));
}

TEST_CASE("an instance keeps its module loaded after every Module handle is gone") {
  std::optional<host::Instance> instance;
  {
    const host::Module module(ABI_GOOD_MODULE);
    instance.emplace(module.create("passthrough", {}, test_slate()));
  }
  const std::vector<host::StreamState> inlets{test_stream(298.15, 101325.0, {{0, 0, 1.0}})};
  std::vector<host::StreamState> outlets(1);
  instance->solve(inlets, outlets);
  CHECK(outlets[0].flows == inlets[0].flows);
  CHECK(instance->unit_class().type == "passthrough");
}

TEST_CASE("asking a module for a type it lacks names the types it has") {
  const host::Module module(ABI_GOOD_MODULE);
  try {
    (void)module.create("neutraliser", {}, test_slate());
    FAIL("created a unit the module does not have");
  } catch (const std::invalid_argument& error) {
    CHECK_THAT(error.what(), Contains("no unit type 'neutraliser'"));
    CHECK_THAT(error.what(), Contains("passthrough, mixer, probe"));
  }
}
