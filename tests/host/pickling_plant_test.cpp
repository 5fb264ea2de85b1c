// End to end: the demo pickling plant (host-demo/examples/flowsheets/pickling-plant.yaml, invented
// data) — acid mixer, neutraliser, a scrubber with its sump, the clarifier's splitter and the
// treated-water recycle — solved from a cold start by `protonflow run`; the plant balances as a whole; `check --junit` reports the comparison
// as JUnit XML, parsed back here by Python's xml.etree.
#include <algorithm>
#include <cctype>
#include <cmath>
#include <filesystem>
#include <map>
#include <string>
#include <vector>

#include <catch2/catch.hpp>
#include <yaml-cpp/yaml.h>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/constants.hpp>
#include <protonflow/thermo/database.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>

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

// The enthalpy flow (W) of a stream of the results file, recomputed here through protonflow_thermo
// as the units compute it (docs/energy.md): its liquid and solids at their equilibrium at the
// stream's T and P in the system the chemistry units build over the slate (Davies, every solid the
// slate reaches allowed to precipitate), its gas row as ideal gases from the species data.
class PlantEnthalpy {
 public:
  explicit PlantEnthalpy(const YAML::Node& results)
      : database_(protonflow::thermo::load_database(protonflow::thermo::default_data_directory())),
        components_(results["components"].as<std::vector<std::string>>()),
        gas_system_(database_, components_, with_gas()),
        liquid_system_(database_, components_, reach_solids()),
        solver_(liquid_system_) {}

  double operator()(const YAML::Node& results, const std::string& stream, double multiple = 1.0) {
    const YAML::Node node = results["streams"][stream];
    const double temperature = node["temperature_K"].as<double>();
    const double pressure = node["pressure_Pa"].as<double>();
    std::vector<double> condensed(components_.size(), 0.0);
    double enthalpy = 0.0;
    for (const auto& phase : node["flows_mol_per_s"]) {
      const bool gas = phase.first.as<std::string>() == "gas";
      for (std::size_t c = 0; c < components_.size(); ++c) {
        const double flow = multiple * phase.second[components_[c]].as<double>();
        if (flow == 0.0) continue;
        if (!gas) {
          condensed[c] += flow;
          continue;
        }
        bool found = false;
        for (const protonflow::thermo::PhaseSpecies& g : gas_system_.phase_gases()) {
          if (g.name != components_[c] + "(g)") continue;
          enthalpy += flow * (g.reference_enthalpy +
                              g.heat_capacity * (temperature - protonflow::thermo::constants::reference_temperature));
          found = true;
        }
        INFO(stream << " carries gas " << components_[c]);
        CHECK(found);
      }
    }
    if (std::any_of(condensed.begin(), condensed.end(), [](double n) { return n != 0.0; })) {
      const protonflow::thermo::Speciation state = solver_.solve(temperature, pressure, condensed);
      enthalpy += protonflow::thermo::state_enthalpy(liquid_system_, state);
    }
    return enthalpy;
  }

  // Mass flow (kg/s) of a stream by the engine's molar masses, as the units weigh their reagents
  // (the host's molar mass of water differs by 7e-7).
  double mass_flow(const YAML::Node& results, const std::string& stream) const {
    double mass = 0.0;
    for (const auto& phase : results["streams"][stream]["flows_mol_per_s"])
      for (std::size_t c = 0; c < components_.size(); ++c)
        mass += phase.second[components_[c]].as<double>() * liquid_system_.component_molar_mass(c);
    return mass;
  }

  // mass_flow kg/s of water at T, P.
  double water(double mass_flow, double temperature, double pressure) {
    std::vector<double> amounts(components_.size(), 0.0);
    amounts[liquid_system_.index_of_component("H2O")] = mass_flow / liquid_system_.component_molar_mass(liquid_system_.index_of_component("H2O"));
    return protonflow::thermo::state_enthalpy(liquid_system_, solver_.solve(temperature, pressure, amounts));
  }

 private:
  static protonflow::thermo::SystemOptions with_gas() {
    protonflow::thermo::SystemOptions options;
    options.gas_phase = true;
    return options;
  }
  protonflow::thermo::SystemOptions reach_solids() const {
    protonflow::thermo::SystemOptions options;
    for (const protonflow::thermo::PhaseSpecies& solid : gas_system_.solids()) options.allowed_solids.push_back(solid.name);
    return options;
  }

  protonflow::thermo::Database database_;
  std::vector<std::string> components_;
  protonflow::thermo::ChemicalSystem gas_system_;
  protonflow::thermo::ChemicalSystem liquid_system_;
  protonflow::thermo::EquilibriumSolver solver_;
};

}  // namespace

