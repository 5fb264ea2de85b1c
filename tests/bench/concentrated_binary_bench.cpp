// The adiabatic dilution of 98 wt % H2SO4 with water at 25 °C (docs/performance.md, "Concentrated
// binaries"): feed enthalpies, the mixed enthalpy, and the outlet from adiabatic_outlet — to 20 wt %
// (a liquid at about 65 °C) and to 70 wt % (boiling: the liquid at its bubble point with the steam).
#include <benchmark/benchmark.h>

#include "protonflow/thermo/concentrated_binary.hpp"

using namespace protonflow::thermo;

namespace {

AdiabaticOutlet dilute_98_percent(double target) {
  const ConcentratedBinary b = ConcentratedBinary::sulfuric_acid;
  const double water = 0.98 / target - 1.0;  // kg water per kg acid
  const double h =
      (binary_specific_enthalpy(b, 298.15, 0.98) + water * binary_specific_enthalpy(b, 298.15, 0.0)) / (1.0 + water);
  return adiabatic_outlet(b, target, h, 101325.0);
}

void adiabatic_dilution_to_20_percent(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(dilute_98_percent(0.20));
  state.counters["outlet_C"] = dilute_98_percent(0.20).temperature - 273.15;
}
BENCHMARK(adiabatic_dilution_to_20_percent)->Unit(benchmark::kMicrosecond);

void adiabatic_dilution_to_70_percent_boiling(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(dilute_98_percent(0.70));
  const AdiabaticOutlet o = dilute_98_percent(0.70);
  state.counters["outlet_C"] = o.temperature - 273.15;
  state.counters["steam_kg_per_kg"] = o.vapour_fraction;
}
BENCHMARK(adiabatic_dilution_to_70_percent_boiling)->Unit(benchmark::kMicrosecond);

void properties_of_50_percent(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(binary_properties(ConcentratedBinary::sulfuric_acid, 330.0, 0.5));
}
BENCHMARK(properties_of_50_percent)->Unit(benchmark::kMicrosecond);

}  // namespace

BENCHMARK_MAIN();
