// The flowsheet reader on its own (no modules, no species data): every composition basis and the
// units of measure, against conversions done by hand and against python3-pint (units) with
// python3-periodictable (molar masses); and the reader's errors, each with its position.
#include <cmath>
#include <string>
#include <vector>

#include <catch2/catch.hpp>
#include <fmt/format.h>

#include "flowsheet_file.hpp"
#include "flowsheet_quantity.hpp"
#include "python_reference.hpp"
#include "quantity.hpp"

using Catch::Matchers::Contains;
using namespace protonflow::host;

namespace {

const UnitConverter& converter() {
  static const UnitConverter units;
  return units;
}

// Streams only: the reader does not look at unit types, so any one unit entry will do. The
// "streams:" line put first makes every line number below one more than in the snippet.
FlowsheetInput parse(const std::string& streams, const std::string& top = "") {
  const std::string text = top + "streams:\n" + streams + "units:\n  u:\n    type: any\n    ports: {feed: a}\n";
  return parse_flowsheet(text, "test.yaml", converter());
}

const StreamInput& stream(const FlowsheetInput& input, const std::string& name) {
  for (const StreamInput& s : input.streams) {
    if (s.name == name) return s;
  }
  FAIL("no stream " << name);
  throw std::logic_error("unreachable");
}

// mol/s of a component in a phase of a stream, summed as the host sums them.
double flow(const FlowsheetInput& input, const std::string& name, PhaseKind kind, const std::string& formula) {
  double total = 0.0;
  bool found = false;
  for (const PhaseInput& phase : stream(input, name).phases) {
    if (phase.kind != kind) continue;
    for (const ComponentFlow& f : phase.flows) {
      if (f.formula == formula) {
        total += f.flow;
        found = true;
      }
    }
  }
  INFO(name << " " << formula);
  REQUIRE(found);
  return total;
}

std::string error_of(const std::string& streams, const std::string& top = "") {
  try {
    parse(streams, top);
  } catch (const InputError& error) {
    return format_diagnostic(error.where(), error.what());
  }
  return "no error";
}

// One stream of every basis; the flows are checked below against python3-pint.
const std::string all_bases = R"(  A:
    temperature: 20 degC
    pressure: 1.5 barg
    aqueous:
      flow: 1800 kg/h
      basis: mass_fraction
      composition: {H2SO4: 2 %, NaCl: 0.1 %, H2O: balance}
  B:
    temperature: 60 degC
    pressure: 1 atm
    gas:
      flow: 36 kmol/h
      basis: mole_fraction
      composition: {HCl: 0.02, CO2: 0.1, H2O: balance}
  C:
    temperature: 40 degC
    pressure: 105 kPa
    gas:
      flow: 1200 Nm3/h
      basis: volume_fraction
      composition: {HCl: 800 ppmv, SO2: 150 ppmv, CO2: balance}
  D:
    temperature: 25 degC
    pressure: 2 bar
    aqueous:
      flow: 2 t/h
      basis: molality
      composition: {HCl: 0.5, NaCl: 100 mmol/kg}
  E:
    temperature: 25 degC
    pressure: 2 bar
    aqueous:
      flow: 3 m3/h
      density: 1.02 kg/L
      basis: molarity
      composition: {H2SO4: 0.25, NaCl: 50 mmol/L}
  F:
    temperature: 25 degC
    pressure: 1 atm
    aqueous:
      flow: 40 L/min
      basis: mass_concentration
      composition: {CaCl2: 120, NaCl: 0.5 g/L}
  G:
    temperature: 77 degF
    pressure: 15 psig
    aqueous:
      flows: {H2O: 0.5 t/h, HCl: 2 kmol/h, NaOH: 10 lb/h}
  H:
    temperature: 80 degC
    pressure: 1.2 barg
    gas:
      flow: 100 m3/h
      basis: mole_fraction
      composition: {HCl: 1 %, CO2: balance}
  I:
    temperature: 25 degC
    pressure: 1 atm
    aqueous:
      flow: 1 kg/s
      basis: mole_fraction
      composition: {H2O: 0.99, HCl: 0.01}
  J:
    temperature: 25 degC
    pressure: 1 atm
    aqueous:
      flow: 10 mol/s
      basis: mass_fraction
      composition: {H2O: 0.9, NaOH: 0.1}
)";

