// The C++ author helper at the boundary, seen from a host: parameter checks, inlet checks, outlet
// checks, exceptions turned into status codes, the warning channel, and raw calls that break the ABI.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstring>
#include <limits>
#include <string>
#include <vector>

#include <boost/dll/shared_library.hpp>
#include <protonflow/unit_host.hpp>

#include "abi_test_support.hpp"

using Catch::Matchers::Contains;
using Catch::Matchers::StartsWith;
using protonflow::abi_test::aqueous;
using protonflow::abi_test::gas;
using protonflow::abi_test::gypsum;
using protonflow::abi_test::test_slate;
using protonflow::abi_test::test_stream;
namespace host = protonflow::unit_host;
using Parameters = std::vector<host::ParameterValue>;

namespace {

const host::Module& good_module() {
  static const host::Module module(ABI_GOOD_MODULE);
  return module;
}

std::string create_error(std::string_view type, const Parameters& parameters) {
  try {
    (void)good_module().create(type, parameters, test_slate());
  } catch (const host::CreateError& error) {
    return error.what();
  }
  FAIL("created " << type);
  return {};
}

// The status and message of one solve expected to fail.
std::pair<pfu_status, std::string> solve_error(host::Instance& instance, const std::vector<host::StreamState>& inlets) {
  std::vector<host::StreamState> outlets(instance.unit_class().outlet_count());
  try {
    instance.solve(inlets, outlets);
  } catch (const host::SolveError& error) {
    return {error.status(), error.what()};
  }
  FAIL("the solve succeeded");
  return {};
}

const Parameters probe_needs{{"label", "abc"}, {"scale", 2.0}};

Parameters probe_with(std::initializer_list<host::ParameterValue> more) {
  Parameters parameters = probe_needs;
  parameters.insert(parameters.end(), more);
  return parameters;
}

const std::vector<host::StreamState> water{test_stream(298.15, 101325.0, {{aqueous, 0, 1.0}})};

}  // namespace

TEST_CASE("the mixer balances mass per phase and component and mixes temperature by its rule") {
  auto mixer = good_module().create("mixer", Parameters{{"pressure_drop", 500.0}}, test_slate());
  const std::vector<host::StreamState> inlets{
      test_stream(300.0, 2.0e5, {{aqueous, 0, 3.0}, {aqueous, 1, 0.5}, {gas, 0, 0.5}}),
      test_stream(360.0, 1.5e5, {{aqueous, 0, 1.0}, {aqueous, 2, 0.25}, {gypsum, 1, 0.75}})};
  std::vector<host::StreamState> outlets(1);
  const host::Solution solution = mixer.solve(inlets, outlets);
  for (std::size_t k = 0; k < outlets[0].flows.size(); ++k) {
    CHECK(outlets[0].flows[k] == inlets[0].flows[k] + inlets[1].flows[k]);
  }
  // By hand: 4 mol/s at 300 K and 2 mol/s at 360 K with equal heat capacities give 320 K.
  CHECK(outlets[0].temperature == Approx(320.0).epsilon(1e-14));
  CHECK(outlets[0].pressure == 1.5e5 - 500.0);  // the lowest inlet less the drop
  CHECK(solution.results == std::vector<double>{6.0, 60.0});
  CHECK(solution.warnings.empty());  // 320 K is below the default 333.15 K

  auto by_first = good_module().create("mixer", Parameters{{"pressure_rule", "first"}, {"warning_temperature", 310.0}},
                                       test_slate());
  const host::Solution warned = by_first.solve(inlets, outlets);
  CHECK(outlets[0].pressure == 2.0e5);
  REQUIRE(warned.warnings.size() == 1);
  CHECK_THAT(warned.warnings[0], StartsWith("mixer: outlet at 320"));
}

TEST_CASE("create checks every parameter against its declaration before the unit sees it") {
  CHECK_THAT(create_error("mixer", {{"bogus", 1.0}}),
             Contains("unknown parameter 'bogus' (known: pressure_drop, warning_temperature, pressure_rule)"));
  CHECK_THAT(create_error("mixer", {{"pressure_drop", -1.0}}),
             Contains("parameter 'pressure_drop' = -1 Pa is outside [0, 1e+07] Pa"));
  CHECK_THAT(create_error("mixer", {{"pressure_drop", std::numeric_limits<double>::quiet_NaN()}}),
             Contains("not a finite number"));
  CHECK_THAT(create_error("mixer", {{"pressure_drop", "high"}}), Contains("'pressure_drop' is a number, not text"));
  CHECK_THAT(create_error("mixer", {{"pressure_rule", 2.0}}), Contains("'pressure_rule' is text, not a number"));
  CHECK_THAT(create_error("mixer", {{"pressure_rule", "highest"}}),
             Contains("'pressure_rule' is 'highest'; allowed: 'lowest', 'first'"));
  CHECK_THAT(create_error("mixer", {{"pressure_drop", 1.0}, {"pressure_drop", 2.0}}), Contains("given twice"));
  CHECK_THAT(create_error("probe", {{"scale", 1.0}}), Contains("parameter 'label' must be given"));
  CHECK_THAT(create_error("probe", {{"label", "x"}}), Contains("parameter 'scale' must be given"));
  CHECK_NOTHROW(good_module().create("probe", probe_needs, test_slate()));
}

