// End-to-end tests of `protonflow speciate`: the built binary on the YAML files in cases/ and
// host-demo/examples/, checked through what a user sees (stdout, stderr, exit code).
#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include "../support/temporary_directory.hpp"
#include "run_program.hpp"

namespace fs = std::filesystem;
using protonflow::e2e::ProgramRun;

namespace {

const fs::path cases_directory = PROTONFLOW_E2E_CASES;
const fs::path broken_directory = cases_directory / "broken";

ProgramRun speciate(const fs::path& file, std::vector<std::string> options = {}) {
  std::vector<std::string> arguments{"speciate", file.string()};
  arguments.insert(arguments.end(), options.begin(), options.end());
  return protonflow::e2e::run_program(PROTONFLOW_BINARY, arguments);
}

YAML::Node report_of(const ProgramRun& run) {
  INFO("stderr: " << run.err);
  REQUIRE(run.exit_code == 0);
  // Warnings (an ideal solution at I = 0.07 mol/kg, say) may stand on stderr; errors may not.
  REQUIRE_THAT(run.err, !Catch::Contains("error:"));
  return YAML::Load(run.out);
}

YAML::Node speciate_report(const fs::path& file) { return report_of(speciate(file)); }

double number(const YAML::Node& node) { return node.as<double>(); }

// Charge and mass balances close to round-off for every solve (an exact check of the conservation
// laws, common practice); 1e-12 leaves room for the solver's 1e-13 scaled tolerance.
void require_balances_close(const YAML::Node& report) {
  const YAML::Node closure = report["balance_closure"];
  REQUIRE(closure);
  CHECK(std::abs(number(closure["charge"])) < 1e-12);
  REQUIRE(closure["mass"].size() >= 2);  // at least H^+ and H2O
  for (const auto& balance : closure["mass"]) {
    INFO("mass balance " << balance.first.Scalar());
    CHECK(std::abs(number(balance.second)) < 1e-12);
  }
}

// Two reports of the same solution written two ways agree on every intensive result.
void require_same_speciation(const YAML::Node& a, const YAML::Node& b, double tolerance) {
  CHECK(number(a["pH"]) == Approx(number(b["pH"])).margin(tolerance));
  CHECK(number(a["ionic_strength_mol_per_kg"]) == Approx(number(b["ionic_strength_mol_per_kg"])).epsilon(tolerance));
  CHECK(number(a["water_activity"]) == Approx(number(b["water_activity"])).epsilon(tolerance));
  REQUIRE(a["solutes"].size() == b["solutes"].size());
  for (const auto& solute : a["solutes"]) {
    const std::string name = solute.first.Scalar();
    INFO("solute " << name);
    REQUIRE(b["solutes"][name]);
    CHECK(number(solute.second["molality_mol_per_kg"]) ==
          Approx(number(b["solutes"][name]["molality_mol_per_kg"])).epsilon(tolerance).margin(1e-300));
  }
}

// A broken file exits 1 with "FILE:LINE:COLUMN: error:" and the words that say what is wrong.
void require_rejected(const std::string& name, int line, int column, const std::vector<std::string>& words) {
  const fs::path file = broken_directory / name;
  const ProgramRun run = speciate(file);
  INFO("stderr: " << run.err);
  CHECK(run.exit_code == 1);
  CHECK(run.out.empty());
  CHECK_THAT(run.err, Catch::Contains(fmt::format("{}:{}:{}: error: ", file.string(), line, column)));
  for (const std::string& word : words) {
    CHECK_THAT(run.err, Catch::Contains(word));
  }
}

}  // namespace

TEST_CASE("HCl 0.01 mol/kg with Davies has pH 2.04", "[speciate]") {
  const YAML::Node report = speciate_report(cases_directory / "hcl-0.01-davies.yaml");
  // Worked example (common practice), derived with Davies' γ (davies-1962): HCl 0.01 mol/kg,
  // activity-corrected, pH 2.04 ± 0.01.
  CHECK(number(report["pH"]) == Approx(2.04).margin(0.01));
  CHECK(number(report["temperature_K"]) == Approx(298.15).epsilon(0.0).margin(1e-9));
  // The default pressure is one standard atmosphere, 101325 Pa exactly (by definition).
  CHECK(number(report["pressure_Pa"]) == 101325.0);
  CHECK(number(report["water_mass_kg"]) == Approx(1.0).epsilon(1e-12));
  CHECK(report["activity_model"].as<std::string>() == "davies");
  CHECK(number(report["solutes"]["Cl^-"]["molality_mol_per_kg"]) == Approx(0.01).epsilon(1e-3));
  require_balances_close(report);
}

