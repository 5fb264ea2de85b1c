#include "units_test_support.hpp"

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <unistd.h>

#include "../support/temporary_directory.hpp"

namespace units_test {

host::StreamState stream(const host::Slate& slate, double temperature, double pressure) {
  host::StreamState state = host::empty_stream(slate);
  state.temperature = temperature;
  state.pressure = pressure;
  return state;
}

namespace {
std::size_t column_of(const host::Slate& slate, const std::string& component) {
  const auto found = std::ranges::find(slate.components, component);
  if (found == slate.components.end()) throw std::invalid_argument("no component " + component + " on the slate");
  return static_cast<std::size_t>(found - slate.components.begin());
}
}  // namespace

double& flow(host::StreamState& state, const host::Slate& slate, std::size_t row, const std::string& component) {
  return state.flows.at(row * slate.components.size() + column_of(slate, component));
}

double flow(const host::StreamState& state, const host::Slate& slate, std::size_t row, const std::string& component) {
  return state.flows.at(row * slate.components.size() + column_of(slate, component));
}

double column_total(const host::StreamState& state, const host::Slate& slate, std::size_t column) {
  double total = 0.0;
  for (std::size_t row = 0; row < slate.phase_count(); ++row) total += state.flows.at(row * slate.components.size() + column);
  return total;
}

double total_flow(const host::StreamState& state) {
  double total = 0.0;
  for (const double f : state.flows) total += f;
  return total;
}

std::vector<double> run_python(const std::string& script) {
  const protonflow::test_support::TemporaryDirectory directory;  // the script's own, removed after
  const auto path = directory.path() / "reference.py";
  std::ofstream(path) << script;
  const std::string command = std::string(UNITS_REFERENCE_PYTHON) + " " + path.string() + " 2>&1";
  FILE* pipe = popen(command.c_str(), "r");
  if (pipe == nullptr) throw std::runtime_error("cannot start " + command);
  std::string output;
  char buffer[4096];
  while (std::fgets(buffer, sizeof buffer, pipe) != nullptr) output += buffer;
  const int status = pclose(pipe);
  std::filesystem::remove(path);
  if (status != 0) throw std::runtime_error("reference script failed:\n" + output);
  std::istringstream text(output);
  std::vector<double> numbers;
  for (double x; text >> x;) numbers.push_back(x);
  return numbers;
}

bool warned(const host::Solution& solution, const std::string& text) {
  return std::ranges::any_of(solution.warnings, [&](const std::string& line) { return line.find(text) != std::string::npos; });
}

}  // namespace units_test