// The same flows computed by python3-pint (units, R) and python3-periodictable (molar masses); water
// by M = 18.015268 g/mol (IAPWS-95), the value the program uses. Order: as in `expected` below.
const std::string pint_script = R"(
import pint, periodictable
u = pint.UnitRegistry(); Q = u.Quantity
def M(f):
    if f == 'H2O': return Q(18.015268, 'g/mol')
    return Q(periodictable.formula(f).mass, 'g/mol')
def out(q): print(q.to('mol/s').magnitude)
R = Q(1, 'molar_gas_constant')
# A: mass fractions of a mass flow
F = Q(1800, 'kg/h'); w = {'H2SO4': 0.02, 'NaCl': 0.001}; w['H2O'] = 1 - sum(w.values())
for f in ['H2SO4', 'NaCl', 'H2O']: out(w[f] * F / M(f))
# B: mole fractions of a molar flow
F = Q(36, 'kmol/h'); x = {'HCl': 0.02, 'CO2': 0.1}; x['H2O'] = 1 - sum(x.values())
for f in ['HCl', 'CO2', 'H2O']: out(x[f] * F)
# C: volume fractions of a normal-volume flow, DIN 1343: 273.15 K, 101.325 kPa, ideal gas
n = Q(101325, 'Pa') * Q(1200, 'm^3/h') / (R * Q(273.15, 'K'))
y = {'HCl': 800e-6, 'SO2': 150e-6}; y['CO2'] = 1 - sum(y.values())
for f in ['HCl', 'SO2', 'CO2']: out(y[f] * n)
# D: molalities of a mass flow: per kg of water, 1 kg + sum(b M) of solution
F = Q(2, 't/h'); b = {'HCl': Q(0.5, 'mol/kg'), 'NaCl': Q(100, 'mmol/kg')}
mw = F / (1 + sum((b[f] * M(f)).to('') for f in b))
for f in ['HCl', 'NaCl']: out(b[f] * mw)
out(mw / M('H2O'))
# E: molarities of a volume flow with the density given: water = rho - sum(c M) per volume
V = Q(3, 'm^3/h'); rho = Q(1.02, 'kg/L'); c = {'H2SO4': Q(0.25, 'mol/L'), 'NaCl': Q(50, 'mmol/L')}
for f in ['H2SO4', 'NaCl']: out(c[f] * V)
out((rho - sum(c[f] * M(f) for f in c)) * V / M('H2O'))
# F: mass concentrations; density of pure water at 25 degC, 1 atm from python3-iapws (IAPWS-95)
import iapws
V = Q(40, 'L/min'); rho = Q(iapws.IAPWS95(T=298.15, P=0.101325).rho, 'kg/m^3')
g = {'CaCl2': Q(120, 'mg/L'), 'NaCl': Q(0.5, 'g/L')}
for f in ['CaCl2', 'NaCl']: out(g[f] * V / M(f))
out((rho - sum(g.values())) * V / M('H2O'))
# G: each component's own flow
out(Q(0.5, 't/h') / M('H2O')); out(Q(2, 'kmol/h')); out(Q(10, 'lb/h') / M('NaOH'))
# H: an actual gas volume at 80 degC and 1.2 bar above the standard atmosphere
p = Q(1.2, 'bar') + Q(1, 'atm'); n = p * Q(100, 'm^3/h') / (R * Q(80, 'degC').to('K'))
out(0.01 * n); out(0.99 * n)
# I: mole fractions of a mass flow
x = {'H2O': 0.99, 'HCl': 0.01}; n = Q(1, 'kg/s') / sum(x[f] * M(f) for f in x)
for f in ['H2O', 'HCl']: out(x[f] * n)
# J: mass fractions of a molar flow
w = {'H2O': 0.9, 'NaOH': 0.1}; per = sum(w[f] / M(f) for f in w)
for f in ['H2O', 'NaOH']: out(Q(10, 'mol/s') * (w[f] / M(f)) / per)
)";

}  // namespace