TEST_CASE("other units of temperature, pressure and amount give the same answer", "[speciate][units]") {
  const YAML::Node in_si = speciate_report(cases_directory / "hcl-0.01-davies.yaml");
  const YAML::Node in_other_units = speciate_report(cases_directory / "hcl-0.01-units.yaml");
  // 77 °F = (77 − 32) × 5/9 °C = 25 °C = 298.15 K (definitions of the Fahrenheit and Celsius scales).
  CHECK(number(in_other_units["temperature_K"]) == Approx(298.15).epsilon(0.0).margin(1e-9));
  // 101.325 kPa = 101325 Pa (SI prefix).
  CHECK(number(in_other_units["pressure_Pa"]) == Approx(101325.0).epsilon(0.0).margin(1e-9));
  require_same_speciation(in_si, in_other_units, 1e-9);
}

TEST_CASE("acetic acid 0.1 mol/kg has pH 2.88", "[speciate]") {
  const YAML::Node report = speciate_report(cases_directory / "acetic-acid-0.1.yaml");
  // Worked example (common practice), derived from pKa 4.756 (harned-ehlers-1933): acetic acid
  // 0.1 mol/kg, pH 2.88 ± 0.02.
  CHECK(number(report["pH"]) == Approx(2.88).margin(0.02));
  require_balances_close(report);
}

TEST_CASE("H2SO4 0.05 mol/kg as an ideal solution has pH 1.24", "[speciate]") {
  const YAML::Node report = speciate_report(cases_directory / "h2so4-0.05-ideal.yaml");
  // Worked example (common practice), derived from pK(HSO4^-) 1.99 (crc-handbook, from memory): H2SO4 0.05 mol/kg,
  // ideal solution (γ = 1), pH 1.24 ± 0.01.
  CHECK(number(report["pH"]) == Approx(1.24).margin(0.01));
  for (const auto& solute : report["solutes"]) {
    INFO("solute " << solute.first.Scalar());
    CHECK(number(solute.second["log10_gamma"]) == 0.0);  // the ideal model: γ = 1 by definition
  }
  require_balances_close(report);
}

TEST_CASE("the moles basis gives the same answer as the equivalent molality", "[speciate][basis]") {
  const YAML::Node by_molality = speciate_report(cases_directory / "h2so4-0.05-ideal.yaml");
  const YAML::Node by_moles = speciate_report(cases_directory / "h2so4-0.05-ideal-moles.yaml");
  CHECK(by_moles["amounts_as"].as<std::string>() == "moles");
  // Same water (1 kg as 55.508... mol) and acid, so the same solve up to round-off.
  require_same_speciation(by_molality, by_moles, 1e-9);
  CHECK(number(by_moles["water_mass_kg"]) == Approx(number(by_molality["water_mass_kg"])).epsilon(1e-9));
  require_balances_close(by_moles);
}

TEST_CASE("the mass-fraction basis gives the same answer as the equivalent molality", "[speciate][basis]") {
  // The fractions in the case files were computed with python3-periodictable's molar masses; the
  // program's atomic weights may differ from those in the sixth digit, hence 1e-5.
  SECTION("water as the remainder") {
    const YAML::Node by_molality = speciate_report(cases_directory / "h2so4-0.05-ideal.yaml");
    const YAML::Node by_fraction = speciate_report(cases_directory / "h2so4-0.05-ideal-mass-fraction.yaml");
    require_same_speciation(by_molality, by_fraction, 1e-5);
    require_balances_close(by_fraction);
  }
  SECTION("water listed, two solutes, B-dot at 40 degC and 2 bar") {
    const YAML::Node by_molality = speciate_report(cases_directory / "brine-b-dot.yaml");
    const YAML::Node by_fraction = speciate_report(cases_directory / "brine-b-dot-mass-fraction.yaml");
    CHECK(number(by_molality["water_mass_kg"]) == Approx(2.5).epsilon(1e-3));  // water_mass: 2.5 kg
    CHECK(number(by_molality["pressure_Pa"]) == Approx(2e5).epsilon(0.0).margin(1e-6));      // 2 bar = 2e5 Pa (definition)
    require_same_speciation(by_molality, by_fraction, 1e-5);
    require_balances_close(by_molality);
    require_balances_close(by_fraction);
  }
}

