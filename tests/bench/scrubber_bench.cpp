// The scrubber benchmark of docs/performance.md: one column solve through the unit interface at 5,
// 10, 20 and 40 stages (a vent gas of HCl and water vapour in a CO2 carrier, on dilute caustic), to
// show the cost growing linearly with the stage count. Each solve starts from the column's own
// starting profile; the engine's speciation solvers keep their warm starts between solves, as
// they do in a flowsheet iteration. Measures only; nothing here asserts on time.
#include <benchmark/benchmark.h>

#include <protonflow/unit_host.hpp>

#include <vector>

namespace host = protonflow::unit_host;

namespace {

const host::Slate slate{{"H2O", "CO2", "HCl", "NaOH"}, {}};

host::StreamState stream(double temperature) {
  host::StreamState state = host::empty_stream(slate);
  state.temperature = temperature;
  state.pressure = 101325.0;
  return state;
}

void scrubber_column(benchmark::State& state) {
  static const host::Module module(SCRUBBER_MODULE);
  const double stages = static_cast<double>(state.range(0));
  auto unit = module.create("scrubber", std::vector<host::ParameterValue>{{"stages", stages}, {"efficiency", 0.7}}, slate);
  host::StreamState gas = stream(303.15);
  gas.flows[PFU_GAS_ROW * 4 + 0] = 0.02;   // H2O
  gas.flows[PFU_GAS_ROW * 4 + 1] = 1.0;    // CO2
  gas.flows[PFU_GAS_ROW * 4 + 2] = 1e-3;   // HCl
  host::StreamState liquor = stream(291.15);
  liquor.flows[PFU_AQUEOUS_ROW * 4 + 0] = 55.5;  // H2O, about 1 kg/s
  liquor.flows[PFU_AQUEOUS_ROW * 4 + 3] = 0.05;  // NaOH
  const std::vector<host::StreamState> inlets{gas, liquor, stream(291.15)};  // no reagent_in
  std::vector<host::StreamState> outlets(2);
  double iterations = 0.0;
  for (auto _ : state) {
    const host::Solution solution = unit.solve(inlets, outlets);
    iterations = solution.results.back();
    benchmark::DoNotOptimize(outlets);
  }
  state.counters["newton_iterations"] = iterations;
}

}  // namespace

BENCHMARK(scrubber_column)->Arg(5)->Arg(10)->Arg(20)->Arg(40)->Unit(benchmark::kMillisecond);
BENCHMARK_MAIN();
