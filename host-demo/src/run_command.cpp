// `protonflow run FLOWSHEET [-o RESULTS] [--series-dir DIR]`: solve, print the report, write the
// results and the series atomically.
#include <filesystem>
#include <ostream>
#include <system_error>

#include <fmt/format.h>

#include "atomic_file.hpp"
#include "flowsheet_commands.hpp"
#include "flowsheet_report.hpp"
#include "flowsheet_results.hpp"
#include "flowsheet_session.hpp"
#include "stream_properties.hpp"

namespace protonflow::host {

int run_flowsheet(const RunOptions& options, std::ostream& out, std::ostream& err) noexcept {
  return report_errors(options.file, err, [&]() -> int {
    FlowsheetSession session(options);
    for (const std::string& note : session.notes()) err << note << "\n";
    const FlowsheetSolution solution = session.solve();
    StreamAnalyser analyser(session.database(), session.flowsheet().slate, session.flowsheet().molar_masses);
    const SolvedFlowsheet solved = summarise(session.flowsheet(), solution, analyser);
    // The results file before the report: if it cannot be written the run has failed, and a
    // report on stdout must not suggest otherwise.
    if (!options.results_file.empty()) {
      write_file_atomically(options.results_file,
                            results_yaml(solved, {fmt::format("Results of {}, written by protonflow run.", options.file),
                                                  "Format: docs/flowsheet-format.md, section Results.", ""}));
    }
    std::size_t series_written = 0;
    if (!options.series_directory.empty()) {
      std::error_code error;
      std::filesystem::create_directories(options.series_directory, error);
      if (error) {
        throw FileWriteError(fmt::format("cannot create the series directory {}: {}", options.series_directory, error.message()));
      }
      const Flowsheet& flowsheet = session.flowsheet();
      for (std::size_t u = 0; u < flowsheet.units.size(); ++u) {
        const UnitNode& unit = flowsheet.units[u];
        for (std::size_t s = 0; s < unit.info.series.size() && s < solution.units[u].series.size(); ++s) {
          const std::filesystem::path file =
              std::filesystem::path(options.series_directory) / fmt::format("{}.{}.csv", unit.name, unit.info.series[s].name);
          write_file_atomically(file.string(), series_csv(unit.info.series[s], solution.units[u].series[s]));
          ++series_written;
        }
      }
    }
    out << flowsheet_report(solved);
    if (!options.results_file.empty()) out << fmt::format("\nResults written to {}\n", options.results_file);
    if (!options.series_directory.empty()) {
      out << fmt::format("{} series written to {} (UNIT.SERIES.csv)\n", series_written, options.series_directory);
    }
    print_unit_warnings(session.flowsheet(), solution, err);
    return exit_ok;
  });
}

}  // namespace protonflow::host