TEST_CASE("solve refuses an unphysical inlet before the unit sees it, naming port, phase and component") {
  auto passthrough = good_module().create("passthrough", {}, test_slate());
  auto [status, message] = solve_error(passthrough, {test_stream(298.15, 101325.0, {{gas, 2, -1e-3}})});
  CHECK(status == PFU_BAD_INLET);
  CHECK_THAT(message, Contains("inlet 'feed' has flow -0.001 mol/s of gas NaOH"));

  std::tie(status, message) = solve_error(passthrough, {test_stream(0.0, 101325.0, {})});
  CHECK(status == PFU_BAD_INLET);
  CHECK_THAT(message, Contains("temperature 0 K"));
  std::tie(status, message) = solve_error(passthrough, {test_stream(298.15, std::nan(""), {})});
  CHECK_THAT(message, Contains("pressure nan Pa"));

  auto probe = good_module().create("probe", probe_needs, test_slate());  // aqueous only
  std::tie(status, message) = solve_error(probe, {test_stream(298.15, 101325.0, {{gypsum, 1, 0.1}})});
  CHECK(status == PFU_BAD_INLET);
  CHECK_THAT(message, Contains("carries gypsum H2SO4 but does not accept that phase"));
}

TEST_CASE("every exception a unit throws becomes a status code with its message") {
  struct Case {
    const char* failure;
    pfu_status status;
    const char* message;
  };
  const std::array cases{Case{"invalid-parameter", PFU_INVALID_PARAMETER, "probe: asked to reject"},
                         Case{"bad-inlet", PFU_BAD_INLET, "probe: asked to refuse the inlet"},
                         Case{"not-converged", PFU_NOT_CONVERGED, "residual 1e-3 after 50 iterations"},
                         Case{"runtime-error", PFU_INTERNAL_ERROR, "internal error in unit 'probe': probe: a runtime error"},
                         Case{"unknown-exception", PFU_INTERNAL_ERROR, "an exception of unknown type"},
                         Case{"out-of-memory", PFU_OUT_OF_MEMORY, "unit 'probe' ran out of memory"}};
  for (const Case& c : cases) {
    INFO(c.failure);
    auto probe = good_module().create("probe", probe_with({{"failure", c.failure}}), test_slate());
    const auto [status, message] = solve_error(probe, water);
    CHECK(status == c.status);
    CHECK_THAT(message, Contains(c.message));
    // The same failure at create: no instance, the same message.
    CHECK_THAT(create_error("probe", probe_with({{"failure", c.failure}, {"stage", "create"}})), Contains(c.message));
  }
}

TEST_CASE("an outlet the unit left unset is an internal error, never a number that looks like an answer") {
  auto probe = good_module().create("probe", probe_with({{"failure", "unset-outlet"}}), test_slate());
  const auto [status, message] = solve_error(probe, water);
  CHECK(status == PFU_INTERNAL_ERROR);
  CHECK_THAT(message, Contains("unit 'probe' left outlet 'product' with flow nan mol/s of aqueous H2O"));
}

TEST_CASE("warnings cross as one line each, however many there are") {
  auto probe = good_module().create("probe", probe_with({{"warning_count", 1000.0}}), test_slate());
  std::vector<host::StreamState> outlets(1);
  const host::Solution solution = probe.solve(water, outlets);  // ~24 kB: more than the host's first buffer
  REQUIRE(solution.warnings.size() == 1000);
  CHECK(solution.warnings.front() == "probe warning 1 of many");  // the embedded newline became a space
  CHECK(solution.warnings.back() == "probe warning 1000 of many");
  CHECK(solution.results == std::vector<double>{3.0, 2.0});
}

