// End to end: `protonflow run` and `check` on the neutraliser's demo flowsheet
// (host-demo/examples/flowsheets/acid-waste-neutralisation.yaml, invented data), with the real
// neutraliser module: the target pH is met, the streams around the tank balance with the dose the
// unit reports, and `check` catches a changed result.
#include <cmath>
#include <filesystem>
#include <map>
#include <sstream>
#include <utility>
#include <string>
#include <vector>

#include <catch2/catch.hpp>
#include <yaml-cpp/yaml.h>

#include "host_test_support.hpp"
#include "run_program.hpp"

namespace fs = std::filesystem;
using Catch::Matchers::Contains;
using protonflow::e2e::ProgramRun;
using protonflow::host_test::read_text;
using protonflow::host_test::TemporaryDirectory;
using protonflow::host_test::write_text;

namespace {

const fs::path flowsheet = fs::path(PROTONFLOW_EXAMPLES) / "flowsheets" / "acid-waste-neutralisation.yaml";

ProgramRun run_protonflow(const std::vector<std::string>& arguments) {
  return protonflow::e2e::run_program(PROTONFLOW_BINARY, arguments);
}

double value(const YAML::Node& results, const std::string& name) {
  return results["units"]["tank"]["results"][name]["value"].as<double>();
}

// Total flow (mol/s) of one component over every phase of a stream of the results file.
double total(const YAML::Node& results, const std::string& stream, const std::string& component) {
  double sum = 0.0;
  for (const auto& phase : results["streams"][stream]["flows_mol_per_s"]) {
    if (phase.second[component]) sum += phase.second[component].as<double>();
  }
  return sum;
}

}  // namespace

TEST_CASE("run doses the demo acid waste to pH 9 with lime, and the tank balances with the reported dose") {
  const TemporaryDirectory directory;
  const fs::path results_file = directory.path() / "results.yaml";
  const fs::path series_directory = directory.path() / "series";
  const ProgramRun solved =
      run_protonflow({"run", flowsheet.string(), "-o", results_file.string(), "--series-dir", series_directory.string()});
  INFO("stdout: " << solved.out << "\nstderr: " << solved.err);
  REQUIRE(solved.exit_code == 0);
  CHECK_THAT(solved.out, Contains("outlet_ph") && Contains("reagent_flow") && Contains("process_gain"));
  CHECK_THAT(solved.err, Contains("too steep") && Contains("stages in series would serve"));
  const YAML::Node results = YAML::LoadFile(results_file.string());
  CHECK(value(results, "outlet_ph") == Approx(9.0).margin(1e-6));
  CHECK(value(results, "dry_solids_flow") > 0.0);
  // The titration curve as CSV: a header and the default 101 points, from the feed's pH at ratio 0
  // up to twice the dose, rising.
  const std::string csv = read_text(series_directory / "tank.titration.csv");
  std::istringstream lines(csv);
  std::string line;
  std::getline(lines, line);
  CHECK_THAT(line, Contains("reagent_ratio") && Contains("pH"));
  std::vector<std::pair<double, double>> points;
  while (std::getline(lines, line)) {
    const std::size_t comma = line.find(',');
    REQUIRE(comma != std::string::npos);
    points.emplace_back(std::stod(line.substr(0, comma)), std::stod(line.substr(comma + 1)));
  }
  REQUIRE(points.size() == 101);
  CHECK(points.front().first == 0.0);
  CHECK(points.back().first == Approx(2.0 * value(results, "reagent_ratio")).epsilon(1e-12));
  // Rising, or flat where a solid buffers the pH (portlandite at 12.39): on a plateau successive
  // answers differ by the solver's precision (scaled residual 1e-13, about 1e-11 in pH), either way.
  for (std::size_t i = 1; i < points.size(); ++i) CHECK(points[i].second >= points[i - 1].second - 1e-9);
  CHECK(points[50].second == Approx(9.0).margin(0.01));  // the midpoint is the dose, at the outlet temperature
  // Every component of treated + vent = acid_waste + s lime_slurry, s the dose over the slurry's flow.
  const double slurry_kg_per_s = results["streams"]["lime_slurry"]["mass_flow_kg_per_s"].as<double>();
  const double s = value(results, "reagent_flow") / slurry_kg_per_s;
  for (const std::string component : {"H2O", "H2SO4", "ZnO", "FeOOH", "Ca(OH)2"}) {
    INFO(component);
    const double in = total(results, "acid_waste", component) + s * total(results, "lime_slurry", component);
    const double out = total(results, "treated", component) + total(results, "vent", component);
    // The unit weighs water by atomic weights (18.01528 g/mol), the host by IAPWS-95's 18.015268:
    // the dose s carries their 7e-7 relative difference.
    CHECK(out == Approx(in).epsilon(1e-6).margin(1e-300));
  }
}

TEST_CASE("check passes on the neutraliser's recorded results and fails on a changed dose") {
  const TemporaryDirectory directory;
  const fs::path expected = directory.path() / "expected.yaml";
  const auto check = [&](const std::vector<std::string>& extra) {
    std::vector<std::string> arguments{"check", flowsheet.string(), "--expect", expected.string()};
    arguments.insert(arguments.end(), extra.begin(), extra.end());
    return run_protonflow(arguments);
  };
  const ProgramRun recorded = check({"--write-expect"});
  INFO("stdout: " << recorded.out << "\nstderr: " << recorded.err);
  REQUIRE(recorded.exit_code == 0);
  CHECK(check({}).exit_code == 0);

  std::string text = read_text(expected);
  const std::size_t at = text.find("reagent_ratio");
  REQUIRE(at != std::string::npos);
  const std::size_t digit = text.find_first_of("0123456789", at + std::string("reagent_ratio").size());
  REQUIRE(digit != std::string::npos);
  // 0.049... becomes 70.049...
  write_text(expected, text.substr(0, digit) + std::string("7") + text.substr(digit));
  const ProgramRun failed = check({});
  INFO("stdout: " << failed.out);
  CHECK(failed.exit_code == 3);
  CHECK_THAT(failed.out, Contains("reagent_ratio"));
}
