// End-to-end tests of `protonflow run`, `check` and `units`: the built binary on the flowsheets in
// cases/ and host-demo/examples/flowsheets, with the real units/ modules (heater, splitter) and,
// where a mixing point is needed, the test mixer of tests/abi. Checked through what a user sees:
// stdout, stderr, exit code and the files written.
#include <cmath>
#include <filesystem>
#include <string>
#include <vector>

#include <catch2/catch.hpp>
#include <fmt/format.h>
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

const fs::path cases = HOST_CASES;
const fs::path errors = cases / "errors";
// The ABI test modules: the mixer the loops need, and broken modules that must be reported.
const std::string abi_modules = ABI_MODULE_DIR;

ProgramRun run_protonflow(std::vector<std::string> arguments) {
  return protonflow::e2e::run_program(PROTONFLOW_BINARY, arguments);
}

ProgramRun run(const fs::path& flowsheet, std::vector<std::string> options = {}) {
  std::vector<std::string> arguments{"run", flowsheet.string(), "--unit-dir", abi_modules};
  arguments.insert(arguments.end(), options.begin(), options.end());
  return run_protonflow(arguments);
}

// Runs a flowsheet that must solve and returns its results file.
YAML::Node solve(const fs::path& flowsheet) {
  const TemporaryDirectory directory;
  const fs::path results = directory.path() / "results.yaml";
  const ProgramRun solved = run(flowsheet, {"-o", results.string()});
  INFO("stdout: " << solved.out << "\nstderr: " << solved.err);
  REQUIRE(solved.exit_code == 0);
  REQUIRE_THAT(solved.err, !Contains("error:"));
  return YAML::LoadFile(results.string());
}

double number(const YAML::Node& node) { return node.as<double>(); }

double flow(const YAML::Node& results, const std::string& stream, const std::string& component,
            const std::string& phase = "aqueous") {
  return number(results["streams"][stream]["flows_mol_per_s"][phase][component]);
}

double result(const YAML::Node& results, const std::string& unit, const std::string& name) {
  return number(results["units"][unit]["results"][name]["value"]);
}

}  // namespace

TEST_CASE("run solves a three-unit chain, closing every balance and meeting every set point") {
  const YAML::Node results = solve(cases / "chain.yaml");
  const YAML::Node streams = results["streams"];
  REQUIRE(streams.size() == 5);  // acid, warm, sample, main, cooled
  // 1.5 barg is 1.5 bar above the standard atmosphere, 101325 Pa (the default gauge reference).
  CHECK(number(streams["acid"]["pressure_Pa"]) == Approx(251325.0).epsilon(1e-15));
  CHECK(number(streams["warm"]["pressure_Pa"]) == Approx(231325.0).epsilon(1e-15));  // 20 kPa pressure drop
  CHECK(number(streams["cooled"]["pressure_Pa"]) == Approx(231325.0).epsilon(1e-15));
  CHECK(number(streams["acid"]["temperature_K"]) == Approx(293.15).epsilon(1e-15));
  CHECK(number(streams["warm"]["temperature_K"]) == Approx(318.15).epsilon(1e-12));
  CHECK(number(streams["sample"]["temperature_K"]) == Approx(318.15).epsilon(1e-12));
  CHECK(number(streams["cooled"]["temperature_K"]) == Approx(303.15).epsilon(1e-12));
  // 1800 kg/h is 0.5 kg/s.
  CHECK(number(streams["acid"]["mass_flow_kg_per_s"]) == Approx(0.5).epsilon(1e-12));
  for (const std::string component : {"H2O", "H2SO4", "NaCl"}) {
    INFO(component);
    // The splitter sends a quarter to the sample; nothing is made or lost on the way.
    CHECK(flow(results, "sample", component) == Approx(0.25 * flow(results, "warm", component)).epsilon(1e-12));
    CHECK(flow(results, "sample", component) + flow(results, "cooled", component) ==
          Approx(flow(results, "acid", component)).epsilon(1e-12));
  }
  CHECK(result(results, "preheat", "duty") > 0.0);
  CHECK(result(results, "cool", "duty") < 0.0);
  CHECK(results["solve_order"].size() == 3);
  CHECK_FALSE(results["recycle"]);

  const ProgramRun shown = run(cases / "chain.yaml");
  CHECK_THAT(shown.out, Contains("Solve order: preheat → divide → cool"));
  CHECK_THAT(shown.out, Contains("T/°C") && Contains("P/kPa") && Contains("pH") && Contains("phases (mass %)") &&
                            Contains("main components (mass %)"));
  CHECK_THAT(shown.out, Contains("cooled  cool.product"));
  CHECK_THAT(shown.out, Contains("duty"));
}

