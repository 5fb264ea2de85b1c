// Unit ABI 1.3 through the host helper and through raw calls: list ports, series, a 1.2 module in a
// 1.3 host, and what a 1.3 host refuses of a later minor.
#include <catch2/catch.hpp>

#include <array>
#include <cstdint>
#include <string>
#include <vector>

#include <boost/dll/shared_library.hpp>
#include <protonflow/unit_host.hpp>

#include "abi_test_support.hpp"

using Catch::Matchers::Contains;
using protonflow::abi_test::aqueous;
using protonflow::abi_test::gas;
using protonflow::abi_test::test_slate;
using protonflow::abi_test::test_stream;
namespace host = protonflow::unit_host;
using Parameters = std::vector<host::ParameterValue>;

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

double total(const host::StreamState& stream) {
  double sum = 0.0;
  for (const double flow : stream.flows) sum += flow;
  return sum;
}

}  // namespace

TEST_CASE("a list port and two series are described: bounds, names, units and lengths") {
  const host::Module module(ABI_GOOD_MODULE);
  const host::UnitClassInfo* blender = module.find("blender");
  REQUIRE(blender != nullptr);
  REQUIRE(blender->ports.size() == 2);
  CHECK(blender->ports[0].list);
  CHECK(blender->ports[0].min_streams == 1);
  CHECK(blender->ports[0].max_streams == 8);
  CHECK(blender->ports[1].list);
  CHECK(blender->ports[1].max_streams == PFU_UNBOUNDED_STREAMS);
  CHECK(blender->inlet_count() == 1);  // ports, not streams
  REQUIRE(blender->series.size() == 2);
  CHECK(blender->series[0].name == "blend_temperature");
  CHECK(blender->series[0].x_name == "flow_blended");
  CHECK(blender->series[0].x_unit == "mol/s");
  CHECK(blender->series[0].y_name == "temperature");
  CHECK(blender->series[0].y_unit == "K");
  CHECK(blender->series[0].max_points == 8);
  CHECK(blender->series[1].max_points == 50);

  // Plain ports of a 1.3 class read as one stream each, and a class without series has none.
  const host::UnitClassInfo* mixer = module.find("mixer");
  REQUIRE(mixer != nullptr);
  CHECK_FALSE(mixer->ports[0].list);
  CHECK(mixer->series.empty());

  // The series' length is fixed when the instance is created: the first at its bound, the second
  // by a parameter.
  const auto instance = module.create("blender", Parameters{{"profile_points", 7.0}}, test_slate());
  CHECK(instance.series_lengths() == std::vector<std::uint32_t>{8, 7});
}

TEST_CASE("three streams on a list inlet and two on a list outlet: balances and series round-trip") {
  const host::Module module(ABI_GOOD_MODULE);
  auto blender = module.create("blender", Parameters{{"profile_points", 3.0}}, test_slate());
  const std::vector<host::StreamState> inlets{test_stream(300.0, 2.0e5, {{aqueous, 0, 1.0}}),
                                              test_stream(360.0, 1.5e5, {{aqueous, 0, 2.0}, {aqueous, 1, 1.0}}),
                                              test_stream(330.0, 1.8e5, {{gas, 0, 1.0}})};
  std::vector<host::StreamState> outlets(2);
  const std::array<std::uint32_t, 1> in_counts{3};
  const std::array<std::uint32_t, 1> out_counts{2};
  const host::Solution solution = blender.solve(inlets, in_counts, outlets, out_counts);

  // The flow-weighted mean of 1 mol/s at 300 K, 3 at 360 K and 1 at 330 K is 342 K, exactly.
  const double blend = (1.0 * 300.0 + 3.0 * 360.0 + 1.0 * 330.0) / 5.0;
  CHECK(solution.results == std::vector<double>{5.0});
  for (const host::StreamState& out : outlets) {
    CHECK(out.temperature == Approx(blend).epsilon(1e-15));
    CHECK(out.pressure == 1.5e5);
    CHECK(total(out) == Approx(2.5).epsilon(1e-15));
  }
  for (std::size_t k = 0; k < outlets[0].flows.size(); ++k) {
    const double in = inlets[0].flows[k] + inlets[1].flows[k] + inlets[2].flows[k];
    CHECK(outlets[0].flows[k] + outlets[1].flows[k] == Approx(in).margin(1e-15));
  }
  // A bounded series: one point per inlet, so 3 of its 8.
  REQUIRE(solution.series.size() == 2);
  CHECK(solution.series[0].x == std::vector<double>{1.0, 4.0, 5.0});
  REQUIRE(solution.series[0].y.size() == 3);
  CHECK(solution.series[0].y[0] == 300.0);
  CHECK(solution.series[0].y[1] == Approx((300.0 + 3.0 * 360.0) / 4.0).epsilon(1e-15));
  CHECK(solution.series[0].y[2] == Approx(blend).epsilon(1e-15));
  // A series fixed at create: all 3 points.
  CHECK(solution.series[1].x == std::vector<double>{0.0, 0.5, 1.0});
  CHECK(solution.series[1].y[2] == Approx(blend).epsilon(1e-15));

  // One stream is as good as three, and fewer points come back.
  const std::array<std::uint32_t, 1> one{1};
  const host::Solution single = blender.solve(std::span(inlets).first(1), one, std::span(outlets).first(1), one);
  CHECK(single.series[0].x == std::vector<double>{1.0});
}

