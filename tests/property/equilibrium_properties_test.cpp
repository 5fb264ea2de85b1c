// Properties of every solve over random compositions of all covered acid-base families, 0–100 °C:
// balances close, pH rises with base, the answer does not depend on the order of the inputs.
#include <rapidcheck/catch.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <ostream>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"
#include "protonflow/thermo/errors.hpp"

using namespace protonflow::thermo;

namespace {

const Database& database() {
  static const Database db = load_database(default_data_directory());
  return db;
}

// One component or more from every family the data covers: strong and weak acids, bases, salts.
const std::vector<std::string> component_pool{
    "HCl",   "HNO3",   "HBr",     "HI",      "HClO4",  "H2SO4",   "Na2SO4", "H3PO4",  "Na3PO4", "CO2",
    "NaHCO3", "Na2CO3", "SO2",    "Na2SO3",  "HF",     "NaF",     "H2S",    "NaHS",   "CH3COOH", "HCOOH",
    "C6H8O7", "H2C2O4", "H3BO3",  "NH3",     "NH4Cl",  "NaOH",    "KOH",    "KCl",    "CaCl2",   "MgCl2",
    "MgSO4",  "K2SO4",  "Ca(OH)2", "Mg(OH)2", "KHC8H4O4", "NaNO3", "CaCO3"};

struct Case {
  double temperature_fraction;  // 0…1 across the system's own data range (0–100 °C for most systems)
  ActivityModelKind model;
  std::vector<std::pair<std::string, double>> recipe;  // component, mol per kg of water
};

std::ostream& operator<<(std::ostream& os, const Case& c) {
  os.precision(17);  // enough digits to reproduce a failing case exactly
  os << "T at " << c.temperature_fraction << " of the range, model " << static_cast<int>(c.model) << ":";
  for (const auto& [component, m] : c.recipe) os << " " << component << "=" << m;
  return os;
}

// The slate and amounts of a case, on 1 kg of water.
std::pair<std::vector<std::string>, std::vector<double>> slate_of(const Case& c) {
  std::vector<std::string> components{"H2O"};
  std::vector<double> amounts{1.0 / constants::water_molar_mass};
  for (const auto& [name, m] : c.recipe) {
    components.push_back(name);
    amounts.push_back(m);
  }
  return {components, amounts};
}

rc::Gen<double> log_uniform_molality() {
  // 1e-6 … 3 mol/kg, uniform in log10
  return rc::gen::map(rc::gen::inRange(0, 1000001), [](int k) { return std::pow(10.0, -6.0 + 6.4771212547 * k / 1e6); });
}

// A case from a pool of components: up to four distinct ones, molalities log-uniform, a model, a
// temperature across the system's range. rapidcheck scales ranges with its size parameter; at the
// full size (100) the draws are uniform, so concentrated cases are as likely as dilute ones from
// the first test on.
rc::Gen<Case> random_case_from(const std::vector<std::string>& pool) {
  return rc::gen::resize(100, rc::gen::apply(
      [&pool](int t, int model, std::vector<int> picks, std::vector<double> molalities) {
        Case c{t / 10000.0, static_cast<ActivityModelKind>(model), {}};
        for (std::size_t i = 0; i < picks.size(); ++i) {
          const std::string& name = pool[static_cast<std::size_t>(picks[i])];
          const bool seen = std::any_of(c.recipe.begin(), c.recipe.end(), [&](const auto& r) { return r.first == name; });
          if (!seen) c.recipe.emplace_back(name, molalities[i]);
        }
        return c;
      },
      rc::gen::inRange(0, 10001), rc::gen::inRange(0, 3),
      rc::gen::container<std::vector<int>>(4, rc::gen::inRange(0, static_cast<int>(pool.size()))),
      rc::gen::container<std::vector<double>>(4, log_uniform_molality())));
}

rc::Gen<Case> random_case() { return random_case_from(component_pool); }

// Some systems' data stop short of 100 °C (calcium carbonate ion pairs at 90 °C): cases sweep each
// system's own range, and the range check itself is asserted below.
double temperature_of(const Case& c, const ChemicalSystem& system) {
  const double low = system.minimum_temperature(), high = system.maximum_temperature();
  return low + c.temperature_fraction * (high - low);
}

struct Solved {
  ChemicalSystem system;
  std::vector<double> amounts;
  Speciation speciation;
};

Solved solve_case(const Case& c) {
  auto [components, amounts] = slate_of(c);
  SystemOptions options;
  options.activity = c.model;
  ChemicalSystem system(database(), components, options);
  EquilibriumSolver solver(system);
  Speciation out = solver.solve(temperature_of(c, system), constants::standard_atmosphere, amounts);
  return {std::move(system), std::move(amounts), std::move(out)};
}

// Recomputes every balance from the answer alone: totals from the inputs (and what open gases
// brought in), amounts from molalities, precipitated solids and the gas phase.
void assert_balances_close(const Solved& s) {
  const auto& solutes = s.system.solutes();
  const std::size_t nb = s.system.basis_count();
  std::vector<double> input(nb, 0.0), scale(nb, 0.0);
  double water_input = 0.0;
  for (std::size_t c = 0; c < s.amounts.size(); ++c) {
    for (std::size_t b = 0; b < nb; ++b) input[b] += s.system.composition(c)[b] * s.amounts[c];
    water_input += s.system.water_in(c) * s.amounts[c];
  }
  scale = input;
  double water_scale = water_input;
  for (std::size_t o = 0; o < s.system.open_gases().size(); ++o) {
    const auto& gas = s.system.open_gases()[o];
    for (std::size_t b = 0; b < nb; ++b) input[b] += gas.stoichiometry[b] * s.speciation.gas_uptake[o];
    water_input += gas.water_coefficient * s.speciation.gas_uptake[o];
  }
  const double w = s.speciation.water_mass;
  std::vector<double> found(nb, 0.0);
  double water_found = w / constants::water_molar_mass;
  for (std::size_t i = 0; i < solutes.size(); ++i) {
    for (std::size_t b = 0; b < nb; ++b) found[b] += solutes[i].stoichiometry[b] * s.speciation.molality[i] * w;
    water_found += solutes[i].water_coefficient * s.speciation.molality[i] * w;
  }
  const auto add_phase = [&](const PhaseSpecies& p, double amount) {
    for (std::size_t b = 0; b < nb; ++b) found[b] += p.stoichiometry[b] * amount;
    water_found += p.water_coefficient * amount;
  };
  for (std::size_t p = 0; p < s.system.solids().size(); ++p) add_phase(s.system.solids()[p], s.speciation.solid_amount[p]);
  for (std::size_t g = 0; g < s.system.phase_gases().size(); ++g)
    add_phase(s.system.phase_gases()[g], s.speciation.gas_amount[g]);
  for (std::size_t b = 1; b < nb; ++b) {
    const double reference = std::max({std::abs(input[b]), scale[b], 1e-300});
    RC_ASSERT(std::abs(found[b] - input[b]) <= 1e-10 * reference);
  }
  double charge = 0.0, equivalents = 0.0;
  for (std::size_t i = 0; i < solutes.size(); ++i) {
    charge += solutes[i].charge * s.speciation.molality[i];
    equivalents += 0.5 * std::abs(solutes[i].charge) * s.speciation.molality[i];
  }
  RC_ASSERT(std::abs(charge) <= 1e-10 * equivalents);
  RC_ASSERT(std::abs(water_found - water_input) <= 1e-10 * std::max(water_input, water_scale));
  RC_ASSERT(std::isfinite(s.speciation.ph));
}

// Complementarity: an allowed solid is either absent and not supersaturated, or present and
// saturated, to 1e-8 in log10 units.
void assert_solids_complementary(const Solved& s) {
  for (std::size_t p = 0; p < s.system.solids().size(); ++p) {
    if (!s.system.solids()[p].allowed) continue;
    const double si = s.speciation.saturation_index[p];
    if (std::isnan(si)) continue;  // a basis species of the solid is absent: it cannot form
    if (s.speciation.solid_amount[p] > 0.0) {
      RC_ASSERT(std::abs(si) <= 1e-8);
    } else {
      RC_ASSERT(si <= 1e-8);
    }
  }
}

}  // namespace

