// The scrubber benchmark of docs/performance.md: one column solve through the unit interface at 5,
// 10, 20 and 40 stages (a vent gas of HCl and water vapour in a CO2 carrier, on dilute caustic), to
// show the cost growing linearly with the stage count. `scrubber_column` solves from a cold start:
// each solve a fresh instance (created outside the timing), so the column starts from its own
// starting profile and every speciation from the engine's cold guess. `scrubber_column_warm` solves
// one instance again and again with the HCl load moving by 1 % between solves, as a recycle's
// passes do: the column then starts from its previous answer. Measures only; nothing here asserts
// on time.
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

host::Instance make_column(const host::Module& module, double stages) {
  return module.create("scrubber", std::vector<host::ParameterValue>{{"stages", stages}, {"efficiency", 0.7}}, slate);
}

std::vector<host::StreamState> feeds(double hcl) {
  host::StreamState gas = stream(303.15);
  gas.flows[PFU_GAS_ROW * 4 + 0] = 0.02;   // H2O
  gas.flows[PFU_GAS_ROW * 4 + 1] = 1.0;    // CO2
  gas.flows[PFU_GAS_ROW * 4 + 2] = hcl;    // HCl
  host::StreamState liquor = stream(291.15);
  liquor.flows[PFU_AQUEOUS_ROW * 4 + 0] = 55.5;  // H2O, about 1 kg/s
  liquor.flows[PFU_AQUEOUS_ROW * 4 + 3] = 0.05;  // NaOH
  return {gas, liquor, stream(291.15)};  // no reagent_in
}

// The column's Newton iterations, found by name among the class's declared results.
double newton_iterations(const host::Instance& unit, const host::Solution& solution) {
  const auto& results = unit.unit_class().results;
  for (std::size_t r = 0; r < results.size(); ++r)
    if (results[r].name == "newton_iterations") return solution.results[r];
  return 0.0;
}

const host::Module& scrubber_module() {
  static const host::Module module(SCRUBBER_MODULE);
  return module;
}

void scrubber_column(benchmark::State& state) {
  const double stages = static_cast<double>(state.range(0));
  const std::vector<host::StreamState> inlets = feeds(1e-3);
  std::vector<host::StreamState> outlets(2);
  double iterations = 0.0;
  for (auto _ : state) {
    state.PauseTiming();
    auto unit = make_column(scrubber_module(), stages);
    state.ResumeTiming();
    const host::Solution solution = unit.solve(inlets, outlets);
    iterations = newton_iterations(unit, solution);
    benchmark::DoNotOptimize(outlets);
    state.PauseTiming();  // the instance is destroyed outside the timing too
    { auto finished = std::move(unit); }
    state.ResumeTiming();
  }
  state.counters["newton_iterations"] = iterations;
}

void scrubber_column_warm(benchmark::State& state) {
  const double stages = static_cast<double>(state.range(0));
  auto unit = make_column(scrubber_module(), stages);
  const std::vector<host::StreamState> low = feeds(1e-3), high = feeds(1.01e-3);
  std::vector<host::StreamState> outlets(2);
  unit.solve(low, outlets);
  double iterations = 0.0;
  bool next_high = true;
  for (auto _ : state) {
    const host::Solution solution = unit.solve(next_high ? high : low, outlets);
    next_high = !next_high;
    iterations = newton_iterations(unit, solution);
    benchmark::DoNotOptimize(outlets);
  }
  state.counters["newton_iterations"] = iterations;
}

}  // namespace

BENCHMARK(scrubber_column)->Arg(5)->Arg(10)->Arg(20)->Arg(40)->Unit(benchmark::kMillisecond);
BENCHMARK(scrubber_column_warm)->Arg(5)->Arg(10)->Arg(20)->Arg(40)->Unit(benchmark::kMillisecond);
BENCHMARK_MAIN();
