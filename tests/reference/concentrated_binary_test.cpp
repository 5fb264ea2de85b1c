// The concentrated solute–water binaries (thermo/concentrated_binary.hpp) against outside values
// that are not rows of the validation table, and against the thermodynamic identities the model
// claims: Gibbs–Helmholtz, Gibbs–Duhem, Kirchhoff, and closed mass and energy balances on boiling.
// Sources beside each assertion; keys in docs/references.md.
#include "protonflow/thermo/concentrated_binary.hpp"

#include <fmt/format.h>

#include <catch2/catch.hpp>
#include <algorithm>
#include <cmath>
#include <iterator>
#include <limits>
#include <stdexcept>
#include <string>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/pitzer_enthalpy.hpp"
#include "protonflow/thermo/stream_enthalpy.hpp"
#include "python_reference.hpp"
#include "solution_probe.hpp"

using namespace protonflow::thermo;
using protonflow::reference::run_python;

namespace {

constexpr ConcentratedBinary all_binaries[] = {ConcentratedBinary::sulfuric_acid, ConcentratedBinary::hydrochloric_acid,
                                               ConcentratedBinary::nitric_acid, ConcentratedBinary::sodium_hydroxide};
constexpr double atmosphere = 101325.0;

double mole_fraction(ConcentratedBinary b, double w) {
  const double solute = w / describe(b).solute_molar_mass, water = (1.0 - w) / constants::water_molar_mass;
  return solute / (solute + water);
}

// Total enthalpy of mixing (J) of n_w mol water and n_s mol solute at T, from the per-kg property.
double mixing_enthalpy(ConcentratedBinary b, double temperature, double water_moles, double solute_moles) {
  const double water_mass = water_moles * constants::water_molar_mass;
  const double solute_mass = solute_moles * describe(b).solute_molar_mass;
  const double w = solute_mass / (water_mass + solute_mass);
  return (water_mass + solute_mass) * binary_properties(b, temperature, w).enthalpy_of_mixing;
}

}  // namespace

TEST_CASE("concentrated binaries: water's vapour pressure at zero solute matches IAPWS-95 through python3-iapws") {
  const auto reference = run_python(
      "from iapws import IAPWS95\n"
      "for T in (278.15, 298.15, 323.15, 348.15, 368.15):\n"
      "    print(IAPWS95(T=T, x=0).P * 1e6)\n");
  REQUIRE(reference.size() == 5);
  const double temperatures[] = {278.15, 298.15, 323.15, 348.15, 368.15};
  for (const ConcentratedBinary b : all_binaries)
    for (int k = 0; k < 5; ++k) {
      INFO(describe(b).solute << " at T = " << temperatures[k] << " K");
      const BinaryProperties p = binary_properties(b, temperatures[k], 0.0);
      CHECK(p.water_vapour_pressure == Approx(reference[k]).epsilon(1e-4));  // Source: python3-iapws (IAPWS-95)
      CHECK(p.solute_vapour_pressure == 0.0);
      CHECK(p.water_activity == 1.0);
    }
}

TEST_CASE("concentrated binaries: heat capacity is the temperature derivative of the enthalpy (Kirchhoff)") {
  for (const ConcentratedBinary b : all_binaries) {
    const BinaryRange r = describe(b).range;
    for (const double w : {0.0, 0.3 * r.maximum_mass_fraction, 0.7 * r.maximum_mass_fraction, r.maximum_mass_fraction})
      for (const double t : {280.0, 320.0, 360.0}) {
        INFO(describe(b).solute << " w = " << w << ", T = " << t);
        const double dh = (binary_specific_enthalpy(b, t + 0.01, w) - binary_specific_enthalpy(b, t - 0.01, w)) / 0.02;
        CHECK(binary_properties(b, t, w).heat_capacity == Approx(dh).epsilon(1e-6));
      }
  }
}