TEST_CASE("counts outside a list port's bounds are refused by the host and by the module") {
  const host::Module module(ABI_GOOD_MODULE);
  auto blender = module.create("blender", {}, test_slate());
  const std::vector<host::StreamState> nine(9, test_stream(300.0, 1e5, {{aqueous, 0, 1.0}}));
  std::vector<host::StreamState> outlets(1);
  const std::array<std::uint32_t, 1> nine_count{9};
  const std::array<std::uint32_t, 1> one{1};
  CHECK_THROWS_WITH(blender.solve(nine, nine_count, outlets, one),
                    Contains("port 'feed' of unit 'blender' takes 1 to 8 streams, not 9"));
  const std::array<std::uint32_t, 1> two{2};
  CHECK_THROWS_WITH(blender.solve(std::span(nine).first(3), two, outlets, one), Contains("add up to 2 streams; 3 were given"));
  // A plain port takes one stream.
  auto mixer = module.create("mixer", {}, test_slate());
  const std::array<std::uint32_t, 2> two_and_one{2, 1};
  CHECK_THROWS_WITH(mixer.solve(std::span(nine).first(3), two_and_one, outlets, one),
                    Contains("port 'feed_1' of unit 'mixer' takes 1 streams, not 2"));

  // The module checks the same on its own, for hosts that do not.
  const boost::dll::shared_library library{std::string(ABI_GOOD_MODULE)};
  const pfu_module* table = library.get<const pfu_module*()>(pfu_entry_symbol())();
  const pfu_unit_class* raw = nullptr;
  for (std::uint32_t i = 0; i < table->class_count; ++i) {
    if (std::string(table->classes[i].type) == "blender") raw = &table->classes[i];
  }
  REQUIRE(raw != nullptr);
  REQUIRE(raw->solve_call != nullptr);
  REQUIRE(raw->capability_count == 2);
  CHECK(raw->capabilities[0]->id == PFU_CAPABILITY_SERIES);
  CHECK(raw->capabilities[1]->id == PFU_CAPABILITY_OUTLETS_ONLY);
  const std::array<const char*, 1> components{"H2O"};
  const pfu_slate slate{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_slate)}, 1, 0, components.data(), nullptr};
  std::array<char, 512> message{};
  pfu_instance* instance = raw->create(nullptr, 0, &slate, message.data(), message.size());
  REQUIRE(instance != nullptr);
  std::array<double, 2> in_flows{1.0, 0.0};
  std::array<double, 2> out_flows{};
  const pfu_stream_state in{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_stream_state)}, 298.15, 101325.0, 2, 1, in_flows.data()};
  pfu_stream_state out{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_stream_state)}, 0.0, 0.0, 2, 1, out_flows.data()};
  const std::array<const pfu_stream_state*, 9> inlets{&in, &in, &in, &in, &in, &in, &in, &in, &in};
  pfu_stream_state* raw_outlets[] = {&out};
  double result = 0.0;
  std::array<double, 8> bx{}, by{};
  std::array<double, 5> px{}, py{};
  pfu_series_buffer blend{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_series_buffer)}, 8, 0, bx.data(), by.data()};
  pfu_series_buffer profile{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_series_buffer)}, 5, 0, px.data(), py.data()};
  pfu_series_buffer* series[] = {&blend, &profile};
  std::uint32_t in_count = 9;
  const std::uint32_t out_count = 1;
  pfu_solve_call call{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_solve_call)},
                      inlets.data(), raw_outlets, &in_count, &out_count, 9, 1, &result, 1, 2, series,
                      nullptr, 0, message.data(), message.size(), 0};
  CHECK(raw->solve_call(instance, &call) == PFU_INVALID_ARGUMENT);
  CHECK_THAT(message.data(), Contains("port 'feed' takes 1 to 8 streams; solve was given 9"));

  in_count = 2;
  call.inlet_count = 2;
  CHECK(raw->solve_call(instance, &call) == PFU_OK);
  CHECK(blend.count == 2);
  CHECK(profile.count == 5);
  CHECK(bx[1] == 2.0);
  CHECK(out_flows[0] == 2.0);

  // A series buffer smaller than the instance's length is refused, not overrun.
  profile.capacity = 4;
  CHECK(raw->solve_call(instance, &call) == PFU_INVALID_ARGUMENT);
  CHECK_THAT(message.data(), Contains("the buffer of series 'profile' holds 4 points; this instance fills 5"));
  profile.capacity = 5;

  // A host that asks for no series gets none, and the solve still works.
  call.series_count = 0;
  CHECK(raw->solve_call(instance, &call) == PFU_OK);

  // The solve of 1.2, as an older host calls it: one stream per port, no series.
  CHECK(raw->solve(instance, inlets.data(), 1, raw_outlets, 1, &result, 1, nullptr, 0, message.data(), message.size()) == PFU_OK);
  CHECK(result == 1.0);
  raw->destroy(instance);
}