TEST_CASE("a recycle converges to the analytic answer of a mixer, heater and splitter loop") {
  // The loop (cases/recycle.yaml): makeup F and recycle R are mixed (M), heated to T_H = 50 °C
  // (H) and split, a share r = 0.8 back as R and the rest out as the bleed B. The balances are
  //   M = F + R,  H = M (the heater changes only T: water's vapour pressure at 50 °C, 12.3 kPa
  //   (IAPWS), is far below the 200 kPa of the loop, so no gas forms),  R = r H,  B = (1 − r) H,
  // for every component, so M = F/(1 − r) = 5 F, R = r F/(1 − r) = 4 F and B = F. The test mixer
  // takes the flow-weighted mean temperature (tests/abi/modules/good_units.cpp), so
  //   T_M = (n_F T_F + n_R T_H)/(n_F + n_R) = (1 − r) T_F + r T_H = 0.2·293.15 + 0.8·323.15 = 317.15 K,
  // and the pressure is the lowest inlet's, 200 kPa, everywhere (no unit drops pressure).
  const YAML::Node results = solve(cases / "recycle.yaml");
  const double r = 0.8;
  for (const std::string component : {"H2O", "HCl"}) {
    INFO(component);
    const double f = flow(results, "makeup", component);
    CHECK(flow(results, "mixed", component) == Approx(f / (1 - r)).epsilon(1e-10));
    CHECK(flow(results, "recycle", component) == Approx(r * f / (1 - r)).epsilon(1e-10));
    CHECK(flow(results, "bleed", component) == Approx(f).epsilon(1e-10));
  }
  CHECK(flow(results, "makeup", "H2O") == Approx(1.0 / 0.018015268).epsilon(1e-15));  // 1 kg/s; M(H2O) IAPWS-95
  CHECK(number(results["streams"]["mixed"]["temperature_K"]) == Approx(0.2 * 293.15 + 0.8 * 323.15).epsilon(1e-10));
  CHECK(number(results["streams"]["bleed"]["temperature_K"]) == Approx(323.15).epsilon(1e-12));
  for (const std::string stream : {"mixed", "hot", "recycle", "bleed"}) {
    CHECK(number(results["streams"][stream]["pressure_Pa"]) == Approx(200e3).epsilon(1e-15));
  }
  const YAML::Node recycle = results["recycle"];
  REQUIRE(recycle);
  CHECK(recycle["tear_streams"][0].as<std::string>() == "recycle");
  CHECK(recycle["iterations"].as<long>() >= 2);
  CHECK(number(recycle["largest_relative_change"]) <= 1e-12);
  CHECK(recycle["history"].size() == recycle["iterations"].as<std::size_t>());

  // The loop's heater did to its converged feed what a heater alone does to that feed: the same
  // duty from the same state, so the recycle converged to one consistent state.
  const TemporaryDirectory directory;
  const fs::path alone = directory.path() / "heater-alone.yaml";
  write_text(alone, fmt::format(R"(streams:
  mixed:
    temperature: {} K
    pressure: 200 kPa
    aqueous:
      flows: {{H2O: {} mol/s, HCl: {} mol/s}}
units:
  heat:
    type: heater
    parameters: {{outlet_temperature: 50 degC}}
    ports: {{feed: mixed, product: hot}}
)",
                                number(results["streams"]["mixed"]["temperature_K"]), flow(results, "mixed", "H2O"),
                                flow(results, "mixed", "HCl")));
  const YAML::Node single = solve(alone);
  CHECK(result(single, "heat", "duty") == Approx(result(results, "heat", "duty")).epsilon(1e-9));

  const ProgramRun shown = run(cases / "recycle.yaml");
  CHECK_THAT(shown.out, Contains("Recycle: tear stream recycle; converged in"));
}

