// Properties of the scrubber module over random gas loads and liquor rates: HCl removal never
// falls when a stage is added or the liquor rate rises, and every case either converges or is a
// typed error (PFU_NOT_CONVERGED, PFU_BAD_INLET) — never another failure, never a wrong answer
// passed off as one.
#include <catch2/catch.hpp>
#include <rapidcheck/catch.h>

#include <protonflow/unit_host.hpp>

#include <cmath>
#include <optional>
#include <vector>

namespace host = protonflow::unit_host;

namespace {

const host::Module& scrubber_module() {
  static const host::Module module(UNITS_SCRUBBER_MODULE);
  return module;
}

const host::Slate slate{{"H2O", "CO2", "HCl", "NaOH"}, {}};
constexpr std::size_t h2o = 0, co2 = 1, hcl = 2, naoh = 3;
constexpr double atmosphere = 101325.0;

struct Case {
  int stages;
  double efficiency;
  double hcl_in;          // mol/s in 1 mol/s of CO2 carrier
  double water;           // kg/s of liquor water
  double naoh_molality;   // mol/kg
  double gas_temperature, liquor_temperature;  // K
};

// HCl left in the cleaned gas, mol/s; nullopt for a typed error.
std::optional<double> hcl_out(const Case& c, int stages, double liquor_factor) {
  auto unit = scrubber_module().create(
      "scrubber", std::vector<host::ParameterValue>{{"stages", double(stages)}, {"efficiency", c.efficiency}}, slate);
  host::StreamState gas = host::empty_stream(slate);
  gas.temperature = c.gas_temperature;
  gas.pressure = atmosphere;
  gas.flows[PFU_GAS_ROW * 4 + co2] = 1.0;
  gas.flows[PFU_GAS_ROW * 4 + h2o] = 0.01;
  gas.flows[PFU_GAS_ROW * 4 + hcl] = c.hcl_in;
  host::StreamState liquor = host::empty_stream(slate);
  liquor.temperature = c.liquor_temperature;
  liquor.pressure = atmosphere;
  liquor.flows[PFU_AQUEOUS_ROW * 4 + h2o] = liquor_factor * c.water / 0.018015268;  // M(H2O), IAPWS-95
  liquor.flows[PFU_AQUEOUS_ROW * 4 + naoh] = liquor_factor * c.water * c.naoh_molality;
  host::StreamState no_reagent = host::empty_stream(slate);  // reagent_in, unconnected
  no_reagent.temperature = c.liquor_temperature;
  no_reagent.pressure = atmosphere;
  const std::vector<host::StreamState> inlets{gas, liquor, no_reagent};
  std::vector<host::StreamState> outlets(2);
  try {
    (void)unit.solve(inlets, outlets);
  } catch (const host::SolveError& error) {
    RC_ASSERT(error.status() == PFU_NOT_CONVERGED || error.status() == PFU_BAD_INLET);
    return std::nullopt;
  }
  return outlets[0].flows[PFU_GAS_ROW * 4 + hcl];
}

}  // namespace

TEST_CASE("property: scrubber HCl removal is monotone in stages and liquor rate, every case converges or is a typed error") {
  rc::prop("removal monotone", [] {
    Case c;
    c.stages = *rc::gen::inRange(1, 12);
    c.efficiency = *rc::gen::map(rc::gen::inRange(30, 101), [](int p) { return p / 100.0; });
    c.hcl_in = std::pow(10.0, *rc::gen::map(rc::gen::inRange(-50, -19), [](int e) { return e / 10.0; }));
    c.water = *rc::gen::map(rc::gen::inRange(2, 31), [](int d) { return d / 10.0; });
    c.naoh_molality = *rc::gen::map(rc::gen::inRange(0, 51), [](int d) { return d / 100.0; });
    c.gas_temperature = 273.15 + *rc::gen::inRange(10, 61);
    c.liquor_temperature = 273.15 + *rc::gen::inRange(10, 41);
    const auto base = hcl_out(c, c.stages, 1.0);
    const auto more_stages = hcl_out(c, c.stages + 1, 1.0);
    const auto more_liquor = hcl_out(c, c.stages, 1.5);
    RC_CLASSIFY(!base || !more_stages || !more_liquor, "typed error");
    // Round-off of the solve (scaled residuals 1e-10) and the 1e-30 mole-fraction floor.
    const auto no_more = [](double more, double less) { return more <= less * (1.0 + 1e-6) + 1e-28; };
    if (base && more_stages) RC_ASSERT(no_more(*more_stages, *base));
    if (base && more_liquor) RC_ASSERT(no_more(*more_liquor, *base));
  });
}