TEST_CASE("every composition basis gives the molar flows python3-pint and python3-periodictable give") {
  const FlowsheetInput input = parse(all_bases);
  struct Expected {
    std::string stream;
    PhaseKind phase;
    std::string formula;
    double tolerance;
  };
  constexpr auto aq = PhaseKind::aqueous;
  constexpr auto gas = PhaseKind::gas;
  // 1e-9: the molar masses agree to that (tests/reference checks thermo against
  // python3-periodictable at 1e-9) and pint's R differs from CODATA's rounded one by 2e-11.
  // Stream F: 1e-5, because its default density is Kell's (1975) fit, which differs from
  // IAPWS-95 by 5e-6 at 25 °C.
  const std::vector<Expected> expected{
      {"A", aq, "H2SO4", 1e-9}, {"A", aq, "NaCl", 1e-9},   {"A", aq, "H2O", 1e-9},   {"B", gas, "HCl", 1e-12},
      {"B", gas, "CO2", 1e-12}, {"B", gas, "H2O", 1e-12},  {"C", gas, "HCl", 1e-9},  {"C", gas, "SO2", 1e-9},
      {"C", gas, "CO2", 1e-9},  {"D", aq, "HCl", 1e-9},    {"D", aq, "NaCl", 1e-9},  {"D", aq, "H2O", 1e-9},
      {"E", aq, "H2SO4", 1e-12}, {"E", aq, "NaCl", 1e-12}, {"E", aq, "H2O", 1e-9},   {"F", aq, "CaCl2", 1e-9},
      {"F", aq, "NaCl", 1e-9},  {"F", aq, "H2O", 1e-5},    {"G", aq, "H2O", 1e-12},  {"G", aq, "HCl", 1e-12},
      {"G", aq, "NaOH", 1e-9},  {"H", gas, "HCl", 1e-9},   {"H", gas, "CO2", 1e-9},  {"I", aq, "H2O", 1e-9},
      {"I", aq, "HCl", 1e-9},   {"J", aq, "H2O", 1e-9},    {"J", aq, "NaOH", 1e-9},
  };
  const std::vector<double> reference = protonflow::reference::run_python(pint_script);
  REQUIRE(reference.size() == expected.size());
  for (std::size_t i = 0; i < expected.size(); ++i) {
    const Expected& e = expected[i];
    INFO("stream " << e.stream << " " << e.formula);
    CHECK(flow(input, e.stream, e.phase, e.formula) == Approx(reference[i]).epsilon(e.tolerance));  // python3-pint
  }
}

TEST_CASE("composition bases against conversions done by hand") {
  const FlowsheetInput input = parse(all_bases);
  // B: 36 kmol/h is 10 mol/s; 2 % of it HCl, 10 % CO2, the balance 88 % water vapour.
  CHECK(flow(input, "B", PhaseKind::gas, "HCl") == Approx(0.2).epsilon(1e-14));
  CHECK(flow(input, "B", PhaseKind::gas, "CO2") == Approx(1.0).epsilon(1e-14));
  CHECK(flow(input, "B", PhaseKind::gas, "H2O") == Approx(8.8).epsilon(1e-14));
  // C: 1200 Nm3/h = 1/3 Nm3/s; the molar volume at DIN 1343 conditions is
  // R T_n / p_n = 8.314462618 × 273.15 / 101325 = 0.0224139695446 m3/mol (CODATA 2018 R), so the
  // flow is 14.8717 mol/s and 800 ppmv of it HCl.
  const double vm = 8.314462618 * 273.15 / 101325.0;
  CHECK(normal_molar_volume() == Approx(0.0224139695446).epsilon(1e-12));
  CHECK(flow(input, "C", PhaseKind::gas, "HCl") == Approx(800e-6 * (1200.0 / 3600.0) / vm).epsilon(1e-14));
  // E: 3 m3/h = 1/1200 m3/s of 0.25 mol/L = 250 mol/m3 sulfuric acid.
  CHECK(flow(input, "E", PhaseKind::aqueous, "H2SO4") == Approx(250.0 / 1200.0).epsilon(1e-14));
  // G: 2 kmol/h = 0.5556 mol/s; 0.5 t/h of water = 0.13889 kg/s / 0.018015268 kg/mol.
  CHECK(flow(input, "G", PhaseKind::aqueous, "HCl") == Approx(2000.0 / 3600.0).epsilon(1e-14));
  CHECK(flow(input, "G", PhaseKind::aqueous, "H2O") == Approx(500.0 / 3600.0 / 0.018015268).epsilon(1e-14));
  // I: mole fractions of 1 kg/s add back up to 1 kg/s.
  const double i_mass = flow(input, "I", PhaseKind::aqueous, "H2O") * 0.018015268 +
                        flow(input, "I", PhaseKind::aqueous, "HCl") * 0.036460939;  // HCl, IUPAC weights (by hand)
  CHECK(i_mass == Approx(1.0).epsilon(1e-6));
  // J: mass fractions of 10 mol/s keep the 10 mol/s.
  CHECK(flow(input, "J", PhaseKind::aqueous, "H2O") + flow(input, "J", PhaseKind::aqueous, "NaOH") ==
        Approx(10.0).epsilon(1e-14));
}

