// heater: one stream heated or cooled, to a set temperature or by a set duty, with the energy
// balance taken through the equilibrium engine. Equations, phase bookkeeping and limits:
// docs/units.md; the enthalpy model: docs/energy.md.
//
//   H_in  = H(equilibrium of the feed's totals at T_in, P_in)
//   to_temperature: H_out = H(equilibrium at T_set, P_in − ΔP); duty = H_out − H_in
//   by_duty:        T_out such that H(equilibrium at T_out, P_in − ΔP) = H_in + Q; duty = H_out − H_in
//
// Flows are mol/s, so one second of flow is equilibrated as mol and its enthalpy in J is the
// power in W: speciation is intensive and the enthalpy scales linearly with the amounts.
#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/database.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>
#include <protonflow/thermo/errors.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>

#include <Eigen/Dense>

#include <algorithm>
#include <array>
#include <charconv>
#include <cmath>
#include <cstddef>
#include <limits>
#include <memory>
#include <optional>
#include <span>
#include <string>
#include <utility>
#include <vector>

namespace {

namespace unit = protonflow::unit;
namespace thermo = protonflow::thermo;

constexpr std::uint32_t all_phases = PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID;

// Hot corrosive liquor: above 60 °C a splash scalds (a common-practice touch limit, as in the
// ABI test mixer), and a liquor below pH 2 or above 12 is corrosive to skin and to carbon steel
// (common practice; cf. the corrosivity characteristic of US EPA 40 CFR 261.22, pH <= 2 or
// >= 12.5, from memory). The project's brief fixes these three numbers.
constexpr double hot_liquor_temperature = 333.15;  // K, 60 °C
constexpr double corrosive_ph_low = 2.0;
constexpr double corrosive_ph_high = 12.0;

// A phase species (a solid or a gas) is written onto the slate as a combination of at most this
// many components, found once at create (docs/units.md, "phase bookkeeping").
constexpr std::size_t max_combination = 3;

// by_duty: the outlet temperature is accepted when the enthalpy it gives matches H_in + Q within
// this many kelvin times the stream's heat capacity. The engine brackets T to 1e-9 K by TOMS 748
// (thermo/src/stream_enthalpy.cpp); the polish below usually takes it to the round-off of H.
constexpr double duty_match_kelvin = 1e-6;

std::string number_text(double value, int digits = 6) {
  std::array<char, 48> text{};
  const auto written = std::to_chars(text.data(), text.data() + text.size(), value, std::chars_format::general, digits);
  return std::string(text.data(), written.ptr);
}

std::string celsius_text(double kelvin) { return number_text(kelvin - 273.15, 4) + " °C"; }

// One way to write a phase species as slate components: per component, mol per mol of species.
using Combination = std::vector<double>;

// Where the equilibrium's amount of one solid or gas goes in the outlet stream.
struct Placement {
  std::string name;
  std::size_t row = 0;                     // PFU_GAS_ROW, or the slate row of the solid phase
  std::vector<Combination> combinations;   // non-negative, fewest components first; empty: unplaceable
  std::string unplaced_reason;             // why it stays in the aqueous row, when it must
};

// Snaps a coefficient found by least squares onto a simple fraction (denominator up to 12), the
// form every stoichiometric coefficient of the data has.
double snap(double x) {
  for (int d = 1; d <= 12; ++d) {
    const double scaled = x * d;
    if (std::abs(scaled - std::round(scaled)) < 1e-9 * d) return std::round(scaled) / d;
  }
  return x;
}

// Every non-negative combination of at most max_combination slate components whose basis
// composition (and water) equals the target exactly; none contains another. Ordered by size, then
// by the components' order on the slate.
std::vector<Combination> combinations_for(const thermo::ChemicalSystem& system, const std::vector<double>& target) {
  const std::size_t rows = target.size();
  const std::size_t nc = system.components().size();
  Eigen::MatrixXd a(rows, nc);
  for (std::size_t c = 0; c < nc; ++c) {
    for (std::size_t b = 0; b + 1 < rows; ++b) a(static_cast<Eigen::Index>(b), static_cast<Eigen::Index>(c)) = system.composition(c)[b];
    a(static_cast<Eigen::Index>(rows - 1), static_cast<Eigen::Index>(c)) = system.water_in(c);
  }
  Eigen::VectorXd v(rows);
  for (std::size_t r = 0; r < rows; ++r) v(static_cast<Eigen::Index>(r)) = target[r];
  const double scale = 1.0 + v.lpNorm<Eigen::Infinity>();

  std::vector<Combination> found;
  std::vector<std::vector<std::size_t>> supports;
  std::vector<std::size_t> pick;
  const auto try_support = [&](const std::vector<std::size_t>& s) {
    for (const auto& known : supports) {
      if (std::ranges::includes(s, known)) return;  // a smaller combination already covers it
    }
    Eigen::MatrixXd sub(rows, s.size());
    for (std::size_t j = 0; j < s.size(); ++j) sub.col(static_cast<Eigen::Index>(j)) = a.col(static_cast<Eigen::Index>(s[j]));
    const Eigen::VectorXd x = sub.colPivHouseholderQr().solve(v);
    Combination full(nc, 0.0);
    for (std::size_t j = 0; j < s.size(); ++j) {
      const double coefficient = snap(x(static_cast<Eigen::Index>(j)));
      if (!(coefficient > 0.0)) return;
      full[s[j]] = coefficient;
    }
    Eigen::VectorXd snapped(s.size());
    for (std::size_t j = 0; j < s.size(); ++j) snapped(static_cast<Eigen::Index>(j)) = full[s[j]];
    if ((sub * snapped - v).lpNorm<Eigen::Infinity>() > 1e-12 * scale) return;
    found.push_back(std::move(full));
    supports.push_back(s);
  };
  // Supports of size k in lexicographic order of slate indices.
  for (std::size_t k = 1; k <= std::min(max_combination, nc); ++k) {
    std::vector<std::size_t> s(k);
    for (std::size_t j = 0; j < k; ++j) s[j] = j;
    while (true) {
      try_support(s);
      std::size_t j = k;
      while (j > 0 && s[j - 1] == nc - k + (j - 1)) --j;
      if (j == 0) break;
      ++s[j - 1];
      for (std::size_t i = j; i < k; ++i) s[i] = s[i - 1] + 1;
    }
  }
  return found;
}

std::vector<double> target_of(const thermo::PhaseSpecies& species) {
  std::vector<double> target = species.stoichiometry;
  target.push_back(species.water_coefficient);
  return target;
}

// A thermo error as the status the ABI asks for; a non-convergence keeps the engine's message and
// adds its largest residuals.
[[noreturn]] void fail(const thermo::ThermoError& error, const std::string& what, pfu_status out_of_range_status) {
  std::string text = "unit 'heater': " + what + ": " + error.what();
  switch (error.kind()) {
    case thermo::ErrorKind::not_converged: {
      if (const auto* convergence = dynamic_cast<const thermo::ConvergenceError*>(&error)) {
        std::vector<thermo::EquationResidual> worst = convergence->residuals();
        std::ranges::sort(worst, [](const auto& x, const auto& y) { return std::abs(x.scaled_residual) > std::abs(y.scaled_residual); });
        if (worst.size() > 3) worst.resize(3);
        std::string list;
        for (const auto& r : worst) list += (list.empty() ? "" : ", ") + r.equation + " " + number_text(r.scaled_residual, 3);
        if (!list.empty()) text += "; largest scaled residuals: " + list;
        text += "; " + std::to_string(convergence->iterations()) + " iterations";
      }
      throw unit::UnitError(PFU_NOT_CONVERGED, text);
    }
    case thermo::ErrorKind::out_of_range: throw unit::UnitError(out_of_range_status, text);
    case thermo::ErrorKind::bad_input:
    case thermo::ErrorKind::bad_data: throw unit::UnitError(PFU_BAD_INLET, text);
    default: throw unit::UnitError(PFU_INTERNAL_ERROR, text);
  }
}

class Heater {
 public:
  static constexpr const char* type = "heater";
  static constexpr const char* summary =
      "Heats or cools a stream to a set temperature or by a set duty, energy balance through equilibrium enthalpies";
  static constexpr std::array ports{unit::inlet("feed", all_phases, "stream in, any phases"),
                                    unit::outlet("product", all_phases, "stream out at equilibrium, phases as they settle")};
  static constexpr std::array<const char*, 2> modes{"to_temperature", "by_duty"};
  static constexpr std::array<const char*, 2> activity_models{"davies", "b_dot"};
  static constexpr std::array parameters{
      unit::choice("mode", modes, "to_temperature",
                   "to_temperature: give outlet_temperature, get the duty; by_duty: give duty, get the outlet temperature"),
      // 273.15 K and 647.096 K: the ice point and water's critical temperature (IAPWS-95); the
      // species data narrow this further, checked at solve.
      unit::number("outlet_temperature", "K", 298.15, 273.15, 647.096,
                    "product temperature; must be given with mode to_temperature, not used otherwise"),
      unit::number("duty", "W", 0.0, -unit::unbounded, unit::unbounded,
                   "heat added (negative: removed); used with mode by_duty only"),
      unit::number("pressure_drop", "Pa", 0.0, 0.0, unit::unbounded, "pressure lost from feed to product"),
      unit::choice("activity_model", activity_models, "davies", "activity coefficients: Davies or extended Debye-Hueckel (B-dot)")};
  static constexpr std::array results{
      unit::result("duty", "W", "heat added, H_out - H_in as computed (negative: removed)"),
      unit::result("outlet_temperature", "K", "product temperature"),
      unit::result("outlet_ph", "1", "pH of the product, -log10 a(H+); NaN for no flow"),
      unit::result("inlet_ph", "1", "pH of the feed at its own equilibrium; NaN for no flow"),
      unit::result("gas_flow", "mol/s", "gas phase in the product at equilibrium, all gases and vapour"),
      unit::result("solid_flow", "mol/s", "solids in the product at equilibrium, all solid phases")};