TEST_CASE("the --table flag writes a readable table with the same pH", "[speciate][table]") {
  const fs::path file = cases_directory / "hcl-0.01-davies.yaml";
  const YAML::Node report = speciate_report(file);
  const ProgramRun run = speciate(file, {"--table"});
  INFO("stdout: " << run.out << "\nstderr: " << run.err);
  REQUIRE(run.exit_code == 0);
  CHECK_THAT(run.out, Catch::Contains(fmt::format("{:.4f}", number(report["pH"]))));
  CHECK_THAT(run.out, Catch::Contains("Cl^-"));
  CHECK_THAT(run.out, Catch::Contains("ionic strength"));
  // A table is not YAML with a 'pH' field: the flag really switches the format.
  CHECK_THAT(run.out, !Catch::Contains("pH: "));
}

TEST_CASE("every example in host-demo/examples speciates and closes its balances", "[speciate][examples]") {
  int examples = 0;
  for (const auto& entry : fs::directory_iterator(PROTONFLOW_EXAMPLES)) {
    if (entry.path().extension() != ".yaml") {
      continue;
    }
    ++examples;
    INFO("example " << entry.path().string());
    const YAML::Node report = speciate_report(entry.path());
    CHECK(std::isfinite(number(report["pH"])));
    require_balances_close(report);
  }
  CHECK(examples >= 2);
}

TEST_CASE("a solve that runs out of iterations exits 2 with every residual", "[speciate][errors]") {
  const ProgramRun run = speciate(cases_directory / "acetic-acid-0.1.yaml", {"--max-iterations", "1"});
  INFO("stderr: " << run.err);
  CHECK(run.exit_code == 2);
  CHECK(run.out.empty());
  CHECK_THAT(run.err, Catch::Contains("stopped without an answer"));
  CHECK_THAT(run.err, Catch::Contains("charge balance"));
  CHECK_THAT(run.err, Catch::Contains("acetic-acid-0.1.yaml:"));
}

TEST_CASE("broken files name the file, line and column", "[speciate][errors]") {
  SECTION("YAML syntax") { require_rejected("yaml-syntax.yaml", 4, 23, {"invalid YAML"}); }
  SECTION("unknown key, with a suggestion") {
    require_rejected("unknown-key.yaml", 3, 3, {"unknown key 'temprature' in solution", "did you mean 'temperature'"});
  }
  SECTION("missing key") { require_rejected("missing-temperature.yaml", 2, 1, {"missing key 'temperature'"}); }
  SECTION("negative amount") { require_rejected("negative-amount.yaml", 7, 11, {"NaCl", "negative"}); }
  SECTION("non-numeric amount") { require_rejected("non-numeric-amount.yaml", 6, 11, {"NaCl", "must be a number", "plenty"}); }
  SECTION("unknown species") { require_rejected("unknown-species.yaml", 7, 5, {"KMnO4"}); }
  SECTION("formula that cannot be read") { require_rejected("bad-formula.yaml", 6, 5, {"H2$O4"}); }
  SECTION("temperature out of range") {
    require_rejected("temperature-out-of-range.yaml", 3, 16, {"temperature", "out of range", "523.15 K"});
  }
  SECTION("temperature without a unit") {
    require_rejected("bare-temperature.yaml", 3, 16, {"needs a unit", "kelvin or degrees Celsius"});
  }
  SECTION("temperature of the wrong dimension") {
    require_rejected("wrong-dimension.yaml", 3, 16, {"temperature", "'kg' cannot be converted to K"});
  }
  SECTION("mass fractions above 1") { require_rejected("mass-fraction-over-one.yaml", 7, 11, {"more than 1"}); }
  SECTION("moles without water") { require_rejected("moles-without-water.yaml", 5, 3, {"H2O", "moles"}); }
  SECTION("unknown activity model, with a suggestion") {
    require_rejected("unknown-activity-model.yaml", 4, 19, {"davis", "did you mean 'davies'"});
  }
  SECTION("a component in the older hydrate notation, with what to write") {
    require_rejected("old-notation-component.yaml", 6, 5, {"CaSO4:2H2O", "write 'CaSO4.2H2O'"});
  }
}

