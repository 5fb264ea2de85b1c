// Runs a program as a user would, capturing what it writes and how it exits.
#pragma once

#include <string>
#include <vector>

namespace protonflow::e2e {

struct ProgramRun {
  int exit_code = -1;  // the exit status; minus the signal number if a signal killed it
  std::string out;     // everything written to stdout
  std::string err;     // everything written to stderr
};

// Starts program with arguments (argv[1..]), stdin from /dev/null, and waits for it.
ProgramRun run_program(const std::string& program, const std::vector<std::string>& arguments);

}  // namespace protonflow::e2e