TEST_CASE("concentrated binaries: water activity obeys Gibbs-Helmholtz with the enthalpy of mixing") {
  // −R T² ∂ln a_w/∂T must equal the relative partial molar enthalpy of water, ∂H_mix/∂n_w, taken
  // here from the enthalpy of mixing by finite differences: two separate paths through the model.
  for (const ConcentratedBinary b : all_binaries) {
    const BinaryRange r = describe(b).range;
    for (const double fraction : {0.2, 0.5, 0.9})
      for (const double t : {290.0, 330.0, 370.0}) {
        const double w = fraction * r.maximum_mass_fraction;
        const double x = mole_fraction(b, w);
        INFO(describe(b).solute << " w = " << w << ", T = " << t);
        const double dt = 0.01;
        const double ln_up = std::log(binary_properties(b, t + dt, w).water_activity);
        const double ln_down = std::log(binary_properties(b, t - dt, w).water_activity);
        const double from_activity = -constants::gas_constant * t * t * (ln_up - ln_down) / (2.0 * dt);
        const double dn = 1e-5;
        const double from_enthalpy =
            (mixing_enthalpy(b, t, 1.0 - x + dn, x) - mixing_enthalpy(b, t, 1.0 - x - dn, x)) / (2.0 * dn);
        CHECK(from_activity == Approx(from_enthalpy).margin(2.0).epsilon(1e-4));
      }
  }
}

TEST_CASE("concentrated binaries: water and HCl/HNO3 activities obey Gibbs-Duhem at every temperature") {
  // (1 − x) d ln a_w + x d ln a_s = 0, with a_s proportional to the solute's partial pressure.
  for (const ConcentratedBinary b : {ConcentratedBinary::hydrochloric_acid, ConcentratedBinary::nitric_acid})
    for (const double t : {298.15, 340.0})
      for (const double fraction : {0.1, 0.4, 0.8}) {
        const double w = fraction * describe(b).range.maximum_mass_fraction, dw = 1e-6;
        INFO(describe(b).solute << " w = " << w << ", T = " << t);
        const BinaryProperties up = binary_properties(b, t, w + dw), down = binary_properties(b, t, w - dw);
        const double dx = mole_fraction(b, w + dw) - mole_fraction(b, w - dw), x = mole_fraction(b, w);
        const double water_term = (1.0 - x) * std::log(up.water_activity / down.water_activity) / dx;
        const double solute_term = x * std::log(up.solute_vapour_pressure / down.solute_vapour_pressure) / dx;
        CHECK(water_term + solute_term == Approx(0.0).margin(1e-4 * std::abs(solute_term)));
      }
}

TEST_CASE("H2SO4: water activity carried to 75 °C from the NBS heats agrees with Zeleznik's model to 50 wt %") {
  // zeleznik-1991 evaluated at 348.15 K (coefficients read from a public transcription; values
  // computed): the model's 298.15 K isotherm is Zeleznik's, its temperature dependence the NBS heats'.
  // Above 50 wt % the two differ by 3–7 % at 75 °C (docs/concentrated-acids.md).
  const double w[] = {0.1, 0.2, 0.3, 0.4, 0.5};
  const double zeleznik[] = {0.95996, 0.88848, 0.77139, 0.60980, 0.41889};
  for (int k = 0; k < 5; ++k) {
    INFO("w = " << w[k]);
    CHECK(binary_properties(ConcentratedBinary::sulfuric_acid, 348.15, w[k]).water_activity ==
          Approx(zeleznik[k]).epsilon(0.02));  // Source: zeleznik-1991
  }
}

TEST_CASE("NaOH: boiling points at 1 atm agree with Olsson's vapour-pressure correlation") {
  // olsson-1997: their vapour-pressure equation solved for 101.325 kPa (coefficients read from a public
  // transcription; values computed). The model carries their 25 °C water activity to the boiling
  // point with their enthalpies (Gibbs–Helmholtz), so this checks the two correlations' agreement.
  const double w[] = {0.1, 0.2, 0.3, 0.4, 0.5};
  const double olsson_celsius[] = {102.81, 107.92, 117.01, 130.14, 146.38};
  for (int k = 0; k < 5; ++k) {
    INFO("w = " << w[k]);
    const double t = bubble_temperature(ConcentratedBinary::sodium_hydroxide, w[k], atmosphere) - 273.15;
    CHECK(t == Approx(olsson_celsius[k]).margin(1.5));  // Source: olsson-1997
  }
}

