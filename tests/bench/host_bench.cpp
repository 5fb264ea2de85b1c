// The host benchmark of docs/performance.md: loading a unit module, reading a flowsheet, and the
// three-unit loop of tests/host/cases/recycle.yaml (test mixer, heater, splitter; one recycle) —
// solved in the process, with the median of every unit's solves, and as `protonflow run` end to
// end. Measures only; nothing here asserts on time.
#include <benchmark/benchmark.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "flowsheet_file.hpp"
#include "flowsheet_session.hpp"
#include "module_search.hpp"
#include "protonflow/thermo/database.hpp"
#include "run_program.hpp"

namespace fs = std::filesystem;
using namespace protonflow::host;

namespace {

const fs::path loop_flowsheet = fs::path(HOST_CASES) / "recycle.yaml";

std::string read_text(const fs::path& file) {
  std::ifstream stream(file);
  std::ostringstream text;
  text << stream.rdbuf();
  return text.str();
}

double median(std::vector<double> values) {
  if (values.empty()) return 0.0;
  std::nth_element(values.begin(), values.begin() + static_cast<std::ptrdiff_t>(values.size() / 2), values.end());
  return values[values.size() / 2];
}

FlowsheetOptions loop_options() {
  FlowsheetOptions options;
  options.file = loop_flowsheet.string();
  options.unit_dirs = {ABI_MODULE_DIR};  // the test mixer
  options.data_directory = protonflow::thermo::default_data_directory();
  return options;
}

// dlopen, the entry symbol, and every check of docs/unit-abi.md §9, then dlclose.
void module_load(benchmark::State& state, const char* file) {
  for (auto _ : state) {
    const protonflow::unit_host::Module module(file);
    benchmark::DoNotOptimize(module.classes().data());
  }
}
BENCHMARK_CAPTURE(module_load, heater, HEATER_MODULE)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(module_load, splitter, SPLITTER_MODULE)->Unit(benchmark::kMicrosecond);

// What the set-up below spends most of its time on, one by one.
void udunits_load(benchmark::State& state) {
  for (auto _ : state) {
    const UnitConverter units;
    benchmark::DoNotOptimize(&units);
  }
}
BENCHMARK(udunits_load)->Unit(benchmark::kMillisecond);

void species_data_load(benchmark::State& state) {
  for (auto _ : state) {
    const auto database = load_species_data(protonflow::thermo::default_data_directory());
    benchmark::DoNotOptimize(database->species().data());
  }
}
BENCHMARK(species_data_load)->Unit(benchmark::kMillisecond);

// The parse alone, of the same files' texts: what the first load in a process costs beyond reading.
void species_data_parse(benchmark::State& state) {
  std::vector<protonflow::thermo::DataText> texts;
  for (const auto& entry : fs::directory_iterator(protonflow::thermo::default_data_directory()))
    if (entry.path().extension() == ".yaml") texts.push_back({entry.path().string(), read_text(entry.path())});
  std::sort(texts.begin(), texts.end(), [](const auto& a, const auto& b) { return a.file < b.file; });
  for (auto _ : state) {
    const protonflow::thermo::Database database = protonflow::thermo::load_database(texts);
    benchmark::DoNotOptimize(database.species().data());
  }
}
BENCHMARK(species_data_parse)->Unit(benchmark::kMillisecond);

// Every module of the search path (the built-in directory and tests/abi) loaded and checked.
void module_scan(benchmark::State& state) {
  const std::vector<std::string> unit_dirs{ABI_MODULE_DIR};
  for (auto _ : state) {
    const UnitCatalog catalog = UnitCatalog::scan(unit_search_path(unit_dirs));
    benchmark::DoNotOptimize(catalog.modules().data());
  }
}
BENCHMARK(module_scan)->Unit(benchmark::kMicrosecond);

// The YAML of the loop flowsheet to a checked FlowsheetInput: units of measure and compositions.
void flowsheet_parse(benchmark::State& state) {
  const UnitConverter units;
  const std::string text = read_text(loop_flowsheet);
  for (auto _ : state) {
    const FlowsheetInput input = parse_flowsheet(text, loop_flowsheet.string(), units);
    benchmark::DoNotOptimize(input.streams.data());
  }
}
BENCHMARK(flowsheet_parse)->Unit(benchmark::kMicrosecond);

// Everything before the first solve: UDUNITS-2, species data, module search and load, binding,
// planning and creating the units.
void flowsheet_setup(benchmark::State& state) {
  const FlowsheetOptions options = loop_options();
  for (auto _ : state) {
    const FlowsheetSession session(options);
    benchmark::DoNotOptimize(&session);
  }
}
BENCHMARK(flowsheet_setup)->Unit(benchmark::kMillisecond);

// The loop solved in the process (units warm from the previous solve), with the median wall time
// of one solve of each unit over all passes.
void loop_solve(benchmark::State& state) {
  FlowsheetSession session(loop_options());
  std::vector<std::vector<double>> per_unit(session.flowsheet().units.size());
  long iterations = 0;
  for (auto _ : state) {
    const FlowsheetSolution solution = session.solve();
    iterations = solution.recycle ? solution.recycle->iterations : 0;
    for (std::size_t u = 0; u < per_unit.size(); ++u) {
      per_unit[u].insert(per_unit[u].end(), solution.units[u].solve_seconds.begin(), solution.units[u].solve_seconds.end());
    }
  }
  for (std::size_t u = 0; u < per_unit.size(); ++u) {
    state.counters[session.flowsheet().units[u].type + "_median_us"] = 1e6 * median(per_unit[u]);
  }
  state.counters["recycle_iterations"] = static_cast<double>(iterations);
}
BENCHMARK(loop_solve)->Unit(benchmark::kMicrosecond);

// `protonflow run` on the loop, end to end: process start, set-up, solve, report.
void run_end_to_end(benchmark::State& state) {
  const std::vector<std::string> arguments{"run", loop_flowsheet.string(), "--unit-dir", ABI_MODULE_DIR};
  for (auto _ : state) {
    const protonflow::e2e::ProgramRun run = protonflow::e2e::run_program(PROTONFLOW_BINARY, arguments);
    if (run.exit_code != 0) state.SkipWithError(("protonflow run failed: " + run.err).c_str());
  }
}
BENCHMARK(run_end_to_end)->Unit(benchmark::kMillisecond)->UseRealTime();

}  // namespace

BENCHMARK_MAIN();