TEST_CASE("the pickling plant converges from a cold start and balances as a whole") {
  const TemporaryDirectory directory;
  const fs::path results_file = directory.path() / "results.yaml";
  const ProgramRun solved = run_protonflow({"run", flowsheet.string(), "-o", results_file.string()});
  INFO("stdout: " << solved.out << "\nstderr: " << solved.err);
  REQUIRE(solved.exit_code == 0);
  const YAML::Node results = YAML::LoadFile(results_file.string());

  // The neutraliser doses the lime stream and the scrubber's sump the caustic stream as templates:
  // s = dosed flow over the stream's flow. The sump takes fresh water to hold its level.
  const double s = unit_result(results, "neutraliser", "reagent_flow") /
                   results["streams"]["lime_slurry"]["mass_flow_kg_per_s"].as<double>();
  const double s_caustic = unit_result(results, "vent_scrubber", "reagent_flow") /
                           results["streams"]["caustic"]["mass_flow_kg_per_s"].as<double>();
  std::map<std::string, double> in;
  for (const std::string stream : {"spent_pickle_liquor", "rinse_water", "tank_vent"}) {
    for (const auto& [component, flow] : totals(results, stream)) in[component] += flow;
  }
  for (const auto& [component, flow] : totals(results, "lime_slurry")) in[component] += s * flow;
  for (const auto& [component, flow] : totals(results, "caustic")) in[component] += s_caustic * flow;
  in["H2O"] += unit_result(results, "vent_scrubber", "fresh_water") / 0.018015268;  // M(H2O), IAPWS-95
  std::map<std::string, double> out;
  for (const std::string stream : {"effluent", "stack_gas", "neutraliser_vent"}) {
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

  // Energy: every unit is adiabatic (the splitter, the acid mixer and the neutraliser at duty 0, the
  // scrubber and its sump by their energy balances), so the enthalpy flows in and out of the plant
  // agree; the sump's fresh water enters at the scrubber's fresh_water_temperature (its default,
  // 293.15 K) and the sump's pressure.
  PlantEnthalpy enthalpy(results);
  const double lime_dosed = unit_result(results, "neutraliser", "reagent_flow") / enthalpy.mass_flow(results, "lime_slurry");
  const double caustic_dosed = unit_result(results, "vent_scrubber", "reagent_flow") / enthalpy.mass_flow(results, "caustic");
  const double fresh_water_pressure = results["streams"]["tank_vent"]["pressure_Pa"].as<double>();
  const double fresh_water = enthalpy.water(unit_result(results, "vent_scrubber", "fresh_water"), 293.15, fresh_water_pressure);
  const double enthalpy_in = enthalpy(results, "spent_pickle_liquor") + enthalpy(results, "rinse_water") +
                             enthalpy(results, "tank_vent") + enthalpy(results, "lime_slurry", lime_dosed) +
                             enthalpy(results, "caustic", caustic_dosed) + fresh_water;
  const double enthalpy_out = enthalpy(results, "effluent") + enthalpy(results, "stack_gas") + enthalpy(results, "neutraliser_vent");
  // Each unit closes its own balance to round-off; what the plant's can miss by is the tear stream's
  // last change (below 1e-9 of its flows) times its enthalpy flow, a third of the plant's: 1e-10 of
  // the enthalpy flows (about 1.6e7 W of formation enthalpies) holds it with room.
  CHECK(std::abs(enthalpy_out - enthalpy_in) <= 1e-10 * std::abs(enthalpy_in));
  // The scrubber with its sump alone: vent, make-up, caustic dosed and fresh water in; cleaned gas and
  // bleed out.
  const double scrubber_in = enthalpy(results, "tank_vent") + enthalpy(results, "make_up") +
                             enthalpy(results, "caustic", caustic_dosed) + fresh_water;
  const double scrubber_out = enthalpy(results, "stack_gas") + enthalpy(results, "bleed");
  // Column and sump are solved to a steady state within the unit (1e-10 of the recirculated liquor,
  // 1e-6 K; the column's energy equations to about 1e-6 W).
  CHECK(std::abs(scrubber_out - scrubber_in) <= 1e-10 * std::abs(scrubber_in));

  // The plant does what it is for.
  CHECK(unit_result(results, "neutraliser", "outlet_ph") == Approx(9.5).margin(1e-6));
  CHECK(unit_result(results, "neutraliser", "dissolved_fe") < 5.0);  // mg/L
  CHECK(unit_result(results, "vent_scrubber", "removal_hcl") > 0.9);
  CHECK(unit_result(results, "vent_scrubber", "sump_ph") == Approx(8.5).margin(1e-6));
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