TEST_CASE("temperatures and pressures: UDUNITS-2 units, gauge pressures and the gauge reference") {
  const FlowsheetInput input = parse(all_bases);
  CHECK(stream(input, "A").temperature == Approx(293.15).epsilon(1e-15));  // 20 °C + 273.15 K (SI Brochure)
  CHECK(stream(input, "G").temperature == Approx(298.15).epsilon(1e-12));  // 77 °F = 25 °C, by hand
  // Gauge pressures are measured from the standard atmosphere, 101325 Pa: 1.5 barg = 150000 Pa + 101325 Pa.
  CHECK(stream(input, "A").pressure == Approx(251325.0).epsilon(1e-15));
  // 15 psig: 15 psi is 103421.359 Pa (python3-pint: Q(15, 'psi').to('Pa')) above the atmosphere.
  CHECK(stream(input, "G").pressure == Approx(103421.35939752545 + 101325.0).epsilon(1e-12));
  CHECK(stream(input, "B").pressure == Approx(101325.0).epsilon(1e-15));  // 1 atm, exact by definition

  // A site at altitude sets its own reference; absolute units ignore it.
  const FlowsheetInput high = parse(R"(  s:
    temperature: 10 degC
    pressure: 0.5 barg
    aqueous: {flows: {H2O: 1 mol/s}}
  t:
    temperature: 10 degC
    pressure: 2 bara
    aqueous: {flows: {H2O: 1 mol/s}}
  v:
    temperature: 10 degC
    pressure: 300 kPa(g)
    aqueous: {flows: {H2O: 1 mol/s}}
)",
                                    "gauge_reference: 95 kPa\n");
  CHECK(high.gauge_reference == Approx(95000.0));
  CHECK(stream(high, "s").pressure == Approx(50000.0 + 95000.0).epsilon(1e-15));
  CHECK(stream(high, "t").pressure == Approx(200000.0).epsilon(1e-15));
  CHECK(stream(high, "v").pressure == Approx(300000.0 + 95000.0).epsilon(1e-15));
}

TEST_CASE("the quantity reader's extensions: gauge, normal volume and differences") {
  const QuantityReader reader(converter());
  CHECK(reader.to_si(2.0, "barg", "Pa") == Approx(301325.0));
  CHECK(reader.to_si(2.0, "bar(g)", "Pa") == Approx(301325.0));
  CHECK(reader.to_si(2.0, "bar", "Pa") == Approx(200000.0));
  CHECK(reader.to_si(3.0, "Pa", "Pa") == 3.0);  // "Pa" ends in "a" but is no absolute suffix
  // 22.413969545 L of ideal gas at DIN 1343 conditions is one mole.
  CHECK(reader.to_si(22.413969545, "NL", "mol") == Approx(1.0).epsilon(1e-10));
  CHECK(reader.to_si(3600.0, "Nm3/h", "mol/s") == Approx(1.0 / normal_molar_volume()).epsilon(1e-14));
  CHECK_THROWS_AS(reader.to_si(1.0, "Nm3/h", "K"), QuantityError);
  CHECK_THROWS_AS(reader.to_si(1.0, "barg", "K"), QuantityError);
  CHECK_THROWS_AS(reader.to_si(1.0, "kg", "Pa"), QuantityError);
  // A tolerance in °C is a difference: 0.5 degC is 0.5 K, not 273.65 K.
  CHECK(reader.difference_to_si(0.5, "degC", "K") == Approx(0.5).epsilon(1e-12));
  CHECK(reader.difference_to_si(1.0, "barg", "Pa") == Approx(1e5).epsilon(1e-12));
}

