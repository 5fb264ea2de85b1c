// protonflow: the command-line host. This file only sets up the command line; each subcommand
// lives in its own file.
#include <exception>
#include <iostream>

#include <CLI/CLI.hpp>

#include "protonflow/thermo/database.hpp"
#include "speciate_command.hpp"

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
    speciate_command->add_option("--data-dir", data_directory, "directory of species data (*.yaml)")
        ->default_str(protonflow::thermo::default_data_directory().string());
    speciate_command->add_option("--max-iterations", speciate.max_iterations, "Newton iterations allowed")
        ->check(CLI::PositiveNumber)
        ->capture_default_str();

    try {
      app.parse(argc, argv);
    } catch (const CLI::ParseError& error) {
      // --help exits 0; every usage error is bad input (1), whatever CLI11's own code.
      return app.exit(error) == 0 ? 0 : protonflow::host::exit_bad_input;
    }

    if (speciate_command->parsed()) {
      speciate.data_directory =
          data_directory.empty() ? protonflow::thermo::default_data_directory() : std::filesystem::path(data_directory);
      return protonflow::host::run_speciate(speciate, std::cout, std::cerr);
    }
    return protonflow::host::exit_bad_input;
  } catch (const std::exception& error) {
    std::cerr << "protonflow: error: " << error.what() << "\n";
  } catch (...) {
    std::cerr << "protonflow: error: unexpected error\n";
  }
  return protonflow::host::exit_bad_input;
}
