// The neutraliser benchmark of docs/performance.md: one target-pH solve of the neutraliser module,
// loaded as a host loads it, with the equilibrium solves its dose search took. The instance is
// reused, so every equilibrium warm-starts from the previous solve's. Measures only.
#include <benchmark/benchmark.h>

#include <protonflow/unit_host.hpp>

#include <string>
#include <utility>
#include <vector>

namespace host = protonflow::unit_host;

namespace {

constexpr double mol_per_kg_water = 1.0 / 0.018015268;  // IAPWS-95 molar mass of water
constexpr double atmosphere = 101325.0;                 // Pa

const host::Module& neutraliser_module() {
  static const host::Module module(NEUTRALISER_MODULE);
  return module;
}

host::StreamState solution(const host::Slate& slate, double water_kg, const std::vector<std::pair<std::string, double>>& solutes,
                           double temperature) {
  host::StreamState s = host::empty_stream(slate);
  s.temperature = temperature;
  s.pressure = atmosphere;
  const auto column = [&](const std::string& name) {
    for (std::size_t c = 0; c < slate.components.size(); ++c) {
      if (slate.components[c] == name) return c;
    }
    throw std::runtime_error("no component " + name);
  };
  s.flows[PFU_AQUEOUS_ROW * slate.components.size() + column("H2O")] = water_kg * mol_per_kg_water;
  for (const auto& [name, amount] : solutes) s.flows[PFU_AQUEOUS_ROW * slate.components.size() + column(name)] += amount;
  return s;
}

// Results 4 and 6 in the declared order: reagent_flow and dose_solves.
void solve_repeatedly(benchmark::State& state, const host::Slate& slate, const std::vector<host::ParameterValue>& parameters,
                      const host::StreamState& feed, const host::StreamState& reagent) {
  host::Instance unit = neutraliser_module().create("neutraliser", parameters, slate);
  const std::vector<host::StreamState> inlets{feed, reagent};
  std::vector<host::StreamState> outlets(2);
  double solves = 0.0;
  for (auto _ : state) {
    const host::Solution solution = unit.solve(inlets, outlets);
    solves = solution.results[6];
    benchmark::DoNotOptimize(solution.results[4]);
  }
  state.counters["equilibrium_solves"] = solves;
}

// 0.01 mol/kg HCl dosed with 0.1 mol/kg NaOH to pH 7, held at 25 °C: the steepest curve there is.
void target_ph_strong_acid(benchmark::State& state) {
  const host::Slate slate{{"H2O", "HCl", "NaOH"}, {}};
  solve_repeatedly(state, slate,
                   {{"mode", std::string("target_ph")}, {"target_ph", 7.0}, {"energy", std::string("at_temperature")}, {"curve_points", 2.0}},
                   solution(slate, 1.0, {{"HCl", 0.01}}, 298.15), solution(slate, 1.0, {{"NaOH", 0.1}}, 298.15));
}
BENCHMARK(target_ph_strong_acid)->Unit(benchmark::kMicrosecond);

// 2 wt % H2SO4 dosed with 10 wt % lime slurry to pH 9, adiabatic: gypsum precipitates, and the
// search alternates doses and adiabatic temperatures.
void target_ph_lime_adiabatic(benchmark::State& state) {
  const host::Slate slate{{"H2O", "H2SO4", "Ca(OH)2"}, {"gypsum", "portlandite"}};
  solve_repeatedly(state, slate, {{"mode", std::string("target_ph")}, {"target_ph", 9.0}, {"curve_points", 2.0}},
                   solution(slate, 0.98, {{"H2SO4", 0.02 / 0.0980785}}, 293.15),
                   solution(slate, 0.9, {{"Ca(OH)2", 0.1 / 0.0740927}}, 293.15));
}
BENCHMARK(target_ph_lime_adiabatic)->Unit(benchmark::kMicrosecond);

// The same held at 20 °C: the dose search alone, without the adiabatic rounds.
void target_ph_lime_at_temperature(benchmark::State& state) {
  const host::Slate slate{{"H2O", "H2SO4", "Ca(OH)2"}, {"gypsum", "portlandite"}};
  solve_repeatedly(state, slate,
                   {{"mode", std::string("target_ph")}, {"target_ph", 9.0}, {"energy", std::string("at_temperature")},
                    {"outlet_temperature", 293.15}, {"curve_points", 2.0}},
                   solution(slate, 0.98, {{"H2SO4", 0.02 / 0.0980785}}, 293.15),
                   solution(slate, 0.9, {{"Ca(OH)2", 0.1 / 0.0740927}}, 293.15));
}
BENCHMARK(target_ph_lime_at_temperature)->Unit(benchmark::kMicrosecond);

// A fixed dose of 0.1 mol/kg NaOH on 0.01 mol/kg HCl at equivalence, held at 25 °C, with a titration
// curve of state.range(0) points up to twice that dose: the curve's cost is the difference between
// 1,000 points and 2.
void titration_curve(benchmark::State& state) {
  const host::Slate slate{{"H2O", "HCl", "NaOH"}, {}};
  solve_repeatedly(state, slate,
                   {{"energy", std::string("at_temperature")}, {"curve_points", static_cast<double>(state.range(0))}},
                   solution(slate, 1.0, {{"HCl", 0.01}}, 298.15), solution(slate, 0.1, {{"NaOH", 0.01}}, 298.15));
}
BENCHMARK(titration_curve)->Arg(2)->Arg(1000)->Unit(benchmark::kMicrosecond);

}  // namespace

BENCHMARK_MAIN();