TEST_CASE("a missing file, a bad data directory and a bad command line exit 1", "[speciate][errors]") {
  SECTION("missing file") {
    const fs::path file = cases_directory / "no-such-file.yaml";
    const ProgramRun run = speciate(file);
    CHECK(run.exit_code == 1);
    CHECK_THAT(run.err, Catch::Contains(file.string() + ": error: cannot open"));
  }
  SECTION("data directory that does not exist") {
    const ProgramRun run =
        speciate(cases_directory / "hcl-0.01-davies.yaml", {"--data-dir", (cases_directory / "no-such-dir").string()});
    INFO("stderr: " << run.err);
    CHECK(run.exit_code == 1);
    CHECK_THAT(run.err, Catch::Contains("error:"));
    CHECK_THAT(run.err, Catch::Contains("no-such-dir"));
  }
  SECTION("no file given") {
    const ProgramRun run = protonflow::e2e::run_program(PROTONFLOW_BINARY, {"speciate"});
    CHECK(run.exit_code == 1);
    CHECK_THAT(run.err, Catch::Contains("FILE"));
  }
}

TEST_CASE("a solution beyond the activity model's range is answered with a warning", "[speciate][warnings]") {
  const fs::path file = cases_directory / "h2so4-5-davies-beyond-range.yaml";
  const ProgramRun run = speciate(file);
  INFO("stderr: " << run.err);
  REQUIRE(run.exit_code == 0);
  // Davies is for I up to about 0.5 mol/kg (common practice): 5 mol/kg H2SO4 is far beyond it.
  CHECK_THAT(run.err, Catch::Contains(file.string() + ":2:1: warning: ") && Catch::Contains("beyond the davies"));
  const YAML::Node report = YAML::Load(run.out);
  REQUIRE(report["warnings"].size() == 1);
  CHECK_THAT(report["warnings"][0].as<std::string>(), Catch::Contains("extrapolated"));
  CHECK_THAT(report["warnings"][0].as<std::string>(), Catch::Contains("the pitzer model serves"));
  const ProgramRun table = speciate(file, {"--table"});
  CHECK_THAT(table.out, Catch::Contains("WARNING"));
  require_balances_close(report);
}

TEST_CASE("a brine of I = 4.6 mol/kg is within the Pitzer model's range", "[speciate][pitzer]") {
  const YAML::Node report = speciate_report(cases_directory / "brine-pitzer.yaml");
  CHECK(report["activity_model"].as<std::string>() == "pitzer");
  REQUIRE(report["warnings"]);
  CHECK(report["warnings"].size() == 0);
  CHECK(number(report["ionic_strength_mol_per_kg"]) == Approx(4.6).epsilon(0.01));
  require_balances_close(report);
}

TEST_CASE("the Pitzer model names the ions it has no parameters for", "[speciate][pitzer]") {
  const YAML::Node report = speciate_report(cases_directory / "zinc-brine-pitzer.yaml");
  REQUIRE(report["warnings"].size() == 1);
  CHECK_THAT(report["warnings"][0].as<std::string>(), Catch::Contains("do not cover") && Catch::Contains("Zn^2+"));
  require_balances_close(report);
}

TEST_CASE("away from 25 °C the Pitzer model names the pairs whose parameters do not vary with temperature",
          "[speciate][pitzer]") {
  // Na–Cl, Na–SO4 have temperature functions (Silvester & Pitzer 1977, Møller 1988); Mg–SO4 has none.
  const YAML::Node report = speciate_report(cases_directory / "hot-brine-pitzer.yaml");
  REQUIRE(report["warnings"].size() == 1);
  CHECK_THAT(report["warnings"][0].as<std::string>(),
             Catch::Contains("Mg^2+–SO4^2-") && Catch::Contains("no temperature dependence") && Catch::Contains("60 °C"));
  require_balances_close(report);
}

TEST_CASE("a solution within the model's range has an empty warning list", "[speciate][warnings]") {
  const YAML::Node report = speciate_report(cases_directory / "hcl-0.01-davies.yaml");
  REQUIRE(report["warnings"]);
  CHECK(report["warnings"].size() == 0);
}

