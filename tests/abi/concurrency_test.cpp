// Reentrancy: two instances solving at once in two threads give exactly what each gives alone.
#include <catch2/catch.hpp>

#include <thread>
#include <vector>

#include <protonflow/unit_host.hpp>

#include "abi_test_support.hpp"

using protonflow::abi_test::aqueous;
using protonflow::abi_test::gas;
using protonflow::abi_test::test_slate;
using protonflow::abi_test::test_stream;
namespace host = protonflow::unit_host;

namespace {

constexpr int solves = 2000;

// What one solve gives: the outlet, the results and the warnings, all compared exactly.
struct Answer {
  host::StreamState outlet;
  host::Solution solution;
  bool operator==(const Answer& other) const {
    return outlet.temperature == other.outlet.temperature && outlet.pressure == other.outlet.pressure &&
           outlet.flows == other.outlet.flows && solution.results == other.solution.results &&
           solution.warnings == other.solution.warnings;
  }
};

// Inlets that differ from solve to solve, and between the two workers.
std::vector<host::StreamState> inlets_for(int worker, int step) {
  const double x = 1.0 + 0.001 * step + worker;
  return {test_stream(290.0 + 0.01 * step, 1.0e5 + 10.0 * step, {{aqueous, 0, x}, {aqueous, 1, 0.1 * x}}),
          test_stream(350.0 + 20.0 * worker, 1.2e5, {{aqueous, 0, 0.5 * x}, {gas, 2, 0.01 * step}})};
}

std::vector<Answer> run(host::Instance& instance, int worker) {
  std::vector<Answer> answers;
  for (int step = 0; step < solves; ++step) {
    Answer answer;
    std::vector<host::StreamState> outlets(1);
    answer.solution = instance.solve(inlets_for(worker, step), outlets);
    answer.outlet = outlets[0];
    answers.push_back(std::move(answer));
  }
  return answers;
}

const std::vector<std::vector<host::ParameterValue>> settings{
    {{"pressure_drop", 100.0}, {"warning_temperature", 300.0}},  // outlets near 309 K: warns
    {{"pressure_rule", "first"}, {"warning_temperature", 360.0}}};  // outlets near 315 K: silent

}  // namespace

TEST_CASE("two instances solving concurrently in two threads do not disturb each other") {
  const host::Module module(ABI_GOOD_MODULE);

  // Each worker's answers alone, one after the other, on fresh instances.
  std::vector<std::vector<Answer>> alone;
  for (int worker = 0; worker < 2; ++worker) {
    auto instance = module.create("mixer", settings[worker], test_slate());
    alone.push_back(run(instance, worker));
  }

  std::vector<host::Instance> instances;
  for (int worker = 0; worker < 2; ++worker) instances.push_back(module.create("mixer", settings[worker], test_slate()));
  std::vector<std::vector<Answer>> together(2);
  {
    std::jthread first([&] { together[0] = run(instances[0], 0); });
    std::jthread second([&] { together[1] = run(instances[1], 1); });
  }

  for (int worker = 0; worker < 2; ++worker) {
    INFO("worker " << worker);
    REQUIRE(together[worker].size() == alone[worker].size());
    int differing = 0;
    for (std::size_t i = 0; i < alone[worker].size(); ++i) differing += together[worker][i] == alone[worker][i] ? 0 : 1;
    CHECK(differing == 0);
  }
  // The two settings really differ, so a shared state would show.
  CHECK(alone[0].front().outlet.pressure != alone[1].front().outlet.pressure);
  CHECK(alone[0].front().solution.warnings.size() != alone[1].front().solution.warnings.size());
}