TEST_CASE("concentrated binaries: an adiabatic outlet below its bubble point returns the temperature of its enthalpy") {
  for (const ConcentratedBinary b : all_binaries) {
    const BinaryRange r = describe(b).range;
    for (const double w : {0.0, 0.5 * r.maximum_mass_fraction, r.maximum_mass_fraction})
      for (const double t : {275.0, 300.0, 325.0}) {
        double bubble = std::numeric_limits<double>::infinity();
        try {
          bubble = bubble_temperature(b, w, atmosphere);
        } catch (const BinaryRangeError&) {
        }
        if (t >= bubble) continue;
        INFO(describe(b).solute << " w = " << w << ", T = " << t);
        const AdiabaticOutlet o = adiabatic_outlet(b, w, binary_specific_enthalpy(b, t, w), atmosphere);
        CHECK_FALSE(o.boiling);
        CHECK(o.temperature == Approx(t).margin(1e-6));
        CHECK(o.vapour_fraction == 0.0);
        CHECK(o.liquid_solute_mass_fraction == w);
      }
  }
}

TEST_CASE("H2SO4: 98 % acid diluted with water at 25 °C boils at 70 % and 50 %, not at 20 %") {
  // Derived from the heats of solution (nbs-1982, nbs-circular-500, zeleznik-1991): both outlets pass their boiling
  // points, so the outlet is at its bubble point with the steam it makes; mass and energy balance close.
  const ConcentratedBinary b = ConcentratedBinary::sulfuric_acid;
  const double h_acid = binary_specific_enthalpy(b, 298.15, 0.98), h_water = binary_specific_enthalpy(b, 298.15, 0.0);
  for (const double target : {0.70, 0.50, 0.20}) {
    INFO("diluted to " << target);
    const double water = 0.98 / target - 1.0;  // kg water per kg acid
    const double h = (h_acid + water * h_water) / (1.0 + water);
    const AdiabaticOutlet o = adiabatic_outlet(b, target, h, atmosphere);
    CHECK(o.boiling == (target > 0.3));
    if (!o.boiling) continue;
    const double v = o.vapour_fraction;
    CHECK(v > 0.0);
    CHECK(o.vapour_solute_mass_fraction == 0.0);                                        // H2SO4 vapour is not modelled
    CHECK((1.0 - v) * o.liquid_solute_mass_fraction == Approx(target).epsilon(1e-12));  // solute balance
    CHECK(o.temperature == Approx(bubble_temperature(b, o.liquid_solute_mass_fraction, atmosphere)).margin(1e-6));
    const double h_out = (1.0 - v) * binary_specific_enthalpy(b, o.temperature, o.liquid_solute_mass_fraction) +
                         v * vapour_specific_enthalpy(b, o.temperature, 0.0);
    CHECK(h_out == Approx(h).margin(1e-3));  // energy balance, J/kg
  }
}

TEST_CASE("HCl: a boiling outlet beyond the azeotrope gives off HCl-rich vapour, and both balances close") {
  const ConcentratedBinary b = ConcentratedBinary::hydrochloric_acid;
  const double w = 0.34, t_bubble = bubble_temperature(b, w, atmosphere);
  const double h = binary_specific_enthalpy(b, t_bubble, w) + 20e3;  // 20 kJ/kg above the bubble point
  const AdiabaticOutlet o = adiabatic_outlet(b, w, h, atmosphere);
  REQUIRE(o.boiling);
  CHECK(o.vapour_solute_mass_fraction > w);
  CHECK(o.liquid_solute_mass_fraction < w);
  const double v = o.vapour_fraction;
  CHECK((1.0 - v) * o.liquid_solute_mass_fraction + v * o.vapour_solute_mass_fraction == Approx(w).epsilon(1e-10));
  const double h_out = (1.0 - v) * binary_specific_enthalpy(b, o.temperature, o.liquid_solute_mass_fraction) +
                       v * vapour_specific_enthalpy(b, o.temperature, o.vapour_solute_mass_fraction);
  CHECK(h_out == Approx(h).margin(1e-3));
}