TEST_CASE("every random composition converges with closed balances") {
  rc::prop("mass, charge and water balances close to 1e-10 relative", [] {
    const Case c = *random_case();
    RC_CLASSIFY(std::any_of(c.recipe.begin(), c.recipe.end(), [](const auto& r) { return r.second > 0.1; }),
                "a component above 0.1 mol/kg");
    RC_TAG(c.model == ActivityModelKind::davies ? "davies" : c.model == ActivityModelKind::b_dot ? "b-dot" : "ideal");
    assert_balances_close(solve_case(c));
  });
}

TEST_CASE("a temperature outside a system's data range is a typed error") {
  rc::prop("just outside the range, the solver refuses with out_of_range", [] {
    const Case c = *random_case();
    auto [components, amounts] = slate_of(c);
    const ChemicalSystem system(database(), components);
    EquilibriumSolver solver(system);
    for (const double t : {system.minimum_temperature() - 0.01, system.maximum_temperature() + 0.01}) {
      try {
        solver.solve(t, constants::standard_atmosphere, amounts);
        RC_FAIL("no error outside the data range");
      } catch (const ThermoError& e) {
        RC_ASSERT(e.kind() == ErrorKind::out_of_range);
      }
    }
  });
}

TEST_CASE("pH rises as base is added") {
  rc::prop("pH is non-decreasing along a NaOH addition", [] {
    Case c = *random_case();
    c.recipe.erase(std::remove_if(c.recipe.begin(), c.recipe.end(), [](const auto& r) { return r.first == "NaOH"; }),
                   c.recipe.end());
    std::vector<std::string> components{"H2O", "NaOH"};
    std::vector<double> amounts{1.0 / constants::water_molar_mass, 0.0};
    for (const auto& [name, m] : c.recipe) {
      components.push_back(name);
      amounts.push_back(m);
    }
    SystemOptions options;
    options.activity = c.model;
    const ChemicalSystem system(database(), components, options);
    EquilibriumSolver solver(system);  // warm-started along the addition, as a titration would be
    double previous_ph = -1e9;
    for (int step = 0; step <= 12; ++step) {
      amounts[1] = step == 0 ? 0.0 : std::pow(10.0, -6.0 + 0.5 * (step - 1));  // 0, 1e-6 … 3.2 mol/kg
      const Speciation out = solver.solve(temperature_of(c, system), constants::standard_atmosphere, amounts);
      RC_ASSERT(out.ph >= previous_ph - 1e-9);
      previous_ph = out.ph;
    }
  });
}

