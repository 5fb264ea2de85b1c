// Unit ABI 1.4: the outlets-only capability and the solve's flags, through the host helper and
// through raw calls; a module of ABI 1.3, which knows neither, still runs in full under a 1.4 host.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include <boost/dll/shared_library.hpp>
#include <protonflow/unit_host.hpp>

#include "abi_test_support.hpp"

using Catch::Matchers::Contains;
using protonflow::abi_test::aqueous;
using protonflow::abi_test::test_slate;
using protonflow::abi_test::test_stream;
namespace host = protonflow::unit_host;
using Parameters = std::vector<host::ParameterValue>;

TEST_CASE("a class with the outlets-only capability skips its results and series when asked, and only then") {
  const host::Module module(ABI_GOOD_MODULE);
  CHECK(module.find("blender")->outlets_only);
  CHECK_FALSE(module.find("mixer")->outlets_only);
  auto blender = module.create("blender", Parameters{{"profile_points", 3.0}}, test_slate());
  const std::vector<host::StreamState> inlets{test_stream(300.0, 2.0e5, {{aqueous, 0, 1.0}}),
                                              test_stream(360.0, 1.5e5, {{aqueous, 0, 3.0}})};
  const std::array<std::uint32_t, 1> two{2};
  const std::array<std::uint32_t, 1> one{1};
  std::vector<host::StreamState> outlets(1);

  const host::Solution pass = blender.solve(inlets, two, outlets, one, true);
  // The outlets are whole: 4 mol/s of water at the flow-weighted 345 K, the lower pressure.
  CHECK(outlets[0].temperature == Approx(345.0).epsilon(1e-15));
  CHECK(outlets[0].pressure == 1.5e5);
  CHECK(outlets[0].flows[0] == 4.0);
  // The result is left unset (NaN) and the series empty.
  REQUIRE(pass.results.size() == 1);
  CHECK(std::isnan(pass.results[0]));
  REQUIRE(pass.series.size() == 2);
  CHECK(pass.series[0].x.empty());
  CHECK(pass.series[1].x.empty());

  const host::Solution report = blender.solve(inlets, two, outlets, one);
  CHECK(report.results == std::vector<double>{4.0});
  CHECK(report.series[0].x == std::vector<double>{1.0, 4.0});
  CHECK(report.series[1].x == std::vector<double>{0.0, 0.5, 1.0});
  CHECK(outlets[0].temperature == Approx(345.0).epsilon(1e-15));
}

TEST_CASE("a module of ABI 1.3 loads in a 1.4 host and solves in full when other units get outlets only") {
  const host::Module module(ABI_MINOR_1_3_MODULE);
  CHECK(module.abi_minor() == 3);
  const host::UnitClassInfo* unit = module.find("copy_1_3");
  REQUIRE(unit != nullptr);
  CHECK_FALSE(unit->outlets_only);
  auto copy = module.create("copy_1_3", Parameters{{"pressure_drop", 250.0}}, test_slate());
  const std::vector<host::StreamState> inlets{test_stream(320.0, 3.0e5, {{aqueous, 0, 1.5}, {aqueous, 2, 0.25}})};
  const std::array<std::uint32_t, 1> one{1};
  std::vector<host::StreamState> outlets(1);
  // Its solve_call reads the 1.4 call through its own 1.3 layout (a larger struct is read as far as
  // it knows) and, having no capability, is never flagged: its result comes back on every pass.
  for (const bool outlets_only : {true, false}) {
    const host::Solution solution = copy.solve(inlets, one, outlets, one, outlets_only);
    CHECK(solution.results == std::vector<double>{250.0});
    CHECK(outlets[0].pressure == 3.0e5 - 250.0);
    CHECK(outlets[0].flows == inlets[0].flows);
  }
}

TEST_CASE("a 1.4 module reads a 1.3 call as unflagged and refuses flags it does not know, naming them") {
  const boost::dll::shared_library library{std::string(ABI_GOOD_MODULE)};
  const pfu_module* table = library.get<const pfu_module*()>(pfu_entry_symbol())();
  const pfu_unit_class* raw = nullptr;
  for (std::uint32_t i = 0; i < table->class_count; ++i) {
    if (std::string(table->classes[i].type) == "blender") raw = &table->classes[i];
  }
  REQUIRE(raw != nullptr);
  const std::array<const char*, 1> components{"H2O"};
  const pfu_slate slate{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_slate)}, 1, 0, components.data(), nullptr};
  std::array<char, 512> message{};
  pfu_instance* instance = raw->create(nullptr, 0, &slate, message.data(), message.size());
  REQUIRE(instance != nullptr);
  std::array<double, 2> in_flows{2.0, 0.0};
  std::array<double, 2> out_flows{};
  const pfu_stream_state in{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_stream_state)}, 300.0, 101325.0, 2, 1, in_flows.data()};
  pfu_stream_state out{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_stream_state)}, 0.0, 0.0, 2, 1, out_flows.data()};
  const std::array<const pfu_stream_state*, 1> inlets{&in};
  pfu_stream_state* raw_outlets[] = {&out};
  const std::uint32_t count = 1;
  double result = 0.0;

  // A caller of 1.3: its call ends before flags, and whatever lies beyond is not read.
  pfu_solve_call call{{PFU_ABI_MAJOR, 3, static_cast<std::uint32_t>(offsetof(pfu_solve_call, flags))},
                      inlets.data(), raw_outlets, &count, &count, 1, 1, &result, 1, 0, nullptr,
                      nullptr, 0, message.data(), message.size(), PFU_SOLVE_OUTLETS_ONLY};
  CHECK(raw->solve_call(instance, &call) == PFU_OK);
  CHECK(result == 2.0);

  // A caller of 1.4 asking for outlets only: the result is not written.
  call.header = {PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_solve_call)};
  result = -1.0;
  CHECK(raw->solve_call(instance, &call) == PFU_OK);
  CHECK(std::isnan(result));
  CHECK(out_flows[0] == 2.0);

  // A flag of a later minor is refused by name, not guessed at.
  call.flags = PFU_SOLVE_OUTLETS_ONLY | 0x8u;
  CHECK(raw->solve_call(instance, &call) == PFU_INVALID_ARGUMENT);
  CHECK_THAT(message.data(), Contains("unit 'blender': solve flags 0x8 are unknown to unit ABI 1.4"));

  // A call shorter than 1.3's is truncated: refused.
  call.flags = 0;
  call.header.struct_size = static_cast<std::uint32_t>(offsetof(pfu_solve_call, flags)) - 8;
  CHECK(raw->solve_call(instance, &call) == PFU_INVALID_ARGUMENT);
  raw->destroy(instance);
}