// Perry's partial pressures of HCl and of water over 30–38 wt % HCl, mmHg, at 0–50 °C by 5 K and
// 60–110 °C by 10 K (perry-hcl-partial-pressures, read; the table's HCl column stops above 1 atm).
// The model takes none of these: its pressures come from γ± at 25 °C and Parker's heats.
constexpr double perry_temperatures[] = {0, 5, 10, 15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110};
constexpr double not_tabulated = std::numeric_limits<double>::quiet_NaN();
struct PerryColumn {
  double mass_fraction;
  double hcl[17], water[17];
};
constexpr PerryColumn perry_columns[] = {
    {0.30,
     {2.4, 3.57, 5.23, 7.6, 10.6, 15.1, 21.0, 28.6, 39.4, 53, 71, 124, 208, 340, 542, 845, not_tabulated},
     {1.26, 1.90, 2.73, 3.88, 5.41, 7.52, 10.2, 13.7, 18.4, 24.3, 32.0, 53.5, 87.5, 136, 207, 310, 444}},
    {0.32,
     {5.7, 8.3, 11.8, 16.8, 23.5, 32.5, 44.5, 60, 81, 107, 141, 238, 390, 623, 970, not_tabulated, not_tabulated},
     {1.04, 1.57, 2.27, 3.25, 4.55, 6.37, 8.7, 11.7, 15.7, 21.0, 27.7, 46.5, 76.5, 120, 184, 275, 396}},
    {0.34,
     {13.1, 18.8, 26.4, 36.8, 50.5, 68.5, 92, 122, 161, 211, 273, 450, 720, not_tabulated, not_tabulated,
      not_tabulated, not_tabulated},
     {0.85, 1.29, 1.87, 2.70, 3.81, 5.35, 7.32, 9.95, 13.5, 18.1, 24.0, 40.5, 66.5, 104, 161, 243, 355}},
    {0.36,
     {29.0, 41.0, 56.4, 78.0, 105.5, 142, 188, 246, 322, 416, 535, 860, not_tabulated, not_tabulated, not_tabulated,
      not_tabulated, not_tabulated},
     {0.68, 1.03, 1.50, 2.19, 3.10, 4.41, 6.08, 8.33, 11.4, 15.4, 20.4, 34.8, 57, 90, 140, 212, 311}},
    {0.38,
     {63, 87, 117, 158, 210, 277, 360, 465, 598, 758, 955, not_tabulated, not_tabulated, not_tabulated,
      not_tabulated, not_tabulated, not_tabulated},
     {0.53, 0.81, 1.20, 1.75, 2.51, 3.60, 5.03, 6.92, 9.52, 13.0, 17.4, 29.6, 49.1, 77.5, 120, 182, 266}},
};

// The bubble point (°C) the table implies at a total pressure (mmHg): the two tabulated temperatures
// whose HCl + water pressures bracket it, ln p interpolated linearly in 1/T.
double perry_bubble_point(const PerryColumn& column, double total_pressure) {
  for (std::size_t k = 0; k + 1 < std::size(perry_temperatures); ++k) {
    const double low = column.hcl[k] + column.water[k], high = column.hcl[k + 1] + column.water[k + 1];
    if (!(low <= total_pressure && total_pressure < high)) continue;
    const double x_low = 1.0 / (perry_temperatures[k] + 273.15), x_high = 1.0 / (perry_temperatures[k + 1] + 273.15);
    const double f = std::log(total_pressure / low) / std::log(high / low);
    return 1.0 / (x_low + f * (x_high - x_low)) - 273.15;
  }
  throw std::out_of_range("the total pressure is not bracketed by the table");
}