TEST_CASE("a recycle that does not converge is an error with its history, and no result") {
  const TemporaryDirectory directory;
  const fs::path results = directory.path() / "results.yaml";
  const ProgramRun failed = run(cases / "recycle-slow.yaml", {"-o", results.string()});
  INFO("stderr: " << failed.err);
  CHECK(failed.exit_code == 2);
  CHECK(failed.out.empty());
  CHECK_THAT(failed.err, Contains("error: the recycle through tear stream recycle did not converge: after 5 iterations"));
  CHECK_THAT(failed.err, Contains("history of the recycle"));
  for (int i = 1; i <= 5; ++i) CHECK_THAT(failed.err, Contains(fmt::format("          {}  ", i)));
  CHECK_FALSE(fs::exists(results));
}

TEST_CASE("a unit's warnings are printed once, at the unit's line of the flowsheet, and the report points there") {
  const ProgramRun warned = run(cases / "hot-mix.yaml");
  INFO("stdout: " << warned.out << "\nstderr: " << warned.err);
  CHECK(warned.exit_code == 0);
  const std::string text = "mixer: outlet at";
  CHECK(warned.out.find(text) == std::string::npos);
  CHECK_THAT(warned.out, Contains("1 warning: see " + (cases / "hot-mix.yaml").string() + ":14"));
  CHECK_THAT(warned.err, Contains((cases / "hot-mix.yaml").string() + ":14:3: warning: unit 'mix' (mixer): mixer: outlet at"));
  CHECK(warned.err.find(text) == warned.err.rfind(text));  // once
}

TEST_CASE("every error a user can act on names the file, line and column and says what is wrong") {
  struct Case {
    std::string file;
    int line;
    int column;
    int exit_code;
    std::vector<std::string> words;
  };
  const std::vector<Case> table{
      {"unknown-unit-type.yaml", 8, 11, 1, {"unknown unit type 'hetaer'; did you mean 'heater'?", "known types:", "splitter"}},
      {"missing-module-type.yaml", 8, 11, 1,
       {"unknown unit type 'packed_scrubber'", "searched:", "not loaded:", "libabi_wrong_major_units.so",
        "built for unit ABI 2.0", "libabi_no_entry_units.so", "exports no entry symbol"}},
      {"unconnected-port.yaml", 7, 3, 1, {"port 'product' (outlet", "is not connected"}},
      {"doubly-connected-inlet.yaml", 14, 19, 1, {"stream 'feed' already feeds first.feed (line 10)"}},
      {"doubly-connected-outlet.yaml", 18, 33, 1, {"stream 'out' is already produced by first.product (line 14)"}},
      {"unknown-species.yaml", 8, 9, 1, {"unknown species: component KMnO4"}},
      {"bad-formula.yaml", 8, 9, 1, {"bad formula", "NaCL", "unknown element 'L'"}},
      {"unit-mismatch.yaml", 3, 18, 1, {"temperature '25 kg'", "'kg' cannot be converted to K"}},
      {"parameter-unit-mismatch.yaml", 10, 27, 1, {"parameter 'outlet_temperature'", "'bar' cannot be converted to K"}},
      {"negative-flow.yaml", 7, 14, 1, {"the flow of H2O is negative (-1 kg/s)"}},
      {"fractions-short.yaml", 8, 7, 1, {"the mass fractions add up to 0.98, 0.02 short of 1", "'balance'"}},
      {"parameter-out-of-bounds.yaml", 10, 19, 1, {"parameter 'fraction_1'", "= 1.5 is outside its bounds [0, 1]"}},
      {"unknown-parameter.yaml", 10, 7, 1, {"unknown parameter 'outlet_temprature'; did you mean 'outlet_temperature'?"}},
      {"unknown-port.yaml", 10, 25, 1, {"unknown port 'prodcut'; did you mean 'product'?"}},
      {"missing-feed.yaml", 5, 19, 1, {"stream 'raw' feeds heat.feed, but no unit produces it"}},
      {"invalid-yaml.yaml", 4, 4, 1, {"invalid YAML"}},
      {"module-refuses.yaml", 8, 3, 1, {"unit 'divide' (splitter, module", "refused to be created", "0.7"}},
      {"unit-fails.yaml", 8, 3, 2, {"unit 'probe' (probe, module", "libabi_good_units.so", "not converged", "residual"}},
  };
  for (const Case& c : table) {
    const fs::path file = errors / c.file;
    const ProgramRun failed = run(file);
    INFO(c.file << "\nstderr: " << failed.err);
    CHECK(failed.exit_code == c.exit_code);
    CHECK(failed.out.empty());
    CHECK_THAT(failed.err, Contains(fmt::format("{}:{}:{}: error: ", file.string(), c.line, c.column)));
    for (const std::string& word : c.words) CHECK_THAT(failed.err, Contains(word));
  }
}