  Heater(const unit::Parameters& parameters, const unit::Slate& slate)
      : to_temperature_(parameters.text("mode") == "to_temperature"),
        outlet_temperature_(parameters.number("outlet_temperature")),
        duty_(parameters.number("duty")),
        pressure_drop_(parameters.number("pressure_drop")),
        slate_(slate) {
    if (to_temperature_ && !parameters.given("outlet_temperature")) {
      throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'heater': mode to_temperature needs parameter 'outlet_temperature' (K)");
    }
    if (to_temperature_ && parameters.given("duty")) {
      throw unit::UnitError(PFU_INVALID_PARAMETER,
                            "unit 'heater': parameter 'duty' does not apply with mode to_temperature (the duty is the result)");
    }
    if (!to_temperature_ && parameters.given("outlet_temperature")) {
      throw unit::UnitError(PFU_INVALID_PARAMETER,
                            "unit 'heater': parameter 'outlet_temperature' does not apply with mode by_duty (it is the result)");
    }
    if (!slate.find_component("H2O")) {
      throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'heater': the slate must include H2O, the solvent");
    }
    thermo::SystemOptions options;
    options.activity = parameters.text("activity_model") == "b_dot" ? thermo::ActivityModelKind::b_dot
                                                                    : thermo::ActivityModelKind::davies;
    std::optional<thermo::Database> loaded;
    try {
      loaded.emplace(thermo::load_database(thermo::default_data_directory()));
    } catch (const thermo::ThermoError& error) {
      throw unit::UnitError(PFU_INTERNAL_ERROR, std::string("unit 'heater': cannot read the species data: ") + error.what());
    }
    const thermo::Database& database = *loaded;
    try {
      for (const std::string& solid : slate.solids) {
        const thermo::Species* species = database.find(solid);
        if (species == nullptr || species->phase != thermo::Phase::solid) {
          throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'heater': slate solid phase '" + solid +
                                                           "' is not a solid of the species data (thermo/data/solids.yaml)");
        }
      }
      // Every solid the slate reaches may precipitate; a gas phase may form wherever the slate
      // reaches a gas (it always reaches water vapour).
      thermo::SystemOptions probe = options;
      probe.gas_phase = true;
      const thermo::ChemicalSystem reach(database, slate.components, probe);
      for (const thermo::PhaseSpecies& solid : reach.solids()) options.allowed_solids.push_back(solid.name);
      options.gas_phase = !reach.phase_gases().empty();
      system_ = std::make_unique<thermo::ChemicalSystem>(database, slate.components, options);
    } catch (const thermo::ThermoError& error) {
      throw unit::UnitError(PFU_INVALID_PARAMETER, std::string("unit 'heater': the slate cannot be used: ") + error.what());
    }
    feed_solver_ = std::make_unique<thermo::EquilibriumSolver>(*system_);
    product_solver_ = std::make_unique<thermo::EquilibriumSolver>(*system_);