TEST_CASE("HCl: at 30-38 wt % the bubble points at 0.5 and 1 atm lie within 2 K of those Perry's pressures imply") {
  // The boiling curve of fuming acid is set by how fast the HCl pressure rises with T. The model
  // (emf-based γ± at 25 °C, Parker's heats) and Perry's table agree on it within 2 K (the issue's
  // tolerance for boiling points); the handbook's 61 °C for 36 wt % (validation.md) is 4.5 K above
  // what the table itself implies.
  const ConcentratedBinary b = ConcentratedBinary::hydrochloric_acid;
  for (const PerryColumn& column : perry_columns)
    for (const double mmhg : {380.0, 760.0}) {
      const double table = perry_bubble_point(column, mmhg);
      const double model = bubble_temperature(b, column.mass_fraction, mmhg * 133.322) - 273.15;
      INFO(fmt::format("{:g} wt % at {:g} mmHg: table {:.2f} °C, model {:.2f} °C", 100 * column.mass_fraction, mmhg,
                       table, model));
      CHECK(std::abs(model - table) < 2.0);
    }
}

TEST_CASE("HCl: near the 36 wt % bubble point water is a few per cent of the vapour and meets Perry's table") {
  // So the water cannot be what moves the 36 % boiling point: at 50 and 60 °C the water pressure is
  // under 5 % of the total, and within 5 % of Perry's (perry-hcl-partial-pressures), which alone would
  // shift the bubble point by under 0.1 K.
  const ConcentratedBinary b = ConcentratedBinary::hydrochloric_acid;
  const PerryColumn& column = perry_columns[3];
  REQUIRE(column.mass_fraction == 0.36);
  for (const std::size_t k : {std::size_t{10}, std::size_t{11}}) {
    const BinaryProperties p = binary_properties(b, perry_temperatures[k] + 273.15, column.mass_fraction);
    INFO(fmt::format("{:g} °C: water {:.2f} mmHg (table {:.2f}), HCl {:.1f} mmHg (table {:.1f})", perry_temperatures[k],
                     p.water_vapour_pressure / 133.322, column.water[k], p.solute_vapour_pressure / 133.322,
                     column.hcl[k]));
    CHECK(p.water_vapour_pressure / (p.water_vapour_pressure + p.solute_vapour_pressure) < 0.05);
    CHECK(p.water_vapour_pressure / 133.322 == Approx(column.water[k]).epsilon(0.05));
  }
}

TEST_CASE("concentrated binaries: outside the range a typed error names the quantity and the range") {
  const ConcentratedBinary hcl = ConcentratedBinary::hydrochloric_acid;
  try {
    binary_properties(hcl, 298.15, 0.45);
    FAIL("no error for 45 wt % HCl");
  } catch (const BinaryRangeError& e) {
    CHECK(e.kind() == ErrorKind::out_of_range);
    CHECK(e.binary() == hcl);
    CHECK(e.quantity() == "solute mass fraction");
    CHECK(e.value() == 0.45);
    CHECK(e.maximum() == 0.38);
    CHECK(std::string(e.what()).find("0–0.38") != std::string::npos);
  }
  CHECK_THROWS_AS(binary_properties(ConcentratedBinary::sulfuric_acid, 200.0, 0.5), BinaryRangeError);
  CHECK_THROWS_AS(binary_properties(ConcentratedBinary::sodium_hydroxide, 298.15, -0.01), BinaryRangeError);
  try {
    binary_properties(ConcentratedBinary::nitric_acid, std::nan(""), 0.3);
    FAIL("no error for a NaN temperature");
  } catch (const ThermoError& e) {
    CHECK(e.kind() == ErrorKind::bad_input);
  }
  try {
    concentrated_binary_of("KOH");
    FAIL("no error for KOH");
  } catch (const ThermoError& e) {
    CHECK(e.kind() == ErrorKind::unknown_species);
  }
  CHECK(concentrated_binary_of("HNO3") == ConcentratedBinary::nitric_acid);
  // 38 % HCl boils below 273.15 K at 0.02 atm: the bubble point lies below the range, and says so.
  CHECK_THROWS_AS(bubble_temperature(hcl, 0.38, 0.02 * atmosphere), BinaryRangeError);
  CHECK_THROWS_AS(vapour_specific_enthalpy(ConcentratedBinary::sodium_hydroxide, 350.0, 0.1), ThermoError);
  // 10 % HCl given 3 MJ/kg more than at its bubble point: one equilibrium stage would boil it all.
  try {
    const double t = bubble_temperature(hcl, 0.10, atmosphere);
    adiabatic_outlet(hcl, 0.10, binary_specific_enthalpy(hcl, t, 0.10) + 3e6, atmosphere);
    FAIL("no error for a feed that boils away");
  } catch (const BinaryRangeError& e) {
    CHECK(e.quantity().find("boil the whole feed") != std::string::npos);
  }
}