TEST_CASE("the reader's errors point at the cause and say what is wrong") {
  const std::string head = "  s:\n    temperature: 25 degC\n    pressure: 1 atm\n";
  // Fractions that do not add up to 1 say by how much.
  CHECK_THAT(error_of(head + "    aqueous:\n      flow: 1 kg/s\n      basis: mole_fraction\n      composition: {H2O: 0.7, HCl: 0.2}\n"),
             Contains("test.yaml:8:7: error:") && Contains("the mole fractions add up to 0.9, 0.1 short of 1"));
  CHECK_THAT(error_of(head + "    aqueous:\n      flow: 1 kg/s\n      basis: mass_fraction\n      composition: {H2O: 0.9, HCl: 0.2}\n"),
             Contains("add up to 1.1, 0.1 over 1"));
  CHECK_THAT(error_of(head + "    aqueous:\n      flow: 1 kg/s\n      basis: mass_fraction\n      composition: {HCl: 0.7, NaCl: 0.5, H2O: balance}\n"),
             Contains("test.yaml:8:42: error:") && Contains("already add up to 1.2"));
  // ppmv is a gas's measure.
  CHECK_THAT(error_of(head + "    aqueous:\n      flow: 1 kg/s\n      basis: mass_fraction\n      composition: {HCl: 5 ppmv, H2O: balance}\n"),
             Contains("ppmv and ppbv are parts by volume of a gas"));
  // A normal volume is a gas flow.
  CHECK_THAT(error_of(head + "    aqueous:\n      flow: 1 Nm3/h\n      basis: mass_fraction\n      composition: {H2O: 1}\n"),
             Contains("test.yaml:6:13: error:") && Contains("normal volume"));
  // Water is the solvent of a molality.
  CHECK_THAT(error_of(head + "    aqueous:\n      flow: 1 kg/s\n      basis: molality\n      composition: {H2O: 55, HCl: 0.1}\n"),
             Contains("water is the solvent: do not list H2O"));
  CHECK_THAT(error_of(head + "    gas:\n      flow: 1 mol/s\n      basis: molality\n      composition: {HCl: 0.1}\n"),
             Contains("basis molality is for aqueous solutions"));
  CHECK_THAT(error_of(head + "    aqueous:\n      flow: 1 kg/s\n      basis: mass_fracton\n      composition: {H2O: 1}\n"),
             Contains("unknown basis 'mass_fracton'; did you mean 'mass_fraction'?"));
  CHECK_THAT(error_of(head + "    aqueous:\n      flow: 1 kg\n      basis: mass_fraction\n      composition: {H2O: 1}\n"),
             Contains("is not a molar (kmol/h), mass (t/h) or volume (m3/h) flow"));
  CHECK_THAT(error_of(head + "    aqueous:\n      flow: -1 kg/s\n      basis: mass_fraction\n      composition: {H2O: 1}\n"),
             Contains("flow is negative"));
  CHECK_THAT(error_of(head + "    aqueous:\n      flows: {H2O: 1 kg/s, HCl: -2 mol/s}\n"),
             Contains("test.yaml:6:33: error: the flow of HCl is negative"));
  CHECK_THAT(error_of(head + "    aqueous:\n      flows: {H2O: 1}\n"), Contains("needs a unit"));
  CHECK_THAT(error_of(head + "    aqueous:\n      flows: {H2O: 1 K}\n"), Contains("neither a molar flow"));
  CHECK_THAT(error_of(head + "    aqueous:\n      flows: {Na2^+: 1 mol/s}\n"), Contains("is charged"));
  CHECK_THAT(error_of("  s:\n    temperature: 25\n    pressure: 1 atm\n    aqueous: {flows: {H2O: 1 mol/s}}\n"),
             Contains("test.yaml:3:18: error: temperature '25' needs a unit"));
  CHECK_THAT(error_of("  s:\n    temperature: 25 degC\n    pressure: -2 barg\n    aqueous: {flows: {H2O: 1 mol/s}}\n"),
             Contains("the absolute pressure is -98675 Pa"));
  CHECK_THAT(error_of("  s:\n    temperature: 25 degC\n    presure: 1 atm\n"),
             Contains("test.yaml:4:5: error: unknown key 'presure' in stream 's'; did you mean 'pressure'?"));
  CHECK_THAT(error_of("  s:\n    temperature: 25 degC\n    pressure: 1 atm\n"), Contains("has no phase"));
  CHECK_THAT(error_of("  s.1:\n    temperature: 25 degC\n"), Contains("may use only letters, digits"));
  CHECK_THAT(error_of(head + "    aqueous: {flows: {H2O: 1 mol/s}}\n", "solver: {tolerance: 2}\n"),
             Contains("tolerance is 2; it must be a number from"));
}
