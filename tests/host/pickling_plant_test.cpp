// End to end: the demo pickling plant (host-demo/examples/flowsheets/pickling-plant.yaml, invented
// data) — acid mixer, neutraliser, scrubber, two splitters and two recycles — solved from a cold
// start by `protonflow run`; the plant balances as a whole; `check --junit` reports the comparison
// as JUnit XML, parsed back here by Python's xml.etree.
#include <cctype>
#include <cmath>
#include <filesystem>
#include <map>
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

const fs::path flowsheet = fs::path(PROTONFLOW_EXAMPLES) / "flowsheets" / "pickling-plant.yaml";

ProgramRun run_protonflow(const std::vector<std::string>& arguments) {
  return protonflow::e2e::run_program(PROTONFLOW_BINARY, arguments);
}

// Total flow (mol/s) of each component over every phase of a stream of the results file.
std::map<std::string, double> totals(const YAML::Node& results, const std::string& stream) {
  std::map<std::string, double> sum;
  for (const auto& phase : results["streams"][stream]["flows_mol_per_s"]) {
    for (const auto& component : phase.second) sum[component.first.as<std::string>()] += component.second.as<double>();
  }
  return sum;
}

// Atoms of each element in a component's formula: element symbols, counts, parentheses
// ("Ca(OH)2", "FeCl2", "H2O").
std::map<std::string, double> atoms(const std::string& formula, std::size_t& at) {
  std::map<std::string, double> count;
  const auto number = [&]() {
    double n = 0.0;
    bool any = false;
    while (at < formula.size() && std::isdigit(static_cast<unsigned char>(formula[at]))) {
      n = 10 * n + (formula[at++] - '0');
      any = true;
    }
    return any ? n : 1.0;
  };
  while (at < formula.size() && formula[at] != ')') {
    if (formula[at] == '(') {
      ++at;
      const std::map<std::string, double> group = atoms(formula, at);
      ++at;  // ')'
      const double n = number();
      for (const auto& [element, k] : group) count[element] += n * k;
    } else {
      std::string element(1, formula[at++]);
      while (at < formula.size() && std::islower(static_cast<unsigned char>(formula[at]))) element += formula[at++];
      count[element] += number();
    }
  }
  return count;
}

std::map<std::string, double> atoms(const std::string& formula) {
  std::size_t at = 0;
  return atoms(formula, at);
}

double unit_result(const YAML::Node& results, const std::string& unit, const std::string& name) {
  return results["units"][unit]["results"][name]["value"].as<double>();
}

}  // namespace

TEST_CASE("the pickling plant converges from a cold start and balances as a whole") {
  const TemporaryDirectory directory;
  const fs::path results_file = directory.path() / "results.yaml";
  const ProgramRun solved = run_protonflow({"run", flowsheet.string(), "-o", results_file.string()});
  INFO("stdout: " << solved.out << "\nstderr: " << solved.err);
  REQUIRE(solved.exit_code == 0);
  const YAML::Node results = YAML::LoadFile(results_file.string());

  // The neutraliser doses the lime stream as a template: s = dosed flow over the stream's flow.
  const double s = unit_result(results, "neutraliser", "reagent_flow") /
                   results["streams"]["lime_slurry"]["mass_flow_kg_per_s"].as<double>();
  std::map<std::string, double> in;
  for (const std::string stream : {"spent_pickle_liquor", "rinse_water", "tank_vent", "caustic"}) {
    for (const auto& [component, flow] : totals(results, stream)) in[component] += flow;
  }
  for (const auto& [component, flow] : totals(results, "lime_slurry")) in[component] += s * flow;
  std::map<std::string, double> out;
  for (const std::string stream : {"effluent", "stack_gas", "neutraliser_vent", "sump_sludge"}) {
    for (const auto& [component, flow] : totals(results, stream)) out[component] += flow;
  }

  // Components (hence mass): what enters leaves, to the recycle tolerance (1e-9 relative) and the
  // 7e-7 by which the neutraliser's and the host's molar masses of water differ within s.
  double scale = 0.0;
  for (const auto& [component, flow] : in) scale = std::max(scale, std::abs(flow));
  for (const auto& [component, flow] : in) {
    INFO(component);
    CHECK(out[component] == Approx(flow).epsilon(1e-6).margin(1e-9 * scale));
  }
  for (const auto& [component, flow] : out) {
    INFO(component << " leaves but never entered");
    CHECK((in.contains(component) || std::abs(flow) <= 1e-9 * scale));
  }
  // Elements of the components' formulas, and charge: every component is a neutral formula, so
  // the charge carried is zero on both sides; the element sums must agree.
  std::map<std::string, double> elements_in;
  std::map<std::string, double> elements_out;
  for (const auto& [component, flow] : in) {
    for (const auto& [element, n] : atoms(component)) elements_in[element] += n * flow;
  }
  for (const auto& [component, flow] : out) {
    for (const auto& [element, n] : atoms(component)) elements_out[element] += n * flow;
  }
  for (const auto& [element, flow] : elements_in) {
    INFO(element);
    CHECK(elements_out[element] == Approx(flow).epsilon(1e-6).margin(1e-9 * scale));
  }

  // The plant does what it is for.
  CHECK(unit_result(results, "neutraliser", "outlet_ph") == Approx(9.5).margin(1e-6));
  CHECK(unit_result(results, "neutraliser", "dissolved_fe") < 5.0);  // mg/L
  CHECK(unit_result(results, "vent_scrubber", "removal_hcl") > 0.9);
  CHECK_THAT(solved.out, Contains("stack_gas") && Contains("effluent"));
}