TEST_CASE("concentrated binaries: the ionic scope says where a pH may be given, and why not beyond") {
  const IonicModelScope dilute = ionic_model_scope(ConcentratedBinary::sulfuric_acid, 0.05);
  CHECK(dilute.meaningful);
  CHECK(dilute.solute_molality ==
        Approx(0.05 / (0.95 * describe(ConcentratedBinary::sulfuric_acid).solute_molar_mass)));
  const IonicModelScope concentrated = ionic_model_scope(ConcentratedBinary::sulfuric_acid, 0.98);
  CHECK_FALSE(concentrated.meaningful);
  CHECK(concentrated.reason.find("no meaningful pH") != std::string::npos);
  CHECK(binary_properties(ConcentratedBinary::sulfuric_acid, 298.15, 0.98).ionic_scope.reason == concentrated.reason);
  const IonicModelScope pure = ionic_model_scope(ConcentratedBinary::sulfuric_acid, 1.0);
  CHECK(std::isinf(pure.solute_molality));
  CHECK_FALSE(pure.meaningful);
  for (const ConcentratedBinary b : all_binaries) {
    INFO(describe(b).solute);
    CHECK(ionic_model_scope(b, 0.01).meaningful);
    CHECK_FALSE(ionic_model_scope(b, describe(b).range.maximum_mass_fraction).meaningful);
  }
}

TEST_CASE("concentrated binaries: at high dilution the enthalpy meets the engine's NBS-convention state enthalpy") {
  // The engine's dilute-solution enthalpy (docs/energy.md) of 1 kg of water holding 0.01 mol of HCl
  // or NaOH, from its own species data, against the binary model's enthalpy of the same amounts. The
  // engine leaves out heats of dilution, so the two must differ by L_φ at 0.01 mol/kg and nothing
  // else: HCl 0.197 kJ/mol (parker-1965, read); for NaOH no L_φ was read, and the model's is under
  // 0.3 kJ/mol there. This fixes the binary models to the engine's convention (ΔfH° of H2O(l), HCl(g),
  // NaOH(s), the infinite-dilution heats), so a unit can add the two kinds of enthalpy.
  using protonflow::reference::solve_recipe;
  const struct {
    ConcentratedBinary binary;
    const char* component;
    double l_phi, tolerance;
  } cases[] = {{ConcentratedBinary::hydrochloric_acid, "HCl", 0.197, 0.05},
               {ConcentratedBinary::sodium_hydroxide, "NaOH", 0.0, 0.3}};
  const double moles = 0.01;
  for (const auto& c : cases) {
    INFO(c.component);
    const auto r = solve_recipe({{c.component, moles}}, ActivityModelKind::davies);
    const double engine = state_enthalpy(r.system, r.speciation);
    const double solute_mass = moles * describe(c.binary).solute_molar_mass;
    const double water_mass = r.speciation.water_mass;
    const double binary = (water_mass + solute_mass) *
                          binary_specific_enthalpy(c.binary, 298.15, solute_mass / (water_mass + solute_mass));
    // Water's own ions shift the engine's water mass by a few µg; that is far below the tolerance.
    CHECK((binary - engine) / moles / 1e3 == Approx(c.l_phi).margin(c.tolerance));
  }
}

TEST_CASE("HCl: at the 6 mol/kg hand-over the binary holds Parker's heat of dilution that the dilute engine lacks") {
  // The gap a mixer would see at the hand-over, binary minus engine enthalpy per mol HCl, is L_φ at
  // 6 mol/kg: 6.268 kJ/mol (parker-1965, read). It is the term the Pitzer model's temperature
  // derivatives supply (docs/concentrated-acids.md, "Where the ionic engine takes over").
  using protonflow::reference::solve_recipe;
  const double moles = 6.0;
  const auto r = solve_recipe({{"HCl", moles}}, ActivityModelKind::davies);
  const double engine = state_enthalpy(r.system, r.speciation);
  const double solute_mass = moles * describe(ConcentratedBinary::hydrochloric_acid).solute_molar_mass;
  const double total = r.speciation.water_mass + solute_mass;
  const double binary =
      total * binary_specific_enthalpy(ConcentratedBinary::hydrochloric_acid, 298.15, solute_mass / total);
  CHECK((binary - engine) / moles / 1e3 == Approx(6.268).epsilon(0.03));  // Source: parker-1965
}