TEST_CASE("no exception escapes: a missing file, a directory and a file of nonsense are errors with a message") {
  const ProgramRun missing = run(cases / "no-such-flowsheet.yaml");
  CHECK(missing.exit_code == 1);
  CHECK_THAT(missing.err, Contains("no-such-flowsheet.yaml: error: cannot open the flowsheet file"));
  const ProgramRun directory = run(cases);
  CHECK(directory.exit_code == 1);
  CHECK_THAT(directory.err, Contains("error:"));
  const TemporaryDirectory scratch;
  write_text(scratch.path() / "nonsense.yaml", "\x01\x02 [[[ {\n");
  const ProgramRun nonsense = run(scratch.path() / "nonsense.yaml");
  CHECK(nonsense.exit_code == 1);
  CHECK_THAT(nonsense.err, Contains("error:"));
}

TEST_CASE("results are written atomically: a failed run leaves an earlier results file as it was") {
  const TemporaryDirectory directory;
  const fs::path results = directory.path() / "results.yaml";
  REQUIRE(run(cases / "chain.yaml", {"-o", results.string()}).exit_code == 0);
  const std::string before = read_text(results);
  REQUIRE_THAT(before, Contains("streams:"));

  // A recycle that fails, a broken flowsheet and an unknown unit: none may touch the file.
  CHECK(run(cases / "recycle-slow.yaml", {"-o", results.string()}).exit_code == 2);
  CHECK(run(errors / "unknown-unit-type.yaml", {"-o", results.string()}).exit_code == 1);
  CHECK(read_text(results) == before);
  // Nor may a temporary file be left behind.
  std::size_t files = 0;
  for ([[maybe_unused]] const auto& entry : fs::directory_iterator(directory.path())) ++files;
  CHECK(files == 1);

  // A successful run replaces it whole.
  REQUIRE(run(cases / "recycle.yaml", {"-o", results.string()}).exit_code == 0);
  CHECK_THAT(read_text(results), Contains("tear_streams: [recycle]"));

  const ProgramRun unwritable = run(cases / "chain.yaml", {"-o", (directory.path() / "absent" / "r.yaml").string()});
  CHECK(unwritable.exit_code == 1);
  CHECK_THAT(unwritable.err, Contains("cannot create a temporary file in"));
  CHECK(unwritable.out.empty());
}