TEST_CASE("the answer does not depend on the order of the inputs") {
  rc::prop("reversing the component order gives the same speciation", [] {
    const Case c = *random_case();
    Case reversed = c;
    std::reverse(reversed.recipe.begin(), reversed.recipe.end());
    const Solved a = solve_case(c);
    const Solved b = solve_case(reversed);
    RC_ASSERT(std::abs(a.speciation.ph - b.speciation.ph) <= 1e-9);
    for (std::size_t i = 0; i < a.system.solutes().size(); ++i) {
      const std::size_t j = b.system.index_of_solute(a.system.solutes()[i].name);
      const double x = a.speciation.molality[i], y = b.speciation.molality[j];
      RC_ASSERT(std::abs(x - y) <= 1e-8 * std::max(x, y) + 1e-300);
    }
  });
}

namespace {

// Components that bring the cations of every solid in the data, with acids and bases to move pH.
const std::vector<std::string> solid_pool{
    "CaCl2", "Ca(OH)2", "CaCO3", "CaSO4.2H2O", "MgCl2", "MgSO4", "NaF",   "AlCl3", "Al2(SO4)3", "FeCl3",
    "ZnSO4", "CuSO4",   "NiCl2", "H2SO4",      "HCl",   "NaOH",  "Na2CO3", "CO2",  "H3PO4",     "NH3"};

rc::Gen<Case> random_solid_case() { return random_case_from(solid_pool); }

// Every solid the slate reaches is allowed to precipitate.
Solved solve_with_solids(const Case& c) {
  auto [components, amounts] = slate_of(c);
  SystemOptions options;
  options.activity = c.model;
  const ChemicalSystem without_solids(database(), components);
  for (const PhaseSpecies& p : without_solids.solids()) options.allowed_solids.push_back(p.name);
  ChemicalSystem system(database(), components, options);
  EquilibriumSolver solver(system);
  Speciation out = solver.solve(temperature_of(c, system), constants::standard_atmosphere, amounts);
  return {std::move(system), std::move(amounts), std::move(out)};
}

}  // namespace