TEST_CASE("a solid allowed to form stays as much as saturation leaves", "[speciate][solids]") {
  const YAML::Node report = speciate_report(cases_directory / "gypsum-in-water.yaml");
  const YAML::Node gypsum = report["solids"]["gypsum"];
  REQUIRE(gypsum);
  CHECK(std::abs(number(gypsum["saturation_index"])) < 1e-8);
  const double dissolved = number(report["solutes"]["Ca^2+"]["molality_mol_per_kg"]) +
                           number(report["solutes"]["CaSO4(aq)"]["molality_mol_per_kg"]);
  // Gypsum's solubility in water at 25 °C is about 15 mmol/kg (CRC Handbook, aqueous solubility of
  // inorganic compounds, 0.205 g CaSO4 per 100 g water ≈ 15.1 mmol/kg; from memory); Davies ±10 %.
  CHECK(dissolved == Approx(0.0151).epsilon(0.10));
  // What is not dissolved is solid: the ion pair and free ion in the solvent's own mass (which the
  // dissolution itself enlarges by 2 H2O per formula), plus the traces of CaOH^+.
  const double water = number(report["water_mass_kg"]);
  CHECK(number(gypsum["amount_mol"]) == Approx(0.1 - dissolved * water).epsilon(1e-6));
  require_balances_close(report);
}

TEST_CASE("fresh precipitates form by default, aged ones when asked for, and the report names them", "[speciate][solids]") {
  const YAML::Node fresh = speciate_report(cases_directory / "alum-neutralised-fresh.yaml");
  CHECK(fresh["precipitates"].as<std::string>() == "fresh");
  CHECK(number(fresh["solids"]["Al(OH)3(am)"]["amount_mol"]) > 0.0);
  CHECK(number(fresh["solids"]["gibbsite"]["amount_mol"]) == 0.0);
  const YAML::Node aged = speciate_report(cases_directory / "alum-neutralised-aged.yaml");
  CHECK(aged["precipitates"].as<std::string>() == "aged");
  CHECK(number(aged["solids"]["gibbsite"]["amount_mol"]) > 0.0);
  CHECK(number(aged["solids"]["Al(OH)3(am)"]["amount_mol"]) == 0.0);
  // The saturation index of the form that may not form is the gap between the two solubility
  // constants: log *Ks 10.8 (Al(OH)3(am), Nordstrom et al. 1990) against 7.75 (gibbsite, Brown &
  // Ekberg 2016).
  CHECK(number(fresh["solids"]["gibbsite"]["saturation_index"]) == Approx(10.8 - 7.75).margin(1e-6));
  bool named = false;
  for (const auto& warning : fresh["warnings"]) named = named || warning.as<std::string>() == "Al(OH)3(am) precipitates (the fresh form)";
  CHECK(named);
  require_balances_close(fresh);
  require_balances_close(aged);
}

TEST_CASE("spent pickle liquor: ferrous chloride and sulfate are entered and speciated as Fe(II)", "[speciate][metals]") {
  const YAML::Node report = speciate_report(cases_directory / "spent-pickle-liquor.yaml");
  const double iron = number(report["solutes"]["Fe^2+"]["molality_mol_per_kg"]) +
                      number(report["solutes"]["FeSO4(aq)"]["molality_mol_per_kg"]) +
                      number(report["solutes"]["FeCl^+"]["molality_mol_per_kg"]) +
                      number(report["solutes"]["FeOH^+"]["molality_mol_per_kg"]);
  CHECK(iron * number(report["water_mass_kg"]) == Approx(0.07).epsilon(1e-6));  // FeCl2 0.05 + FeSO4 0.02 mol
  CHECK_FALSE(report["solutes"]["Fe^3+"]);  // no hidden oxidation: Fe(III) is another component
  require_balances_close(report);
}

TEST_CASE("a solution open to a gas takes it up by Henry's law", "[speciate][gases]") {
  const YAML::Node report = speciate_report(cases_directory / "water-open-to-co2.yaml");
  // KH(CO2) = 0.0340 mol kg⁻¹ atm⁻¹ at 25 °C (Plummer & Busenberg 1982, plummer-busenberg-1982), ±2 %.
  CHECK(number(report["solutes"]["CO2(aq)"]["molality_mol_per_kg"]) == Approx(0.0340).epsilon(0.02));
  CHECK(number(report["open_gases"]["CO2(g)"]["uptake_mol"]) > 0.034);
  require_balances_close(report);
}