TEST_CASE("hand-over to the Pitzer engine: enthalpy and water activity are continuous at each binary's ionic limit") {
  // At the molality where each binary model hands over to the ionic engine (IonicModelScope, the
  // range of the ion-interaction parameters), the engine with the Pitzer model — its equilibrium
  // enthalpy with the Pitzer heats of dilution, and its water activity — must meet the binary model
  // for the same 1 kg of water and the same amount of solute, within the uncertainty of the data both
  // rest on:
  //  - enthalpy per mol of solute within 5 % of L_φ there, the tolerance the Pitzer L_φ checks hold
  //    against Parker 1965 (parker-1965: HCl 6.268 kJ/mol at 6 mol/kg; NaOH's L_φ at 6 mol/kg from
  //    the binary's own source, olsson-1997, is about 2 kJ/mol, so 5 % of the larger of 2 kJ/mol and
  //    HCl's gives 0.32 kJ/mol for both);
  //  - water activity within 0.5 %: the spread of the published osmotic coefficients at 6 mol/kg
  //    (robinson-stokes-1959 against the isopiestic work they summarise, about 1 % in φ; 0.5 % in a_w
  //    at a_w ≈ 0.7, from memory).
  //  - H2SO4 at 6.1 mol/kg (the Clegg, Rard & Pitzer 1994 model, with its temperature functions and
  //    its own HSO4^- enthalpy, against the NBS heats in the binary): 5 % of L_φ there (about
  //    30 kJ/mol, so 1.5 kJ/mol; measured −0.26), and 0.75 % in a_w: the two published fits behind
  //    the models (clegg-rard-pitzer-1994 in the engine, zeleznik-1991 in the binary) differ by about
  //    1 % in φ at 6 mol/kg, 0.5 % in a_w (measured 0.49 %).
  using protonflow::reference::solve_recipe;
  const struct {
    ConcentratedBinary binary;
    const char* component;
    double enthalpy_tolerance;        // kJ/mol solute
    double water_activity_tolerance;  // relative
  } cases[] = {{ConcentratedBinary::hydrochloric_acid, "HCl", 0.32, 0.005},
               {ConcentratedBinary::sodium_hydroxide, "NaOH", 0.32, 0.005},
               {ConcentratedBinary::sulfuric_acid, "H2SO4", 1.5, 0.0075}};
  for (const auto& c : cases) {
    INFO(c.component);
    const double molality = ionic_model_scope(c.binary, 0.01).largest_molality;
    const double solute_mass = molality * describe(c.binary).solute_molar_mass;
    const double w = solute_mass / (1.0 + solute_mass);
    REQUIRE(ionic_model_scope(c.binary, w * 0.999).meaningful);
    REQUIRE_FALSE(ionic_model_scope(c.binary, std::min(1.0, w * 1.01)).meaningful);
    const auto r = solve_recipe({{c.component, molality}}, ActivityModelKind::pitzer);
    const auto excess = make_excess_enthalpy_model(r.system);
    REQUIRE(excess);
    const double engine = state_enthalpy(r.system, r.speciation, excess.get());
    const double total = r.speciation.water_mass + solute_mass;
    const double binary = total * binary_specific_enthalpy(c.binary, 298.15, solute_mass / total);
    const BinaryProperties p = binary_properties(c.binary, 298.15, w);
    CAPTURE(molality, (binary - engine) / molality / 1e3, p.water_activity, r.speciation.water_activity);
    CHECK((binary - engine) / molality / 1e3 == Approx(0.0).margin(c.enthalpy_tolerance));
    CHECK(r.speciation.water_activity == Approx(p.water_activity).epsilon(c.water_activity_tolerance));
  }
}