// The raw C interface of the good module, for calls the host helper would never make.
class RawModule {
 public:
  RawModule() : library_(std::string(ABI_GOOD_MODULE)) {
    table_ = library_.get<const pfu_module*()>(pfu_entry_symbol())();
  }
  const pfu_unit_class& unit(std::string_view type) const {
    for (std::uint32_t i = 0; i < table_->class_count; ++i) {
      if (type == table_->classes[i].type) return table_->classes[i];
    }
    throw std::out_of_range(std::string(type));
  }

 private:
  boost::dll::shared_library library_;
  const pfu_module* table_;
};

TEST_CASE("raw calls: a small warnings buffer, a wrong count, a wrong shape and a short message buffer") {
  const RawModule raw;
  const pfu_unit_class& probe = raw.unit("probe");
  const std::array<const char*, 1> components{"H2O"};
  const pfu_slate slate{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_slate)}, 1, 0, components.data(), nullptr};
  const pfu_parameter_value label{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_parameter_value)}, "label", PFU_TEXT, 0.0, "x"};
  const pfu_parameter_value scale{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_parameter_value)}, "scale", PFU_NUMBER, 1.0, nullptr};
  const pfu_parameter_value warn{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_parameter_value)}, "warning_count", PFU_NUMBER, 3.0, nullptr};
  const std::array<const pfu_parameter_value*, 3> values{&label, &scale, &warn};
  std::array<char, 256> message{};
  pfu_instance* instance = probe.create(values.data(), 3, &slate, message.data(), message.size());
  REQUIRE(instance != nullptr);
  CHECK(message[0] == '\0');

  std::array<double, 2> in_flows{1.0, 0.0};  // aqueous H2O, gas H2O
  std::array<double, 2> out_flows{};
  const pfu_stream_state in{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_stream_state)}, 298.15, 101325.0, 2, 1, in_flows.data()};
  pfu_stream_state out{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_stream_state)}, 0.0, 0.0, 2, 1, out_flows.data()};
  const pfu_stream_state* inlets[] = {&in};
  pfu_stream_state* outlets[] = {&out};
  std::array<double, 2> results{};
  std::array<char, 40> warnings{};

  // Three warnings of 24 bytes do not fit in 40: the module says how much it needs.
  CHECK(probe.solve(instance, inlets, 1, outlets, 1, results.data(), 2, warnings.data(), warnings.size(), message.data(),
                    message.size()) == PFU_BUFFER_TOO_SMALL);
  CHECK_THAT(message.data(), Contains("the warnings need 73 bytes; the buffer holds 40"));

  std::array<char, 73> enough{};
  CHECK(probe.solve(instance, inlets, 1, outlets, 1, results.data(), 2, enough.data(), enough.size(), message.data(),
                    message.size()) == PFU_OK);
  CHECK(std::string(enough.data()) == "probe warning 1 of many\nprobe warning 2 of many\nprobe warning 3 of many\n");
  CHECK(out.temperature == 298.15);
  CHECK(out_flows == in_flows);

  CHECK(probe.solve(instance, inlets, 1, outlets, 1, results.data(), 1, enough.data(), enough.size(), message.data(),
                    message.size()) == PFU_INVALID_ARGUMENT);
  CHECK_THAT(message.data(), Contains("takes 1 inlets, 1 outlets and 2 results; solve was given 1, 1 and 1"));

  pfu_stream_state wrong_shape = out;
  wrong_shape.phase_count = 3;
  pfu_stream_state* wrong[] = {&wrong_shape};
  CHECK(probe.solve(instance, inlets, 1, wrong, 1, results.data(), 2, enough.data(), enough.size(), message.data(),
                    message.size()) == PFU_INVALID_ARGUMENT);
  CHECK_THAT(message.data(), Contains("outlet 'product' has 3 phases x 1 components; the slate has 2 x 1"));

  pfu_stream_state short_state = in;
  short_state.header.struct_size = 16;
  const pfu_stream_state* short_inlets[] = {&short_state};
  std::array<char, 12> tiny{};
  CHECK(probe.solve(instance, short_inlets, 1, outlets, 1, results.data(), 2, enough.data(), enough.size(), tiny.data(),
                    tiny.size()) == PFU_INVALID_ARGUMENT);
  CHECK(std::string(tiny.data()) == "inlet 'feed");  // cut to fit, still terminated

  CHECK(probe.solve(nullptr, inlets, 1, outlets, 1, results.data(), 2, enough.data(), enough.size(), message.data(),
                    message.size()) == PFU_INVALID_ARGUMENT);
  probe.destroy(instance);
  probe.destroy(nullptr);  // allowed, does nothing

  CHECK(probe.create(values.data(), 3, nullptr, message.data(), message.size()) == nullptr);
  CHECK_THAT(message.data(), Contains("no slate"));
}