TEST_CASE("check passes on recorded expectations, fails on a difference with a table, and keeps tolerances") {
  const TemporaryDirectory directory;
  const fs::path expected = directory.path() / "chain.expected.yaml";
  const auto check = [&](std::vector<std::string> extra = {}) {
    std::vector<std::string> arguments{"check", (cases / "chain.yaml").string(), "--expect", expected.string(),
                                       "--unit-dir", abi_modules};
    arguments.insert(arguments.end(), extra.begin(), extra.end());
    return run_protonflow(arguments);
  };

  const ProgramRun absent = check();
  CHECK(absent.exit_code == 1);
  CHECK_THAT(absent.err, Contains("cannot open the expectations file; record it first"));

  const ProgramRun recorded = check({"--write-expect"});
  INFO("stderr: " << recorded.err);
  REQUIRE(recorded.exit_code == 0);
  CHECK_THAT(recorded.out, Contains("recorded"));
  const ProgramRun passed = check();
  CHECK(passed.exit_code == 0);
  CHECK_THAT(passed.out, Contains("check passed: all"));

  // A cooler that ends 0.1 K warmer than recorded is a difference under the default tolerance
  // (1e-6 relative is 0.0003 K here).
  std::string text = read_text(expected);
  const std::string recorded_temperature = "temperature_K: 303.15";
  const std::size_t at = text.find(recorded_temperature, text.find("  cooled:"));
  REQUIRE(at != std::string::npos);
  text.replace(at, recorded_temperature.size(), "temperature_K: 303.25");
  write_text(expected, text);
  const ProgramRun failed = check();
  INFO("stdout: " << failed.out);
  CHECK(failed.exit_code == 3);
  CHECK_THAT(failed.out, Contains("check FAILED: 1 of"));
  CHECK_THAT(failed.out, Contains("quantity") && Contains("expected") && Contains("actual") && Contains("allowed"));
  CHECK_THAT(failed.out, Contains("streams.cooled.temperature_K") && Contains("303.25") && Contains("303.15"));

  // A tolerance for that one quantity, with a unit, lets it pass; re-recording keeps it.
  const std::string tolerance_line = "  streams.cooled.temperature_K: {absolute: 0.2 K}\n";
  text.insert(text.find("  default:"), tolerance_line);
  write_text(expected, text);
  CHECK(check().exit_code == 0);
  REQUIRE(check({"--write-expect"}).exit_code == 0);
  const std::string rerecorded = read_text(expected);
  CHECK_THAT(rerecorded, Contains(tolerance_line));
  CHECK_THAT(rerecorded, Contains("temperature_K: 303.15"));
  CHECK(check().exit_code == 0);

  // A quantity the expectations do not know (the flowsheet changed) is a difference too.
  text = read_text(expected);
  const std::size_t sample = text.find("  sample:\n");
  REQUIRE(sample != std::string::npos);
  text.replace(sample, std::string("  sample:").size(), "  sampled:");
  write_text(expected, text);
  const ProgramRun changed = check();
  CHECK(changed.exit_code == 3);
  CHECK_THAT(changed.out, Contains("missing from the results") && Contains("not in the expectations"));
}

TEST_CASE("list ports connect lists of streams, and series go to the report, the results, CSV files and check") {
  // The blender takes the flow-weighted mean temperature of its inlets (equal molar heat
  // capacities, a test simplification): (1.25·300 + 2.75·360 + 1·330)/5 = 339 K, and each share
  // carries half of every flow at the lowest inlet pressure, 1.5 bar.
  const TemporaryDirectory directory;
  const fs::path results_file = directory.path() / "results.yaml";
  const fs::path series_dir = directory.path() / "series";
  const ProgramRun ran = run(cases / "blend-series.yaml", {"-o", results_file.string(), "--series-dir", series_dir.string()});
  INFO("stdout: " << ran.out << "\nstderr: " << ran.err);
  REQUIRE(ran.exit_code == 0);
  const YAML::Node results = YAML::LoadFile(results_file.string());
  const double blend = (1.25 * 300.0 + 2.75 * 360.0 + 1.0 * 330.0) / 5.0;
  CHECK(number(results["streams"]["east"]["temperature_K"]) == Approx(blend).epsilon(1e-14));
  CHECK(number(results["streams"]["west"]["pressure_Pa"]) == Approx(1.5e5).epsilon(1e-15));
  CHECK(flow(results, "west", "H2O") == Approx(4.75 / 2).epsilon(1e-15));
  CHECK(flow(results, "c", "HCl") == Approx(0.7 * 0.125).epsilon(1e-14));
  CHECK(results["streams"]["water"]["to"].as<std::string>() == "blend.feed");
  CHECK(results["streams"]["b"]["from"].as<std::string>() == "divide.outlets");

  // The series in the results: one blend point per inlet, in list order, and the profile.
  const YAML::Node path = results["units"]["blend"]["series"]["blend_temperature"];
  REQUIRE(path["points"].size() == 3);
  CHECK(path["x"]["unit"].as<std::string>() == "mol/s");
  CHECK(number(path["points"][1][0]) == Approx(4.0).epsilon(1e-15));
  CHECK(number(path["points"][1][1]) == Approx((1.25 * 300.0 + 2.75 * 360.0) / 4.0).epsilon(1e-14));
  CHECK(number(path["points"][2][1]) == Approx(blend).epsilon(1e-14));
  CHECK(results["units"]["blend"]["series"]["profile"]["points"].size() == 3);
  CHECK(number(results["units"]["divide"]["series"]["shares"]["points"][2][1]) == Approx(0.7).epsilon(1e-14));

  // In the report, and as CSV files named UNIT.SERIES.csv.
  CHECK_THAT(ran.out, Contains("series blend_temperature: 3 points"));
  CHECK_THAT(ran.out, Contains("flow_blended [mol/s]"));
  CHECK_THAT(ran.out, Contains("3 series written to " + series_dir.string()));
  const std::string csv = read_text(series_dir / "blend.blend_temperature.csv");
  CHECK(csv.starts_with("flow_blended [mol/s],temperature [K]\n1.25,300\n4,"));
  CHECK(fs::exists(series_dir / "blend.profile.csv"));
  CHECK(fs::exists(series_dir / "divide.shares.csv"));

  // check compares the series point by point: a changed point is a difference named by its path.
  const fs::path expected = directory.path() / "blend.expected.yaml";
  const auto check = [&](std::vector<std::string> extra = {}) {
    std::vector<std::string> arguments{"check", (cases / "blend-series.yaml").string(), "--expect", expected.string(),
                                       "--unit-dir", abi_modules};
    arguments.insert(arguments.end(), extra.begin(), extra.end());
    return run_protonflow(arguments);
  };
  REQUIRE(check({"--write-expect"}).exit_code == 0);
  CHECK(check().exit_code == 0);
  std::string text = read_text(expected);
  const std::size_t series_at = text.find("blend_temperature:");
  REQUIRE(series_at != std::string::npos);
  const std::string point = "- [4, ";
  const std::size_t at = text.find(point, series_at);
  REQUIRE(at != std::string::npos);
  text.replace(at, point.size(), "- [4.5, ");
  write_text(expected, text);
  const ProgramRun changed = check();
  INFO("check: " << changed.out);
  CHECK(changed.exit_code == 3);
  CHECK_THAT(changed.out, Contains("units.blend.series.blend_temperature.x.1") && Contains("4.5"));
  CHECK_THAT(changed.out, Contains("check FAILED: 1 of"));
}