TEST_CASE("a closed vessel forms a gas phase at its bubble point", "[speciate][gases]") {
  const YAML::Node report = speciate_report(cases_directory / "acidified-bicarbonate.yaml");
  const YAML::Node gas = report["gas_phase"];
  REQUIRE(gas);
  CHECK(gas["present"].as<bool>());
  double total = 0.0;
  for (const auto& g : gas["gases"]) total += number(g.second["partial_pressure_Pa"]);
  CHECK(total == Approx(101325.0).epsilon(1e-9));  // the partial pressures make up the total pressure
  // Water vapour over a 0.1 mol/kg solution: p_sat(25 °C) = 3.1699 kPa (IAPWS-95) times a_w ≈ 0.997.
  CHECK(number(gas["gases"]["H2O(g)"]["partial_pressure_Pa"]) == Approx(3169.9 * number(report["water_activity"])).epsilon(1e-3));
  require_balances_close(report);
}

TEST_CASE("given an enthalpy, speciate finds the temperature", "[speciate][energy]") {
  const YAML::Node at_25 = speciate_report(cases_directory / "hcl-0.01-davies.yaml");
  const double enthalpy = number(at_25["enthalpy_J"]);
  const protonflow::test_support::TemporaryDirectory directory;
  const fs::path file = directory.path() / "enthalpy.yaml";
  {
    std::ofstream out(file);
    out << "solution:\n  enthalpy: " << fmt::format("{:.17g}", enthalpy) << " J\n  activity_model: davies\n"
        << "  amounts_as: molality\n  components:\n    HCl: 0.01\n";
  }
  const YAML::Node found = speciate_report(file);
  CHECK(number(found["temperature_K"]) == Approx(298.15).epsilon(0.0).margin(1e-6));  // the energy round trip
  CHECK(number(found["pH"]) == Approx(number(at_25["pH"])).epsilon(0.0).margin(1e-8));
}

TEST_CASE("with the Pitzer model, an enthalpy given finds the temperature its heats of dilution imply", "[speciate][pitzer]") {
  // The brine's enthalpy at 25 °C includes its relative enthalpy L (docs/energy.md); given back as the
  // target, speciate must find 25 °C again, so both directions carry the same heats of dilution.
  const YAML::Node at_25 = speciate_report(cases_directory / "brine-pitzer.yaml");
  const double enthalpy = number(at_25["enthalpy_J"]);
  const fs::path directory = fs::temp_directory_path() / "protonflow-e2e-pitzer-enthalpy";
  fs::create_directories(directory);
  const fs::path file = directory / "brine.yaml";
  {
    std::ofstream out(file);
    out << "solution:\n  enthalpy: " << fmt::format("{:.17g}", enthalpy) << " J\n  activity_model: pitzer\n"
        << "  amounts_as: molality\n  components:\n    NaCl: 3.0\n    CaCl2: 0.5\n    HCl: 0.1\n";
  }
  const YAML::Node found = speciate_report(file);
  fs::remove_all(directory);
  CHECK(number(found["temperature_K"]) == Approx(298.15).epsilon(0.0).margin(1e-6));
  CHECK(number(found["pH"]) == Approx(number(at_25["pH"])).epsilon(0.0).margin(1e-8));
}

TEST_CASE("unknown solids and a doubly given temperature are rejected at their line", "[speciate][errors]") {
  require_rejected("unknown-solid.yaml", 4, 29, {"unknown solid 'gypsm'", "gypsum"});
  require_rejected("temperature-and-enthalpy.yaml", 3, 3, {"not both"});
}

TEST_CASE("a flowsheet's stream speciates as the same solution written as a solution file", "[speciate][stream]") {
  // The flowsheet's stream format serves speciate too: 2 mol/s of 0.01 mol/kg HCl is the solution
  // of hcl-0.01-davies.yaml at another scale, so every intensive result must agree.
  const YAML::Node from_stream =
      report_of(speciate(cases_directory / "flowsheet-with-hcl-stream.yaml", {"--stream", "rinse"}));
  const YAML::Node from_solution = speciate_report(cases_directory / "hcl-0.01-davies.yaml");
  require_same_speciation(from_stream, from_solution, 1e-9);
  require_balances_close(from_stream);
  const ProgramRun unknown = speciate(cases_directory / "flowsheet-with-hcl-stream.yaml", {"--stream", "rinsing"});
  CHECK(unknown.exit_code == 1);
  CHECK_THAT(unknown.err, Catch::Contains("no stream 'rinsing'") && Catch::Contains("rinse"));
}