TEST_CASE("with solids allowed, every case converges, balances close and each solid is complementary") {
  rc::prop("absent and undersaturated, or present and saturated to 1e-8 in log units", [] {
    const Case c = *random_solid_case();
    const Solved s = solve_with_solids(c);
    RC_CLASSIFY(std::any_of(s.speciation.solid_amount.begin(), s.speciation.solid_amount.end(), [](double n) { return n > 0; }),
                "a solid precipitated");
    assert_balances_close(s);
    assert_solids_complementary(s);
  });
}

namespace {

// Volatile acids and bases with salts and solids: CO2 and H2S evolve from acidified carbonate and
// sulfide, NH3 from alkaline ammonium, SO2 and HCl from strong acid; water vapour always.
const std::vector<std::string> gas_pool{"NaHCO3", "Na2CO3", "CO2", "NaHS", "H2S", "NH4Cl", "NH3", "Na2SO3", "SO2",
                                        "HCl",    "H2SO4",  "NaOH", "NaF", "CaCl2", "Ca(OH)2", "CaCO3", "NaCl"};

rc::Gen<Case> random_gas_case() { return random_case_from(gas_pool); }

// 2 atm: water stays liquid up to 100 °C (p_sat(100 °C) = 1.01 atm), so a gas phase, where one
// forms, holds the volatile solutes and vapour but never the whole solvent.
constexpr double two_atmospheres = 2.0 * constants::standard_atmosphere;

}  // namespace

TEST_CASE("with a closed gas phase and solids, every case converges and each phase is complementary") {
  rc::prop("a gas phase exists exactly where the solution's vapour pressures reach the total pressure", [] {
    const Case c = *random_gas_case();
    auto [components, amounts] = slate_of(c);
    SystemOptions options;
    options.activity = c.model;
    options.gas_phase = true;
    const ChemicalSystem without_solids(database(), components);
    for (const PhaseSpecies& p : without_solids.solids()) options.allowed_solids.push_back(p.name);
    ChemicalSystem system(database(), components, options);
    EquilibriumSolver solver(system);
    Speciation out = solver.solve(temperature_of(c, system), two_atmospheres, amounts);
    double pressure_sum = 0.0;
    for (const double p : out.partial_pressure) pressure_sum += p;
    RC_CLASSIFY(out.gas_phase_present, "a gas phase formed");
    if (out.gas_phase_present) {
      RC_ASSERT(std::abs(pressure_sum / two_atmospheres - 1.0) <= 1e-10);
      for (std::size_t g = 0; g < out.gas_amount.size(); ++g) RC_ASSERT(out.gas_amount[g] >= 0.0);
    } else {
      RC_ASSERT(pressure_sum <= two_atmospheres * (1.0 + 1e-8));
    }
    const Solved s{std::move(system), std::move(amounts), std::move(out)};
    assert_balances_close(s);
    assert_solids_complementary(s);
  });
}

