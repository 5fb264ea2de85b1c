// The acid mixer benchmark of docs/performance.md: one solve of the acid_mixer module through the
// unit ABI, as a host calls it — 98 wt % H2SO4 let down adiabatically with water at 25 °C, to about
// 20 wt % (below boiling) and to about 50 wt % (boiling, steam flashed), with the mixing path of 21
// points and with the shortest path (2 points) to show what the path costs. Measures only.
#include <benchmark/benchmark.h>

#include <protonflow/unit_host.hpp>

#include <array>
#include <cstdint>
#include <string>
#include <vector>

namespace host = protonflow::unit_host;

namespace {

const host::Slate slate{{"H2O", "H2SO4"}, {}};
constexpr double mol_per_kg_water = 1.0 / 0.018015268;  // IAPWS-95 M(H2O)
constexpr double molar_mass_h2so4 = 0.0980785;          // kg/mol, python3-periodictable

host::StreamState liquor(double kg_per_s, double acid_fraction) {
  host::StreamState state = host::empty_stream(slate);
  state.temperature = 298.15;
  state.pressure = 101325.0;
  state.flows[0] = kg_per_s * (1.0 - acid_fraction) * mol_per_kg_water;
  state.flows[1] = kg_per_s * acid_fraction / molar_mass_h2so4;
  return state;
}

// 1 kg/s of 98 % acid into `water` kg/s of water.
void dilution(benchmark::State& state, double water, double path_points) {
  const host::Module module(ACID_MIXER_MODULE);
  auto mixer = module.create("acid_mixer", std::vector<host::ParameterValue>{{"path_points", path_points}}, slate);
  const std::vector<host::StreamState> inlets{liquor(water, 0.0), liquor(1.0, 0.98)};
  std::vector<host::StreamState> outlets(1);
  const std::array<std::uint32_t, 1> feeds{2};
  const std::array<std::uint32_t, 1> one{1};
  for (auto _ : state) {
    const host::Solution solution = mixer.solve(inlets, feeds, outlets, one);
    benchmark::DoNotOptimize(solution.results.data());
  }
  state.counters["outlet_K"] = outlets[0].temperature;
}
BENCHMARK_CAPTURE(dilution, to_20_percent_path_21, 3.9, 21.0)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(dilution, to_20_percent_path_2, 3.9, 2.0)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(dilution, to_50_percent_boiling_path_21, 0.96, 21.0)->Unit(benchmark::kMicrosecond);

}  // namespace

BENCHMARK_MAIN();