TEST_CASE("a list port is given within its bounds, and a plain port is not given a list") {
  const TemporaryDirectory directory;
  const fs::path file = directory.path() / "bad-list.yaml";
  const std::string head = "streams:\n  a: {temperature: 300 K, pressure: 1 bar, aqueous: {flows: {H2O: 1 mol/s}}}\n"
                           "units:\n  divide:\n    type: splitter\n    parameters: {fraction_1: 0.5, fraction_2: 0.5}\n";
  write_text(file, head + "    ports: {feed: a, outlets: [b]}\n");
  const ProgramRun one = run(file);
  CHECK(one.exit_code == 1);
  CHECK_THAT(one.err, Contains(file.string() + ":7:22: error:") &&
                          Contains("port 'outlets' (outlet: the branches, 2 to 8, as a list: outlets: [a, b]) takes 2 to 8 streams") &&
                          Contains("1 is given"));
  write_text(file, head + "    ports: {feed: [a, z], outlets: [b, c]}\n");
  const ProgramRun listed = run(file);
  CHECK(listed.exit_code == 1);
  CHECK_THAT(listed.err, Contains(file.string() + ":7:13: error:") && Contains("port 'feed' takes one stream, not a list"));
}

TEST_CASE("the acid mixer end to end: 98 % H2SO4 let down through run and check, with its mixing path") {
  const fs::path flowsheet = fs::path(PROTONFLOW_EXAMPLES) / "flowsheets" / "sulfuric-acid-dilution.yaml";
  const TemporaryDirectory directory;
  const fs::path results_file = directory.path() / "results.yaml";
  const ProgramRun ran = run(flowsheet, {"-o", results_file.string(), "--series-dir", directory.path().string()});
  INFO("stdout: " << ran.out << "\nstderr: " << ran.err);
  REQUIRE(ran.exit_code == 0);
  const YAML::Node results = YAML::LoadFile(results_file.string());
  // 1.8 t/h of 98 % acid with 7 t/h of water: 20.0 wt %, by the amounts alone (to 1e-6: the host
  // converts t/h to mol/s and the unit back with molar masses from two sources, 1e-6 apart).
  const double acid = 1.8 * 0.98, total = 1.8 + 7.0;
  CHECK(result(results, "make_up", "solute_mass_fraction") == Approx(acid / total).epsilon(1e-6));
  CHECK(result(results, "make_up", "model") == 1.0);
  // Warmer than either feed, and the warnings printed once at the unit's line.
  CHECK(result(results, "make_up", "outlet_temperature") > 298.15);
  CHECK_THAT(ran.err, Contains(flowsheet.string() + ":") && Contains("unit 'make_up' (acid_mixer)") &&
                          Contains("add acid to water, never water to acid"));
  CHECK(results["units"]["make_up"]["series"]["mixing_path"]["points"].size() == 11);
  CHECK(fs::exists(directory.path() / "make_up.mixing_path.csv"));
  CHECK_THAT(ran.out, Contains("series mixing_path: 11 points"));

  const fs::path expected = directory.path() / "expected.yaml";
  const auto check = [&](std::vector<std::string> extra = {}) {
    std::vector<std::string> arguments{"check", flowsheet.string(), "--expect", expected.string()};
    arguments.insert(arguments.end(), extra.begin(), extra.end());
    return run_protonflow(arguments);
  };
  REQUIRE(check({"--write-expect"}).exit_code == 0);
  const ProgramRun checked = check();
  INFO("check: " << checked.out << checked.err);
  CHECK(checked.exit_code == 0);
}

