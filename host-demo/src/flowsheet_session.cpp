#include "flowsheet_session.hpp"

#include <algorithm>
#include <ostream>

#include <fmt/format.h>

#include "atomic_file.hpp"
#include "flowsheet_file.hpp"
#include "flowsheet_report.hpp"
#include "species_data.hpp"
#include "input_error.hpp"
#include "protonflow/thermo/errors.hpp"

namespace protonflow::host {


namespace {

int exit_code_for(pfu_status status) {
  switch (status) {
    case PFU_INVALID_PARAMETER:
    case PFU_BAD_INLET: return exit_bad_input;
    case PFU_NOT_CONVERGED: return exit_not_converged;
    default: return exit_unit_fault;
  }
}

}  // namespace

FlowsheetSession::FlowsheetSession(const FlowsheetOptions& options) : units_(std::make_unique<UnitConverter>()) {
  // The YAML first: a broken file is reported before the species data and every module load.
  FlowsheetInput input = read_flowsheet_file(options.file, *units_);
  database_ = load_species_data(options.data_directory);
  catalog_ = UnitCatalog::scan(unit_search_path(options.unit_dirs));
  flowsheet_ = bind_flowsheet(std::move(input), catalog_, *database_, *units_);
  order_ = plan_flowsheet(flowsheet_);
  for (std::size_t s = 0; s < flowsheet_.streams.size(); ++s) {
    const StreamNode& stream = flowsheet_.streams[s];
    if (stream.spec && flowsheet_.input.streams[*stream.spec].estimate &&
        std::ranges::find(order_.tears, s) == order_.tears.end()) {
      notes_.push_back(format_warning(stream.at, fmt::format("stream '{}' has a starting estimate, but it is not a "
                                                             "tear stream, so the estimate is not used",
                                                             stream.name)));
    }
  }
  instances_ = create_instances(flowsheet_);
}

FlowsheetSolution FlowsheetSession::solve() {
  try {
    FlowsheetSolution solution = solve_flowsheet(flowsheet_, instances_, order_);
    check_unconnected_outlets(solution);
    return solution;
  } catch (const UnitSolveFailure& error) {
    const UnitNode& unit = flowsheet_.units[error.unit()];
    throw FlowsheetFailure(unit.at,
                           fmt::format("unit '{}' ({}, module {}) failed {}: {}: {}", unit.name, unit.type,
                                       unit.module.file().string(), error.when().empty() ? "to solve" : error.when(),
                                       pfu_status_name(error.status()), error.what()),
                           exit_code_for(error.status()));
  } catch (const RecycleFailure& error) {
    const RecycleReport& report = error.report();
    const StreamNode& tear = flowsheet_.streams[report.tears.front()];
    std::vector<std::string> names;
    for (const std::size_t s : report.tears) names.push_back(flowsheet_.streams[s].name);
    throw FlowsheetFailure(
        tear.at,
        fmt::format("the recycle through tear stream{} {} did not converge: {}{}", names.size() == 1 ? "" : "s",
                    fmt::join(names, ", "), error.what(),
                    report.largest_change_at.empty() ? "" : fmt::format(", at {}", report.largest_change_at)),
        exit_not_converged,
        "history of the recycle (largest relative change of any tear variable, per iteration):\n" +
            recycle_history(report) +
            "try: more 'max_iterations', a 'damping' below 1 (e.g. 0.5), or a starting estimate ('estimate: true') "
            "for the tear stream\n");
  }
}

void FlowsheetSession::check_unconnected_outlets(const FlowsheetSolution& solution) const {
  for (std::size_t s = 0; s < flowsheet_.streams.size(); ++s) {
    const StreamNode& stream = flowsheet_.streams[s];
    if (!stream.unconnected || !stream.source_unit) continue;
    double total = 0.0;
    for (const double flow : solution.streams[s].flows) total += flow;
    if (total > 0.0) {
      const UnitNode& unit = flowsheet_.units[*stream.source_unit];
      throw FlowsheetFailure(unit.at,
                             fmt::format("unit '{}' ({}): outlet '{}' is not connected, but the unit sends {:.6g} mol/s "
                                         "through it; connect it to a stream under 'ports'",
                                         unit.name, unit.type, unit.outlet_ports[stream.source_port], total),
                             exit_bad_input);
    }
  }
}

int report_errors(const std::string& file, std::ostream& err, const std::function<int()>& work) noexcept {
  try {
    try {
      return work();
    } catch (const InputError& error) {
      err << format_diagnostic(error.where(), error.what()) << "\n";
      return exit_bad_input;
    } catch (const FlowsheetFailure& error) {
      err << format_diagnostic(error.where(), error.what()) << "\n" << error.details();
      return error.exit_code();
    } catch (const FileWriteError& error) {
      err << format_diagnostic(SourcePosition{file, 0, 0}, error.what()) << "\n";
      return exit_bad_input;
    } catch (const QuantityError& error) {
      err << format_diagnostic(SourcePosition{file, 0, 0}, error.what()) << "\n";
      return exit_bad_input;
    } catch (const std::exception& error) {
      err << format_diagnostic(SourcePosition{file, 0, 0}, fmt::format("unexpected error: {}", error.what())) << "\n";
    } catch (...) {
      err << format_diagnostic(SourcePosition{file, 0, 0}, "unexpected error of unknown type") << "\n";
    }
  } catch (...) {
    // Writing the message itself failed (stderr closed); the exit code still says what happened.
  }
  return exit_unit_fault;
}

void print_unit_warnings(const Flowsheet& flowsheet, const FlowsheetSolution& solution, std::ostream& err) {
  for (std::size_t u = 0; u < flowsheet.units.size(); ++u) {
    for (const std::string& warning : solution.units[u].warnings) {
      err << format_warning(flowsheet.units[u].at,
                            fmt::format("unit '{}' ({}): {}", flowsheet.units[u].name, flowsheet.units[u].type, warning))
          << "\n";
    }
  }
}

}  // namespace protonflow::host
