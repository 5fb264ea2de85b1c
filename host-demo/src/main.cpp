// protonflow: the command-line host. This file only sets up the command line; each subcommand
// lives in its own file.
#include <cstdlib>
#include <exception>
#include <iostream>

#include <CLI/CLI.hpp>

#include "flowsheet_commands.hpp"
#include "protonflow/thermo/database.hpp"
#include "speciate_command.hpp"

namespace {

// --unit-dir may be repeated; each directory is searched in the order given, before
// PROTONFLOW_UNIT_PATH and the built-in directory.
void add_unit_dirs(CLI::App* command, std::vector<std::string>& unit_dirs) {
  command->add_option("--unit-dir", unit_dirs, "directory of unit modules to search first (repeatable)")
      ->take_all()
      ->allow_extra_args(false);
}

void add_data_dir(CLI::App* command, std::string& data_directory) {
  command->add_option("--data-dir", data_directory, "directory of species data (*.yaml)")
      ->default_str(protonflow::thermo::default_data_directory().string());
}

std::filesystem::path data_dir_or_default(const std::string& data_directory) {
  return data_directory.empty() ? protonflow::thermo::default_data_directory() : std::filesystem::path(data_directory);
}

// The unit modules read their species data from $PROTONFLOW_DATA_DIR (else the build's data), not
// from the host: a --data-dir given on the command line is set there before any module loads, so
// the host and every unit of a run compute with the same data.
void share_data_dir_with_modules(const std::string& data_directory) {
  if (!data_directory.empty()) ::setenv("PROTONFLOW_DATA_DIR", data_directory.c_str(), 1);
}

}  // namespace

int main(int argc, char** argv) {
  try {
    CLI::App app{"protonflow: aqueous electrolyte equilibria and unit operations"};
    app.require_subcommand(1);

    protonflow::host::SpeciateOptions speciate;
    std::string data_directory;
    CLI::App* const speciate_command =
        app.add_subcommand("speciate", "Speciate one solution given in a YAML file (docs/solution-format.md)");
    speciate_command->add_option("FILE", speciate.file, "solution file (YAML)")->required();
    speciate_command->add_flag("--table", speciate.table, "write a fixed-width table instead of YAML");
    speciate_command->add_option("--stream", speciate.stream,
                                 "speciate this stream of a flowsheet file instead (docs/flowsheet-format.md)");
    speciate_command->add_option("--data-dir", data_directory, "directory of species data (*.yaml)")
        ->default_str(protonflow::thermo::default_data_directory().string());
    speciate_command->add_option("--max-iterations", speciate.max_iterations, "Newton iterations allowed")
        ->check(CLI::PositiveNumber)
        ->capture_default_str();

    protonflow::host::RunOptions run;
    CLI::App* const run_command =
        app.add_subcommand("run", "Solve a flowsheet (docs/flowsheet-format.md) and print its streams and units");
    run_command->add_option("FLOWSHEET", run.file, "flowsheet file (YAML)")->required();
    run_command->add_option("-o,--output", run.results_file, "write the full results as YAML to this file");
    run_command->add_option("--series-dir", run.series_directory,
                            "write each series a unit reports as CSV into this directory (UNIT.SERIES.csv)");
    add_unit_dirs(run_command, run.unit_dirs);
    add_data_dir(run_command, data_directory);

    protonflow::host::CheckOptions check;
    CLI::App* const check_command = app.add_subcommand(
        "check", "Solve a flowsheet and compare every stream and unit result with stored expectations");
    check_command->add_option("FLOWSHEET", check.file, "flowsheet file (YAML)")->required();
    check_command->add_option("--expect", check.expect_file, "expectations file (YAML)")->required();
    check_command->add_flag("--write-expect", check.write_expect,
                            "record the results as the new expectations (keeping the file's tolerances)");
    check_command->add_option("--junit", check.junit_file,
                              "also write the comparison as a JUnit XML report to this file, one test case per quantity");
    add_unit_dirs(check_command, check.unit_dirs);
    add_data_dir(check_command, data_directory);

    protonflow::host::UnitsOptions units;
    CLI::App* const units_command =
        app.add_subcommand("units", "List every unit type on the search path with its ports, parameters and results");
    add_unit_dirs(units_command, units.unit_dirs);

    try {
      app.parse(argc, argv);
    } catch (const CLI::ParseError& error) {
      // --help exits 0; every usage error is bad input (1), whatever CLI11's own code.
      return app.exit(error) == 0 ? 0 : protonflow::host::exit_bad_input;
    }

    if (speciate_command->parsed()) {
      speciate.data_directory = data_dir_or_default(data_directory);
      return protonflow::host::run_speciate(speciate, std::cout, std::cerr);
    }
    if (run_command->parsed()) {
      share_data_dir_with_modules(data_directory);
      run.data_directory = data_dir_or_default(data_directory);
      return protonflow::host::run_flowsheet(run, std::cout, std::cerr);
    }
    if (check_command->parsed()) {
      share_data_dir_with_modules(data_directory);
      check.data_directory = data_dir_or_default(data_directory);
      return protonflow::host::check_flowsheet(check, std::cout, std::cerr);
    }
    if (units_command->parsed()) return protonflow::host::list_units(units, std::cout, std::cerr);
    return protonflow::host::exit_bad_input;
  } catch (const std::exception& error) {
    std::cerr << "protonflow: error: " << error.what() << "\n";
  } catch (...) {
    std::cerr << "protonflow: error: unexpected error\n";
  }
  return protonflow::host::exit_bad_input;
}