TEST_CASE("check --junit writes one test case per compared quantity, the differing ones as failures") {
  const TemporaryDirectory directory;
  const fs::path expected = directory.path() / "expected.yaml";
  const fs::path junit = directory.path() / "report.xml";
  const auto check = [&](const std::vector<std::string>& extra) {
    std::vector<std::string> arguments{"check", flowsheet.string(), "--expect", expected.string()};
    arguments.insert(arguments.end(), extra.begin(), extra.end());
    return run_protonflow(arguments);
  };
  const ProgramRun recorded = check({"--write-expect"});
  INFO("stdout: " << recorded.out << "\nstderr: " << recorded.err);
  REQUIRE(recorded.exit_code == 0);

  // Python's own XML parser reads the report back: tests, failures, and the failing names.
  const std::string reader =
      "import sys, xml.etree.ElementTree as ET\n"
      "root = ET.parse(sys.argv[1]).getroot()\n"
      "suite = root.find('testsuite')\n"
      "cases = suite.findall('testcase')\n"
      "failed = [c.get('name') for c in cases if c.find('failure') is not None]\n"
      "assert int(suite.get('tests')) == len(cases), 'tests attribute'\n"
      "assert int(suite.get('failures')) == len(failed), 'failures attribute'\n"
      "print(len(cases)); print(len(failed)); print('\\n'.join(failed))\n";
  const fs::path script = directory.path() / "read_junit.py";
  write_text(script, reader);
  const auto parse = [&]() {
    const ProgramRun parsed = protonflow::e2e::run_program("/usr/bin/python3", {script.string(), junit.string()});
    INFO("python: " << parsed.out << parsed.err);
    REQUIRE(parsed.exit_code == 0);
    return parsed.out;
  };

  const ProgramRun passed = check({"--junit", junit.string()});
  INFO("stdout: " << passed.out);
  REQUIRE(passed.exit_code == 0);
  const std::string all_pass = parse();
  const std::size_t cases = std::stoul(all_pass);
  CHECK(cases > 100);
  CHECK(all_pass.substr(all_pass.find('\n') + 1, 2) == "0\n");
  // The count of quantities the check names is the count of test cases.
  CHECK_THAT(passed.out, Contains(std::to_string(cases) + " quantities"));

  // Change one recorded value: exactly one failure, named by its path.
  std::string text = read_text(expected);
  const std::size_t at = text.find("reagent_ratio");
  REQUIRE(at != std::string::npos);
  const std::size_t digit = text.find_first_of("0123456789", at + std::string("reagent_ratio").size());
  write_text(expected, text.substr(0, digit) + "7" + text.substr(digit));
  const ProgramRun failed = check({"--junit", junit.string()});
  CHECK(failed.exit_code == 3);
  const std::string one_fails = parse();
  CHECK(std::stoul(one_fails) == cases);
  CHECK_THAT(one_fails, Contains("\n1\n") && Contains("reagent_ratio"));
  // The report is valid XML even where a text holds markup characters.
  CHECK_THAT(read_text(junit), Contains("<failure message=\"expected"));
}