TEST_CASE("units lists every type on the search path from its descriptors, and the modules that failed") {
  const ProgramRun listed = run_protonflow({"units", "--unit-dir", abi_modules});
  INFO("stdout: " << listed.out << "\nstderr: " << listed.err);
  CHECK(listed.exit_code == 0);
  CHECK_THAT(listed.out, Contains("Search path (first match wins):"));
  CHECK_THAT(listed.out, Contains("heater: ") && Contains("splitter: ") && Contains("mixer: "));
  // Ports, parameters (unit, default, bounds, meaning) and results, as the heater declares them.
  CHECK_THAT(listed.out, Contains("feed") && Contains("inlet") && Contains("outlet"));
  CHECK_THAT(listed.out, Contains("outlet_temperature") && Contains("[273.15, 647.096]") && Contains("duty"));
  CHECK_THAT(listed.out, Contains("pressure_drop       Pa    0"));
  CHECK_THAT(listed.out, Contains("one of: to_temperature, by_duty"));
  CHECK_THAT(listed.out, Contains("Modules that failed to load:"));
  CHECK_THAT(listed.out, Contains("libabi_wrong_major_units.so") && Contains("built for unit ABI 2.0"));
  CHECK_THAT(listed.out, Contains("libabi_truncated_units.so") && Contains("is truncated"));
}

TEST_CASE("every demo flowsheet in host-demo/examples/flowsheets runs") {
  std::size_t count = 0;
  for (const auto& entry : fs::directory_iterator(fs::path(PROTONFLOW_EXAMPLES) / "flowsheets")) {
    if (entry.path().extension() != ".yaml") continue;
    ++count;
    INFO(entry.path());
    const ProgramRun demo = run(entry.path());
    INFO("stderr: " << demo.err);
    CHECK(demo.exit_code == 0);
    CHECK_THAT(demo.out, Contains("Streams"));
  }
  CHECK(count >= 2);
}

TEST_CASE("the pickling-vent scrubber demo runs through protonflow run and reports its column") {
  const ProgramRun demo = run(fs::path(PROTONFLOW_EXAMPLES) / "flowsheets" / "pickling-vent-scrubber.yaml");
  INFO("stderr: " << demo.err);
  REQUIRE(demo.exit_code == 0);
  CHECK_THAT(demo.out, Contains("stack_gas") && Contains("spent_caustic"));
  CHECK_THAT(demo.out, Contains("removal_hcl") && Contains("stages_for_limit") && Contains("reagent_to_co2"));
  // The standing deferral to local permits and codes is printed as a warning (on stderr; the
  // report points to it).
  CHECK_THAT(demo.err, Contains("local permit"));
  CHECK_THAT(demo.out, Contains("warning: see") || Contains("warnings: see"));
  // Air carries CO2, which the caustic takes up above pH 10: the reagent-waste warning.
  CHECK_THAT(demo.err, Contains("CO2 pickup"));
}
