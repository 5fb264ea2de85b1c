// The demo pickling plant of docs/performance.md, "Demo plant": host-demo/examples/flowsheets/
// pickling-plant.yaml (acid mixer, neutraliser to a target pH, six-stage scrubber with its sump, a splitter,
// one recycle) solved from a cold start — a fresh session, set-up included, every unit cold — in
// the process; solved again in a session whose units are warm; and as `protonflow run` end to end.
// Measures only; nothing here asserts on time.
#include <benchmark/benchmark.h>

#include <filesystem>
#include <string>
#include <vector>

#include "flowsheet_session.hpp"
#include "protonflow/thermo/database.hpp"
#include "run_program.hpp"

namespace fs = std::filesystem;
using namespace protonflow::host;

namespace {

const fs::path plant_flowsheet = fs::path(PROTONFLOW_EXAMPLES) / "flowsheets" / "pickling-plant.yaml";

FlowsheetOptions plant_options() {
  FlowsheetOptions options;
  options.file = plant_flowsheet.string();
  options.data_directory = protonflow::thermo::default_data_directory();
  return options;
}

void record_iterations(benchmark::State& state, const FlowsheetSolution& solution) {
  state.counters["recycle_iterations"] = solution.recycle ? static_cast<double>(solution.recycle->iterations) : 0.0;
}

// Set-up (species data, modules, planning, unit creation) and the solve from the file's estimates.
void plant_cold(benchmark::State& state) {
  const FlowsheetOptions options = plant_options();
  for (auto _ : state) {
    FlowsheetSession session(options);
    const FlowsheetSolution solution = session.solve();
    record_iterations(state, solution);
  }
}
BENCHMARK(plant_cold)->Unit(benchmark::kMillisecond);

// The solve alone, the units warm from the previous solve of the same session.
void plant_warm_solve(benchmark::State& state) {
  FlowsheetSession session(plant_options());
  for (auto _ : state) {
    const FlowsheetSolution solution = session.solve();
    record_iterations(state, solution);
  }
}
BENCHMARK(plant_warm_solve)->Unit(benchmark::kMillisecond);

// `protonflow run` on the plant: process start, set-up, solve, report.
void plant_run_end_to_end(benchmark::State& state) {
  const std::vector<std::string> arguments{"run", plant_flowsheet.string()};
  for (auto _ : state) {
    const protonflow::e2e::ProgramRun run = protonflow::e2e::run_program(PROTONFLOW_BINARY, arguments);
    if (run.exit_code != 0) state.SkipWithError(("protonflow run failed: " + run.err).c_str());
  }
}
BENCHMARK(plant_run_end_to_end)->Unit(benchmark::kMillisecond)->UseRealTime();

}  // namespace

BENCHMARK_MAIN();