    for (const thermo::PhaseSpecies& solid : system_->solids()) {
      Placement p;
      p.name = solid.name;
      const auto row = std::ranges::find(slate.solids, solid.name);
      if (row == slate.solids.end()) {
        p.unplaced_reason = "the slate has no solid phase '" + solid.name + "'; add it to the slate's solids";
      } else {
        p.row = PFU_FIRST_SOLID_ROW + static_cast<std::size_t>(row - slate.solids.begin());
        p.combinations = combinations_for(*system_, target_of(solid));
        if (p.combinations.empty()) {
          p.unplaced_reason = solid.name + " is no non-negative combination of at most " + std::to_string(max_combination) +
                              " slate components; add a component of its formula to the slate";
        }
      }
      solids_.push_back(std::move(p));
    }
    for (const thermo::PhaseSpecies& gas : system_->phase_gases()) {
      Placement p;
      p.name = gas.name;
      p.row = PFU_GAS_ROW;
      p.combinations = combinations_for(*system_, target_of(gas));
      if (p.combinations.empty()) {
        p.unplaced_reason = gas.name + " is no non-negative combination of at most " + std::to_string(max_combination) +
                            " slate components; add a component of its formula to the slate";
      }
      gases_.push_back(std::move(p));
    }
    totals_.assign(slate.components.size(), 0.0);
    remainder_.assign(slate.components.size(), 0.0);
  }

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings& warnings) {
    const unit::InletState& feed = inlets[0];
    unit::OutletState& product = outlets[0];
    const std::size_t nc = slate_.components.size();

    const double outlet_pressure = feed.pressure - pressure_drop_;
    if (!(outlet_pressure > 0.0)) {
      throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'heater': pressure_drop " + number_text(pressure_drop_) +
                                                       " Pa is not less than the feed pressure " +
                                                       number_text(feed.pressure) + " Pa");
    }
    // Totals per component over all phases, summed in row order: what the equilibrium sees.
    double total = 0.0;
    for (std::size_t c = 0; c < nc; ++c) {
      double sum = 0.0;
      for (std::size_t row = 0; row < slate_.phase_count(); ++row) sum += feed.flow(row, c);
      totals_[c] = sum;
      total += sum;
    }
    product.pressure = outlet_pressure;
    if (total == 0.0) {
      // No flow: nothing to heat. A duty into nothing has no answer.
      if (!to_temperature_ && duty_ != 0.0) {
        throw unit::UnitError(PFU_BAD_INLET, "unit 'heater': the feed has no flow, so a duty of " + number_text(duty_) +
                                                 " W has no outlet temperature");
      }
      product.temperature = to_temperature_ ? outlet_temperature_ : feed.temperature;
      std::ranges::fill(product.flows, 0.0);
      results.set("duty", 0.0);
      results.set("outlet_temperature", product.temperature);
      results.set("gas_flow", 0.0);
      results.set("solid_flow", 0.0);
      return;
    }

    try {
      feed_solver_->solve(feed.temperature, feed.pressure, totals_, {}, feed_state_);
    } catch (const thermo::ThermoError& error) {
      fail(error, "equilibrating the feed at " + number_text(feed.temperature) + " K", PFU_BAD_INLET);
    }
    double h_in = 0.0;
    try {
      h_in = thermo::state_enthalpy(*system_, feed_state_);
    } catch (const thermo::ThermoError& error) {
      fail(error, "the feed's enthalpy", PFU_BAD_INLET);
    }

    double h_out = 0.0;
    if (to_temperature_) {
      try {
        product_solver_->solve(outlet_temperature_, outlet_pressure, totals_, {}, product_state_);
        h_out = thermo::state_enthalpy(*system_, product_state_);
      } catch (const thermo::ThermoError& error) {
        fail(error, "equilibrating the product at outlet_temperature " + number_text(outlet_temperature_) + " K",
             PFU_INVALID_PARAMETER);
      }
    } else {
      h_out = solve_by_duty(h_in, outlet_pressure);
    }
    const double duty = h_out - h_in;

    product.temperature = product_state_.temperature;
    warn(warnings);
    place_phases(product, warnings);

    double solid_flow = 0.0;
    for (const double amount : product_state_.solid_amount) solid_flow += amount;
    results.set("duty", duty);
    results.set("outlet_temperature", product_state_.temperature);
    results.set("outlet_ph", product_state_.ph);
    results.set("inlet_ph", feed_state_.ph);
    results.set("gas_flow", product_state_.gas_phase_present ? product_state_.gas_phase_amount : 0.0);
    results.set("solid_flow", solid_flow);
  }

 private:
  // H(T) − target of the product's equilibrium at T; leaves that state in product_state_.
  double mismatch_at(double temperature, double pressure, double target) {
    product_solver_->solve(temperature, pressure, totals_, {}, product_state_);
    return thermo::state_enthalpy(*system_, product_state_) - target;
  }

  // by_duty: the product temperature whose equilibrium enthalpy is H_in + Q, by the engine's
  // thermo::solve_at_enthalpy (which brackets only the temperatures where a liquid state exists:
  // a duty that would boil the liquor away is an out-of-range error). A few secant steps then take
  // H_out − H_in to Q within round-off where H is smooth in T. Returns H_out of product_state_.
  double solve_by_duty(double h_in, double pressure) {
    const double target = h_in + duty_;
    const std::string what = "finding the product temperature for a duty of " + number_text(duty_) + " W";
    try {
      thermo::solve_at_enthalpy(*product_solver_, target, pressure, totals_, {}, product_state_);
      const double low = system_->minimum_temperature();
      const double high = system_->maximum_temperature();
      double best_t = product_state_.temperature;
      double best_miss = thermo::state_enthalpy(*system_, product_state_) - target;
      // Heat capacity of the stream from a 1 mK step, kept inside the data's range.
      const double step = best_t + 1e-3 <= high ? 1e-3 : -1e-3;
      const double heat_capacity = (mismatch_at(best_t + step, pressure, target) - best_miss) / step;  // W/K
      double slope = heat_capacity;
      for (int i = 0; i < 4 && best_miss != 0.0 && slope > 0.0 && std::isfinite(slope); ++i) {
        const double next_t = std::clamp(best_t - best_miss / slope, low, high);
        if (next_t == best_t) break;
        const double next_miss = mismatch_at(next_t, pressure, target);
        if (!(std::abs(next_miss) < std::abs(best_miss))) break;
        slope = (next_miss - best_miss) / (next_t - best_t);
        best_t = next_t;
        best_miss = next_miss;
      }
      if (product_state_.temperature != best_t) best_miss = mismatch_at(best_t, pressure, target);
      if (!(heat_capacity > 0.0) || !(std::abs(best_miss) <= duty_match_kelvin * heat_capacity)) {
        throw unit::UnitError(PFU_NOT_CONVERGED,
                              "unit 'heater': " + what + ": at " + number_text(best_t, 10) + " K the enthalpy misses H_in + Q by " +
                                  number_text(best_miss, 3) + " W (heat capacity " + number_text(heat_capacity, 4) +
                                  " W/K); the duty may land on a phase change that temperature alone does not resolve, "
                                  "such as boiling at fixed pressure");
      }
      return best_miss + target;
    } catch (const thermo::ThermoError& error) {
      fail(error, what, PFU_INVALID_PARAMETER);
    }
  }

  // Writes the product's flows from product_state_: solids and gas as the equilibrium has them,
  // the aqueous row as the rest of the totals (docs/units.md, "phase bookkeeping").
  void place_phases(unit::OutletState& product, unit::Warnings& warnings) {
    std::ranges::fill(product.flows, 0.0);
    std::ranges::copy(totals_, remainder_.begin());
    const auto place = [&](const Placement& p, double amount) {
      if (amount <= 0.0) return;
      const std::string head = "unit 'heater': " + p.name + " (" + number_text(amount, 4) + " mol/s) is present in the product, but ";
      if (p.combinations.empty()) {
        warnings.add(head + p.unplaced_reason + ". It is carried in the aqueous row: totals are right, the phase split is not");
        return;
      }
      for (const Combination& combination : p.combinations) {
        bool fits = true;
        for (std::size_t c = 0; c < combination.size() && fits; ++c) {
          // Up to 1e-10 of a component's total may be missing: the engine's mass-balance tolerance.
          fits = remainder_[c] - amount * combination[c] >= -1e-10 * totals_[c];
        }
        if (!fits) continue;
        for (std::size_t c = 0; c < combination.size(); ++c) {
          if (combination[c] == 0.0) continue;
          const double moved = std::min(amount * combination[c], remainder_[c]);
          product.flow(p.row, c) += moved;
          remainder_[c] -= moved;
        }
        return;
      }
      warnings.add(head + "no way of writing it on the slate's components leaves the aqueous row non-negative. It is carried "
                          "in the aqueous row: totals are right, the phase split is not");
    };
    for (std::size_t s = 0; s < solids_.size(); ++s) place(solids_[s], product_state_.solid_amount[s]);
    if (product_state_.gas_phase_present) {
      for (std::size_t g = 0; g < gases_.size(); ++g) place(gases_[g], product_state_.gas_amount[g]);
    }
    for (std::size_t c = 0; c < remainder_.size(); ++c) product.flow(PFU_AQUEOUS_ROW, c) = remainder_[c];
  }

  void warn(unit::Warnings& warnings) const {
    const double t = product_state_.temperature;
    const double ph = product_state_.ph;
    if (t > hot_liquor_temperature && (ph < corrosive_ph_low || ph > corrosive_ph_high)) {
      warnings.add("unit 'heater': hot corrosive liquor: the product is at " + celsius_text(t) + " with pH " + number_text(ph, 3) +
                   " (above 60 °C and pH below 2 or above 12): it burns on contact and corrodes fast; choose materials, "
                   "guarding and protective equipment by local codes and a qualified engineer");
    }
    if (product_state_.gas_phase_present) {
      std::string parts;
      const auto& gases = system_->phase_gases();
      for (std::size_t g = 0; g < gases.size(); ++g) {
        if (!(product_state_.gas_phase_amount > 0.0)) break;
        const double y = product_state_.gas_amount[g] / product_state_.gas_phase_amount;
        if (y >= 1e-6) {
          parts += (parts.empty() ? "" : ", ") + gases[g].name + " " + number_text(100.0 * y, 3) + " %";
        }
      }
      const double before = feed_state_.gas_phase_present ? feed_state_.gas_phase_amount : 0.0;
      warnings.add("unit 'heater': a gas phase " + std::string(before > 0.0 ? "is present" : "forms") + " in the product: " +
                   number_text(product_state_.gas_phase_amount, 4) + " mol/s (" + parts + "; the feed at equilibrium had " +
                   number_text(before, 4) + " mol/s): boiling or degassing; the heater, its vent and its relief must be "
                   "designed for it, and acid or toxic gases in it captured (defer to local codes and a qualified engineer)");
    }
    std::string solids;
    const auto& list = system_->solids();
    for (std::size_t s = 0; s < list.size(); ++s) {
      const double amount = product_state_.solid_amount[s];
      if (amount <= 0.0) continue;
      solids += (solids.empty() ? "" : ", ") + list[s].name + " " + number_text(amount, 4) + " mol/s (feed at equilibrium " +
                number_text(feed_state_.solid_amount[s], 4) + ")";
    }
    if (!solids.empty()) {
      warnings.add("unit 'heater': solids precipitate in the product: " + solids +
                   ": scaling and fouling of the heat-transfer surfaces, blocked lines");
    }
    for (const std::string& line : thermo::describe_warnings(feed_state_)) warnings.add("unit 'heater': feed: " + line);
    for (const std::string& line : thermo::describe_warnings(product_state_)) warnings.add("unit 'heater': product: " + line);
  }

  bool to_temperature_;
  double outlet_temperature_;  // K
  double duty_;                // W
  double pressure_drop_;       // Pa
  unit::Slate slate_;
  std::unique_ptr<thermo::ChemicalSystem> system_;  // the solvers point at it: it must not move
  std::unique_ptr<thermo::EquilibriumSolver> feed_solver_;
  std::unique_ptr<thermo::EquilibriumSolver> product_solver_;
  std::vector<Placement> solids_;  // in the order of system_->solids()
  std::vector<Placement> gases_;   // in the order of system_->phase_gases()
  std::vector<double> totals_;     // mol/s per component, all phases of the feed
  std::vector<double> remainder_;  // scratch: what is left for the aqueous row
  thermo::Speciation feed_state_;
  thermo::Speciation product_state_;
};

}  // namespace

PROTONFLOW_EXPORT_UNITS("protonflow-heater", "0.1.0", Heater)
