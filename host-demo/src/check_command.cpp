// `protonflow check FLOWSHEET --expect EXPECTED [--write-expect]`: regression-test a flowsheet's
// results against stored expectations, or record them.
#include <filesystem>
#include <ostream>

#include <fmt/format.h>

#include "atomic_file.hpp"
#include "expectations.hpp"
#include "flowsheet_commands.hpp"
#include "flowsheet_results.hpp"
#include "flowsheet_session.hpp"
#include "junit_report.hpp"
#include "stream_properties.hpp"

namespace protonflow::host {

int check_flowsheet(const CheckOptions& options, std::ostream& out, std::ostream& err) noexcept {
  return report_errors(options.file, err, [&]() -> int {
    FlowsheetSession session(options);
    const QuantityReader quantities(session.units(), session.flowsheet().input.gauge_reference);
    // Read the expectations before solving: a missing or broken file is found at once. When
    // recording, an existing file is read only for its tolerances, which are kept.
    Expectations expected;
    if (!options.write_expect || std::filesystem::exists(options.expect_file)) {
      expected = read_expectations(options.expect_file, quantities);
    }
    for (const std::string& note : session.notes()) err << note << "\n";
    const FlowsheetSolution solution = session.solve();
    StreamAnalyser analyser(session.database(), session.flowsheet().slate, session.flowsheet().molar_masses);
    const SolvedFlowsheet solved = summarise(session.flowsheet(), solution, analyser);
    print_unit_warnings(session.flowsheet(), solution, err);
    const std::vector<ResultQuantity> actual = flatten(solved);
    if (options.write_expect) {
      write_file_atomically(options.expect_file, expectations_yaml(solved, expected.tolerances_text));
      out << fmt::format("recorded {} quantities of {} in {}\n", actual.size(), options.file, options.expect_file);
      return exit_ok;
    }
    const Comparison comparison = compare(expected, actual, quantities);
    if (!options.junit_file.empty()) {
      write_file_atomically(options.junit_file, junit_xml(comparison, options.file, options.expect_file));
    }
    if (comparison.differences.empty()) {
      out << fmt::format("check passed: all {} quantities of {} match {}\n", comparison.compared, options.file,
                         options.expect_file);
      return exit_ok;
    }
    out << fmt::format("check FAILED: {} of {} quantities of {} differ from {}\n", comparison.differences.size(),
                       std::max(comparison.compared, actual.size()), options.file, options.expect_file);
    out << differences_table(comparison);
    return exit_differences;
  });
}

}  // namespace protonflow::host