TEST_CASE("concentrated binaries: water activity lies below 1 and falls as the solute is added from the dilute end on") {
  // A thermodynamic necessity for a non-volatile or volatile solute alike in these binaries (each
  // lowers water's chemical potential at every strength; robinson-stokes-1959 for the 1:1 acids and
  // NaOH, zeleznik-1991 for H2SO4). The NaOH table once started its logarithmic column at ln a_w = 1
  // instead of 0, which put a_w near e at 0.1 mol/kg: this guards the dilute end of every table.
  for (const ConcentratedBinary b : all_binaries) {
    INFO(describe(b).solute);
    const double top = describe(b).range.maximum_mass_fraction;
    for (const double t : {298.15, 353.15}) {
      double previous = 1.0;
      for (double w = 1e-4; w < top; w *= 1.25) {
        const double a_w = binary_properties(b, t, w).water_activity;
        CAPTURE(t, w, a_w);
        CHECK(a_w > 0.0);
        CHECK(a_w < previous);
        previous = a_w;
      }
    }
    // At 0.1 mol/kg, where the ion-interaction terms are small, the binary's a_w meets the Pitzer
    // engine's within 0.05 % (the engine's own check: NaCl osmotic coefficients within 1 %, i.e.
    // 0.004 % in a_w here).
    using protonflow::reference::solve_recipe;
    const double solute_mass = 0.1 * describe(b).solute_molar_mass;
    const auto r = solve_recipe({{std::string(describe(b).solute), 0.1}}, ActivityModelKind::pitzer);
    CHECK(binary_properties(b, 298.15, solute_mass / (1.0 + solute_mass)).water_activity ==
          Approx(r.speciation.water_activity).epsilon(5e-4));
  }
}

TEST_CASE("H2SO4 vapour over the acid: the pure-acid end is Ayers' vapour pressure and the acid's activity obeys Gibbs-Duhem") {
  const ConcentratedBinary h2so4 = ConcentratedBinary::sulfuric_acid;
  // Pure H2SO4(l): ln(p/atm) = −10156/T + 16.259 (ayers-gillett-gras-1980, from memory), at its
  // measured 338–445 K.
  for (const double t : {340.0, 400.0, 440.0})
    CHECK(sulfuric_acid_vapour_pressure(t, 1.0) == Approx(std::exp(-10156.0 / t + 16.259) * atmosphere).epsilon(1e-12));
  // Gibbs–Duhem: x d ln a_s + (1 − x) d ln a_w = 0 at fixed T, by central differences of the two
  // independently computed activities (p_s / p° and the binary's a_w).
  for (const double t : {298.15, 423.15}) {
    for (const double w : {0.625, 0.775, 0.875, 0.925, 0.965}) {  // between the tables' nodes
      CAPTURE(t, w);
      const double dw = 2e-3;  // wide enough that the quadrature tolerance (1e-7) is far below the difference
      const double x = mole_fraction(h2so4, w), dx = mole_fraction(h2so4, w + dw) - mole_fraction(h2so4, w - dw);
      const double d_ln_acid = std::log(sulfuric_acid_vapour_pressure(t, w + dw) / sulfuric_acid_vapour_pressure(t, w - dw));
      const double d_ln_water = std::log(binary_properties(h2so4, t, w + dw).water_activity /
                                         binary_properties(h2so4, t, w - dw).water_activity);
      CHECK(x * d_ln_acid / dx == Approx(-(1.0 - x) * d_ln_water / dx).epsilon(2e-3));
    }
  }
  // More acid and hotter, more vapour; none without acid.
  CHECK(sulfuric_acid_vapour_pressure(298.15, 0.0) == 0.0);
  double previous = 0.0;
  for (double w = 0.3; w <= 1.0; w += 0.05) {
    const double p = sulfuric_acid_vapour_pressure(373.15, std::min(w, 1.0));
    CHECK(p > previous);
    CHECK(sulfuric_acid_vapour_pressure(423.15, std::min(w, 1.0)) > p);
    previous = p;
  }
}
