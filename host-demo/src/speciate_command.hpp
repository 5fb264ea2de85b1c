// `protonflow speciate`: one solution in, its speciation out.
#pragma once

#include <filesystem>
#include <iosfwd>
#include <string>

namespace protonflow::host {

enum ExitCode : int {
  exit_ok = 0,
  exit_bad_input = 1,      // the message on stderr says what and where
  exit_not_converged = 2,  // the residual of every equation is printed
};

struct SpeciateOptions {
  std::string file;
  std::string stream;  // if given: file is a flowsheet, and this stream of it is speciated
  bool table = false;
  std::filesystem::path data_directory;
  long max_iterations = 200;  // Newton iterations allowed (the engine's default)
};

// Runs the command, writing the report to out and diagnostics to err. Never throws.
int run_speciate(const SpeciateOptions& options, std::ostream& out, std::ostream& err) noexcept;

}  // namespace protonflow::host
