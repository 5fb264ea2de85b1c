// `protonflow run FLOWSHEET [-o RESULTS]`: solve, print the report, write the results atomically.
#include <ostream>

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
    out << flowsheet_report(solved);
    if (!options.results_file.empty()) out << fmt::format("\nResults written to {}\n", options.results_file);
    print_unit_warnings(session.flowsheet(), solution, err);
    return exit_ok;
  });
}

}  // namespace protonflow::host