TEST_CASE("open to a gas at a fixed partial pressure, every case converges with closed balances") {
  rc::prop("the solution's equilibrium partial pressure equals the reservoir's", [] {
    const Case c = *random_gas_case();
    const auto pressure = *rc::gen::map(rc::gen::inRange(0, 1001), [](int k) { return std::pow(10.0, -1.0 + 5.0 * k / 1000.0); });
    auto [components, amounts] = slate_of(c);
    SystemOptions options;
    options.activity = c.model;
    options.open_gases = {"CO2(g)"};  // 0.1 Pa … 10 kPa of CO2: from scrubbed air to flue gas
    ChemicalSystem system(database(), components, options);
    EquilibriumSolver solver(system);
    Speciation out;
    solver.solve(temperature_of(c, system), constants::standard_atmosphere, amounts, std::vector<double>{pressure}, out);
    const Solved s{std::move(system), std::move(amounts), std::move(out)};
    assert_balances_close(s);
  });
}

namespace {

// Brines of the Pitzer model: chlorides and sulfates (and their acids), ionic strength up to 6 mol/kg.
const std::vector<std::pair<std::string, double>> brine_pool{
    // component, ionic strength it brings per mol/kg if fully dissociated
    {"NaCl", 1.0}, {"KCl", 1.0}, {"CaCl2", 3.0}, {"MgCl2", 3.0}, {"Na2SO4", 3.0},
    {"K2SO4", 3.0}, {"MgSO4", 4.0}, {"HCl", 1.0}, {"H2SO4", 3.0}};

rc::Gen<Case> random_brine() {
  // full size from the first case (see random_case_from): concentrated brines as likely as dilute ones
  return rc::gen::resize(100, rc::gen::apply(
      [](int t, int target, std::vector<int> picks, std::vector<int> weights) {
        Case c{t / 10000.0, ActivityModelKind::pitzer, {}};
        double strength = 0.0;
        for (std::size_t i = 0; i < picks.size(); ++i) {
          const auto& [name, per_molal] = brine_pool[static_cast<std::size_t>(picks[i])];
          if (std::any_of(c.recipe.begin(), c.recipe.end(), [&](const auto& r) { return r.first == name; })) continue;
          c.recipe.emplace_back(name, weights[i] / 1000.0);
          strength += per_molal * weights[i] / 1000.0;
        }
        // scale to a nominal ionic strength between 0.001 and 6 mol/kg, uniform in log10
        const double nominal = std::pow(10.0, -3.0 + 3.7781512504 * target / 10000.0);
        for (auto& r : c.recipe) r.second *= nominal / strength;
        return c;
      },
      rc::gen::inRange(0, 10001), rc::gen::inRange(0, 10001),
      rc::gen::container<std::vector<int>>(4, rc::gen::inRange(0, static_cast<int>(brine_pool.size()))),
      rc::gen::container<std::vector<int>>(4, rc::gen::inRange(1, 1001))));
}

}  // namespace

