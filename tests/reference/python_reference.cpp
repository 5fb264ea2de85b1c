#include "python_reference.hpp"

#include <cstdio>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <filesystem>
#include <unistd.h>

#include "../support/temporary_directory.hpp"

namespace protonflow::reference {

std::vector<double> run_python(const std::string& script) {
  const protonflow::test_support::TemporaryDirectory directory;  // the script's own, removed after
  const auto path = directory.path() / "reference.py";
  std::ofstream(path) << script;
  const std::string command = std::string(PROTONFLOW_REFERENCE_PYTHON) + " " + path.string() + " 2>&1";
  FILE* pipe = popen(command.c_str(), "r");
  if (!pipe) throw std::runtime_error("cannot start " + command);
  std::string output;
  char buffer[4096];
  while (std::fgets(buffer, sizeof buffer, pipe)) output += buffer;
  const int status = pclose(pipe);
  std::filesystem::remove(path);
  if (status != 0) throw std::runtime_error("reference script failed:\n" + output);
  std::istringstream stream(output);
  std::vector<double> numbers;
  for (double x; stream >> x;) numbers.push_back(x);
  return numbers;
}

}  // namespace protonflow::reference