TEST_CASE("a module of ABI 1.2 loads in a 1.3 host and solves through the solve of 1.2") {
  const host::Module module(ABI_MINOR_1_2_MODULE);
  CHECK(module.abi_minor() == 2);
  const host::UnitClassInfo* unit = module.find("copy_1_2");
  REQUIRE(unit != nullptr);
  REQUIRE(unit->ports.size() == 2);
  CHECK_FALSE(unit->ports[0].list);
  CHECK_FALSE(unit->ports[0].optional);
  CHECK(unit->ports[1].optional);  // 1.2's flags are read
  CHECK_FALSE(unit->ports[1].list);
  CHECK(unit->series.empty());

  auto instance = module.create("copy_1_2", Parameters{{"pressure_drop", 250.0}}, test_slate());
  CHECK(instance.series_lengths().empty());
  const std::vector<host::StreamState> inlets{test_stream(320.0, 3.0e5, {{aqueous, 0, 1.5}, {gas, 1, 0.5}})};
  std::vector<host::StreamState> outlets(1);
  const host::Solution solution = instance.solve(inlets, outlets);
  CHECK(outlets[0].pressure == 3.0e5 - 250.0);
  CHECK(outlets[0].flows == inlets[0].flows);
  CHECK(solution.results == std::vector<double>{250.0});
  CHECK(solution.series.empty());
  // It cannot take a list: the host says so rather than call it wrongly.
  const std::array<std::uint32_t, 1> two{2};
  const std::array<std::uint32_t, 1> one{1};
  const std::vector<host::StreamState> both{inlets[0], inlets[0]};
  CHECK_THROWS_WITH(instance.solve(both, two, outlets, one), Contains("takes 1 streams, not 2"));
}

TEST_CASE("a 1.3 host refuses what a later minor asks of it: a required capability, an unknown port flag") {
  const std::string capability = load_error(ABI_NEEDS_NEWER_HOST_MODULE);
  CHECK_THAT(capability, Contains(ABI_NEEDS_NEWER_HOST_MODULE));
  CHECK_THAT(capability, Contains("unit 'dynamic_copy' needs capability 'time stepping' (id 1000)"));
  CHECK_THAT(capability, Contains("unit ABI " + std::to_string(PFU_ABI_MAJOR) + "." + std::to_string(PFU_ABI_MINOR) +
                                  " does not know; it needs a newer host"));

  const std::string flag = load_error(ABI_UNKNOWN_PORT_FLAG_MODULE);
  CHECK_THAT(flag, Contains("unit 'flagged_copy' port 'feed' has port flags 0x40000000 unknown to unit ABI"));

  // A capability of a later minor that is not required is passed over: that module loads and runs.
  const host::Module later(ABI_NEWER_MINOR_MODULE);
  CHECK(later.find("future_copy")->series.empty());
}