TEST_CASE("random brines to I = 6 mol/kg with the Pitzer model converge, balance and obey Gibbs-Duhem") {
  rc::prop("converged with closed balances; Gibbs-Duhem holds at the answer to round-off", [] {
    const Case c = *random_brine();
    Solved s = [&] {
      try {
        return solve_case(c);
      } catch (const ConvergenceError& e) {
        // a typed error with its residuals is the only acceptable failure, and none is expected here
        RC_FAIL(std::string("not converged: ") + e.what());
      }
    }();
    RC_CLASSIFY(s.speciation.ionic_strength > 1.0, "I above 1 mol/kg");
    RC_CLASSIFY(s.speciation.ionic_strength > 3.0, "I above 3 mol/kg");
    assert_balances_close(s);
    RC_ASSERT(s.speciation.ionic_strength <= 6.5);
    // Gibbs–Duhem at the answer: (1/M_w) ∂ln a_w/∂m_k + 1 + Σ_i m_i ∂ln γ_i/∂m_k = 0 for every k.
    SoluteProperties p;
    for (const Solute& solute : s.system.solutes()) {
      p.charge.push_back(solute.charge);
      p.ion_size_angstrom.push_back(solute.ion_size_angstrom);
      p.name.push_back(solute.name);
    }
    const auto model = make_activity_model(ActivityModelKind::pitzer, p);
    const std::size_t n = p.charge.size();
    ActivityEvaluation at(n);
    model->evaluate(s.speciation.temperature, s.speciation.pressure, s.speciation.molality, at);
    for (std::size_t k = 0; k < n; ++k) {
      double sum = at.d_ln_water_activity_d_molality[k] / constants::water_molar_mass + 1.0;
      double scale = 1.0;
      for (std::size_t i = 0; i < n; ++i) {
        sum += s.speciation.molality[i] * at.d_ln_gamma_d_molality[i * n + k];
        scale += std::abs(s.speciation.molality[i] * at.d_ln_gamma_d_molality[i * n + k]);
      }
      RC_ASSERT(std::abs(sum) <= 1e-12 * scale);
    }
  });
}

namespace {

// Brines up to and past halite saturation (about 6.1 mol/kg NaCl at 25 °C): sodium chloride with
// the other chlorides, sulfate and a little acid or base, every solid they reach allowed.
rc::Gen<Case> random_saturating_brine() {
  return rc::gen::resize(100, rc::gen::apply(
      [](int t, int model, int salt, std::vector<int> picks, std::vector<int> weights) {
        static const std::vector<std::string> others{"KCl", "CaCl2", "MgCl2", "Na2SO4", "MgSO4", "HCl", "NaOH", "Ca(OH)2"};
        static const std::vector<ActivityModelKind> models{ActivityModelKind::pitzer, ActivityModelKind::davies,
                                                           ActivityModelKind::b_dot, ActivityModelKind::ideal};
        // NaCl from 1 to 9 mol/kg, uniform: a third of the cases past saturation.
        Case c{t / 10000.0, models[static_cast<std::size_t>(model)], {{"NaCl", 1.0 + 8.0 * salt / 10000.0}}};
        for (std::size_t i = 0; i < picks.size(); ++i) {
          const std::string& name = others[static_cast<std::size_t>(picks[i])];
          if (std::any_of(c.recipe.begin(), c.recipe.end(), [&](const auto& r) { return r.first == name; })) continue;
          c.recipe.emplace_back(name, std::pow(10.0, -4.0 + 4.0 * weights[i] / 1000.0));  // 1e-4 … 1 mol/kg
        }
        return c;
      },
      rc::gen::inRange(0, 10001), rc::gen::inRange(0, 4), rc::gen::inRange(0, 10001),
      rc::gen::container<std::vector<int>>(3, rc::gen::inRange(0, 8)),
      rc::gen::container<std::vector<int>>(3, rc::gen::inRange(0, 1001))));
}

}  // namespace

TEST_CASE("random brines up to and past halite saturation converge or fail with a typed error, balances to round-off") {
  rc::prop("converged with closed balances and complementary solids, or a ConvergenceError with its residuals", [] {
    const Case c = *random_saturating_brine();
    RC_TAG(c.model == ActivityModelKind::pitzer ? "pitzer" : c.model == ActivityModelKind::davies ? "davies"
           : c.model == ActivityModelKind::b_dot ? "b-dot" : "ideal");
    try {
      const Solved s = solve_with_solids(c);
      std::size_t halite = 0;
      while (s.system.solids()[halite].name != "halite") ++halite;
      RC_CLASSIFY(s.speciation.solid_amount[halite] > 0.0, "halite precipitated");
      assert_balances_close(s);
      assert_solids_complementary(s);
    } catch (const ConvergenceError& e) {
      RC_ASSERT(e.kind() == ErrorKind::not_converged);
      RC_ASSERT(!e.residuals().empty());
      RC_TAG("typed error");
    }
  });
}
