#include "scrubber.hpp"

#include <protonflow/thermo/constants.hpp>
#include <protonflow/thermo/database.hpp>
#include <protonflow/thermo/errors.hpp>
#include <protonflow/thermo/shared_database.hpp>
#include <protonflow/units/message_text.hpp>
#include <protonflow/units/product_warnings.hpp>
#include <protonflow/units/thermo_failure.hpp>
#include <protonflow/units/titration.hpp>

#include <algorithm>
#include <cmath>
#include <limits>
#include <memory>
#include <optional>
#include <string>

namespace protonflow::scrubber {

namespace {

using units::number_text;

constexpr double not_a_number = std::numeric_limits<double>::quiet_NaN();
constexpr std::size_t none = StageModel::no_component;

// Normal conditions for emission concentrations: 273.15 K and 101.325 kPa, dry gas (common
// practice; Directive 2010/75/EU, Annex VI, Part 2, from memory).
constexpr double normal_temperature = 273.15;
constexpr double normal_pressure = 101325.0;
// The steady recirculation: the recirculated liquor's relative change in a pass at which column and
// sump count as converged, the most passes, and the most negative Wegstein factor (an
// acceleration of 1 − q = 21 at most; the slope of a recirculation of 95 % of the outflow).
constexpr double sump_tolerance = 1e-10;
constexpr long sump_passes = 200;
constexpr double wegstein_lowest = -20.0;
// A Wegstein step below this share of the component's last amounts is its cancellation to round-off.
constexpr double wegstein_cancellation = 1e-12;
// The most stages the search for an emission limit tries.
constexpr std::size_t most_stages_for_limit = 100;
// A liquor above this pH takes up CO2 as carbonate and wastes reagent on it (common practice: acid-
// gas scrubbers on caustic are run at pH 7 to 9 where CO2 is in the gas).
constexpr double carbon_dioxide_ph = 10.0;
// A solid whose saturation index is above this is near saturation: scale may form (common
// practice: |SI| < 0.5 counts as near equilibrium).
constexpr double scaling_index = -0.5;

thermo::ActivityModelKind activity_kind(const std::string& name) {
  return name == "b-dot"    ? thermo::ActivityModelKind::b_dot
         : name == "pitzer" ? thermo::ActivityModelKind::pitzer
                            : thermo::ActivityModelKind::davies;
}

std::size_t trade_index(const std::string& formula) {
  for (std::size_t i = 0; i < Scrubber::trade_formulas.size(); ++i)
    if (formula == Scrubber::trade_formulas[i]) return i;
  return none;
}

ColumnChemistry build_chemistry(const unit::Slate& slate, const std::string& activity_model) {
  // The species data, parsed once per process and shared with the host and every other unit
  // (shared_database.hpp); the chemical systems keep nothing of it.
  std::shared_ptr<const thermo::Database> database;
  try {
    database = thermo::shared_database(thermo::default_data_directory());
  } catch (const thermo::ThermoError& error) {
    throw unit::UnitError(PFU_INTERNAL_ERROR, std::string("unit 'scrubber': cannot read the species data: ") + error.what());
  }
  return make_column_chemistry(Scrubber::type, *database, slate, activity_kind(activity_model));
}

// Protons each absorbed gas hands to the liquor (mol/s), per column gas: what it brings as gas,
// h_k · n_k, less what the species of its basis carry more in the spent liquor than in the feed
// (docs/units.md, "scrubber", "Reagent").
double bound_protons(const thermo::ChemicalSystem& system, const thermo::Speciation& state, std::size_t basis) {
  double bound = 0.0;
  if (state.molality.empty()) return 0.0;  // a stream that is not there
  for (std::size_t s = 0; s < system.solutes().size(); ++s) {
    const auto& nu = system.solutes()[s].stoichiometry;
    if (nu[basis] != 0.0) bound += state.molality[s] * state.water_mass * nu[basis] * nu[0];
  }
  return bound;
}

}  // namespace

Scrubber::Scrubber(const unit::Parameters& parameters, const unit::Slate& slate)
    : stages_(0),
      limit_gas_(none),
      emission_limit_(parameters.number("emission_limit")),
      reference_oxygen_(parameters.given("reference_oxygen") ? parameters.number("reference_oxygen") : not_a_number),
      oxygen_gas_(none),
      recirculation_(parameters.number("recirculation_rate")),
      bleed_rate_(parameters.given("bleed_rate") ? parameters.number("bleed_rate") : not_a_number),
      bleed_fraction_(parameters.number("bleed_fraction")),
      sump_ph_(parameters.given("sump_ph") ? parameters.number("sump_ph") : not_a_number),
      fresh_water_temperature_(parameters.number("fresh_water_temperature")),
      chemistry_(build_chemistry(slate, parameters.text("activity_model"))),
      model_(std::make_unique<ChemistryStageModel>(*chemistry_.liquid_system, *chemistry_.flash_system, chemistry_.gases)) {
  const double stages = parameters.number("stages");
  if (stages != std::floor(stages))
    throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'scrubber': stages " + number_text(stages) + " is not a whole number");
  stages_ = static_cast<std::size_t>(stages);
  const double common = parameters.number("efficiency");
  for (const ColumnGas& gas : chemistry_.gases) {
    const std::size_t trade = trade_index(gas.component);
    const std::string name = gas.component == "H2O" ? "efficiency_h2o"
                             : trade != none       ? std::string("efficiency_") + trade_gases[trade]
                                                   : "";
    efficiency_.push_back(!name.empty() && parameters.given(name) ? parameters.number(name) : common);
  }
  for (std::size_t k = 0; k < chemistry_.gases.size(); ++k)
    if (chemistry_.gases[k].component == "O2") oxygen_gas_ = k;
  if (!std::isnan(reference_oxygen_) && oxygen_gas_ == none)
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          "unit 'scrubber': reference_oxygen needs O2 on the slate, to know the gas's own oxygen content");
  const std::string& limit = parameters.text("limit_gas");
  if (limit != "none") {
    if (!parameters.given("emission_limit"))
      throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'scrubber': limit_gas " + limit + " needs emission_limit");
    for (std::size_t k = 0; k < chemistry_.gases.size(); ++k) {
      const std::size_t trade = trade_index(chemistry_.gases[k].component);
      if (trade != none && limit == trade_gases[trade]) limit_gas_ = k;
    }
    if (limit_gas_ == none)
      throw unit::UnitError(PFU_INVALID_PARAMETER,
                            "unit 'scrubber': limit_gas " + limit + " is not a gas of the slate; add it or set limit_gas: none");
  } else if (parameters.given("emission_limit")) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'scrubber': emission_limit is given but limit_gas is none");
  }
  const bool bleed_given = parameters.given("bleed_rate") || parameters.given("bleed_fraction");
  if (recirculation_ > 0.0) {
    if (parameters.given("bleed_rate") && parameters.given("bleed_fraction"))
      throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'scrubber': give bleed_rate or bleed_fraction, not both");
    if (!bleed_given)
      throw unit::UnitError(PFU_INVALID_PARAMETER,
                            "unit 'scrubber': recirculation_rate needs a bleed: give bleed_rate (kg/s) or bleed_fraction");
    sump_ = std::make_unique<Sump>(*chemistry_.liquid_system);
  } else {
    for (const char* name : {"bleed_rate", "bleed_fraction", "sump_ph", "fresh_water_temperature"})
      if (parameters.given(name))
        throw unit::UnitError(PFU_INVALID_PARAMETER, std::string("unit 'scrubber': ") + name +
                                                         " is given but recirculation_rate is 0: the column has no sump");
  }
}

ColumnProfile Scrubber::solve_stages(std::size_t stages, const ColumnSpecification& base, const ColumnFeeds& feeds,
                                     const ColumnProfile* nearby) {
  ColumnSpecification specification = base;
  specification.stages = stages;
  model_->prepare(stages);
  try {
    // Each stage count starts from its own last answer: in a recycle the feeds change little from
    // one pass to the next (docs/units.md, "Solution"). A stage count not solved before starts
    // from the nearby column's profile, cut or extended to its stages.
    const auto previous = previous_profiles_.find(stages);
    std::optional<ColumnProfile> resized;
    if (previous == previous_profiles_.end() && nearby != nullptr) resized = profile_for_stages(*nearby, stages);
    const ColumnProfile* start = previous != previous_profiles_.end() ? &previous->second : resized ? &*resized : nullptr;
    ColumnProfile profile = solve_column(*model_, specification, feeds, start, &column_memories_[stages]);
    previous_profiles_[stages] = profile;
    return profile;
  } catch (const ColumnConvergenceError& error) {
    std::string message = std::string("unit 'scrubber': ") + error.what();
    for (const StageResidual& r : error.residuals())
      message += "; stage " + std::to_string(r.stage) + " " + r.equation + ": " + number_text(r.scaled_residual, 3);
    throw unit::UnitError(PFU_NOT_CONVERGED, message);
  } catch (const thermo::ThermoError& error) {
    units::throw_unit_error(error, type, "the liquor feed", PFU_BAD_INLET);
  }
}

// Column and sump in turn, each pass the column on the sump's liquor of the last, the sump on the
// column's spent liquor, to a steady recirculated liquor (docs/units.md, "scrubber", "Sump").
// Per-component Wegstein steps [wegstein-1958], bounded as common practice, speed the passes,
// which alone converge like the recirculated share of the outflow to a power.
Scrubber::SumpAnswer Scrubber::solve_with_sump(const ColumnSpecification& specification, ColumnFeeds& feeds,
                                               std::span<const double> reagent, double reagent_temperature) {
  const thermo::ChemicalSystem& system = *chemistry_.liquid_system;
  const std::size_t count = feeds.liquid.size();
  const std::size_t water = system.index_of_component("H2O");
  const std::vector<double> make_up = feeds.liquid;
  const double make_up_temperature = feeds.liquid_temperature;
  const double bleed = std::isnan(bleed_rate_) ? recirculation_ * bleed_fraction_ / (1.0 - bleed_fraction_) : bleed_rate_;
  const double outflow = recirculation_ + bleed;
  SumpDose dose = std::isnan(sump_ph_) ? SumpDose::as_delivered : SumpDose::setpoint;
  double highest_ph = not_a_number;
  bool raises = true;  // the reagent raises the pH (a base), as the unreachable setpoint said

  // The unknowns x: the recirculated liquor per kg (mol/kg per component) and its temperature.
  // From the last steady recirculation (in a recycle the feeds change little from one pass to the
  // next), or cold, from fresh water.
  std::vector<double> x(count + 1, 0.0), g(count + 1), x_last, g_last;
  x[water] = 1.0 / system.component_molar_mass(water);
  x[count] = fresh_water_temperature_;
  if (last_recirculation_.size() == x.size()) x = last_recirculation_;
  SumpAnswer answer;
  for (long pass = 1; pass <= sump_passes; ++pass) {
    for (std::size_t c = 0; c < count; ++c) feeds.liquid[c] = recirculation_ * x[c];
    feeds.liquid_temperature = x[count];
    answer.profile = solve_stages(stages_, specification, feeds);
    const std::size_t n = answer.profile.stages;
    const std::span<const double> bottoms(answer.profile.liquid.data() + (n - 1) * count, count);
    try {
      answer.mix = sump_->mix({bottoms, answer.profile.temperature.back()}, {make_up, make_up_temperature},
                              {reagent, reagent_temperature}, fresh_water_temperature_, outflow, specification.pressure, dose,
                              sump_ph_, x[count]);
    } catch (const SumpSetpointUnreachable& unreachable) {
      // Not reached at this pass's column liquor: dose the most the flows allow until the steady
      // state says whether the setpoint is reachable there.
      dose = SumpDose::most;
      raises = unreachable.highest_ph() < sump_ph_;
      --pass;
      continue;
    } catch (const thermo::ThermoError& error) {
      units::throw_unit_error(error, type, "the sump's liquor", PFU_NOT_CONVERGED);
    }
    bool setpoint_in_reach = false;
    if (dose == SumpDose::most) {
      setpoint_in_reach = raises ? answer.mix.state.ph >= sump_ph_ : answer.mix.state.ph <= sump_ph_;
      if (setpoint_in_reach) dose = SumpDose::setpoint;
    }
    for (std::size_t c = 0; c < count; ++c) g[c] = answer.mix.totals[c] / outflow;
    g[count] = answer.mix.temperature;
    // Converged when no component of the recirculated liquor moves by more than sump_tolerance of
    // itself (above a floor of sump_tolerance of the water's amount) and the temperature by 1e-6 K.
    double residual = std::abs(g[count] - x[count]) / x[count];
    std::size_t worst = count;
    for (std::size_t c = 0; c < count; ++c) {
      const double change = std::abs(g[c] - x[c]) / std::max(std::abs(g[c]), 1e-6 * g[water]);
      if (change > residual) {
        residual = change;
        worst = c;
      }
    }
    answer.iterations = pass;
    answer.residual = residual;
    if (residual <= sump_tolerance && std::abs(g[count] - x[count]) <= 1e-6 && !setpoint_in_reach) {
      // What leaves the unit is what the sump made less what the column was fed: the unit's
      // balances close to round-off, the bleed's composition is the sump's to the tolerance.
      answer.bleed.assign(count, 0.0);
      for (std::size_t c = 0; c < count; ++c) answer.bleed[c] = std::max(0.0, answer.mix.totals[c] - feeds.liquid[c]);
      if (dose != SumpDose::most) last_recirculation_ = g;
      if (dose == SumpDose::most) {
        highest_ph = answer.mix.state.ph;
        throw unit::UnitError(PFU_INVALID_PARAMETER,
                              "unit 'scrubber': sump_ph " + number_text(sump_ph_, 4) + " is unreachable: the highest pH this "
                              "reagent can hold in the sump at these flows is " + number_text(highest_ph, 4) + " at " +
                              units::celsius_text(answer.mix.temperature) + ", with every kg of fresh water replaced by " +
                              number_text(answer.mix.reagent_flow, 4) + " kg/s of reagent; a stronger reagent or a larger bleed is needed");
      }
      return answer;
    }
    // The next pass: a bounded Wegstein step per unknown, on the slope of its last two passes;
    // after the first pass, for each component, on the slope plain passes have for what the column
    // does not take up, R / (R + B) (a component's recirculated share: docs/units.md, "Sump").
    std::vector<double> next = g;
    for (std::size_t i = 0; i <= count; ++i) {
      const bool first = x_last.empty();
      if (first && i == count) continue;  // the temperature: no slope known
      const double dx = first ? 1.0 : x[i] - x_last[i];
      if (dx == 0.0) continue;
      const double slope = first ? recirculation_ / outflow : (g[i] - g_last[i]) / dx;
      const double q = std::clamp(slope / (slope - 1.0), wegstein_lowest, 0.0);
      double step = q * x[i] + (1.0 - q) * g[i];
      // A component that nothing brings in any more (the make-up's calcium when the make-up turns
      // to plain water) goes as g = a x, whose fixed point is none: the step cancels to round-off
      // of x, a trace tens of decades down that the engine cannot balance. It is none.
      if (i < count && step < wegstein_cancellation * std::max(x[i], g[i])) step = 0.0;
      if (step >= 0.0 && std::isfinite(step)) next[i] = step;
    }
    x_last = x;
    g_last = g;
    x = next;
    if (pass == sump_passes) {
      const std::string where = worst == count ? std::string("its temperature") : "component " + system.components()[worst];
      throw unit::UnitError(PFU_NOT_CONVERGED, "unit 'scrubber': column and sump did not reach a steady recirculation in " +
                                                   std::to_string(sump_passes) + " passes: the recirculated liquor still moves by " +
                                                   number_text(residual, 3) + " of itself (" + where + "), against " +
                                                   number_text(sump_tolerance, 3));
    }
  }
  throw unit::UnitError(PFU_NOT_CONVERGED, "unit 'scrubber': the sump's reagent dose could not be settled");
}

double Scrubber::dry_concentration(const ColumnProfile& profile, std::size_t gas, std::size_t stage) const {
  const std::size_t gas_count = chemistry_.gases.size();
  const double* flows = profile.gas.data() + stage * gas_count;
  double dry = 0.0;
  for (std::size_t k = 0; k < gas_count; ++k)
    if (chemistry_.gases[k].component != "H2O") dry += flows[k];
  const double molar_mass = chemistry_.liquid_system->component_molar_mass(chemistry_.gases[gas].liquid_component);
  const double normal_molar_volume = thermo::constants::gas_constant * normal_temperature / normal_pressure;  // m³/mol
  const double concentration = flows[gas] / dry * molar_mass / normal_molar_volume;
  if (std::isnan(reference_oxygen_)) return concentration;
  // To the reference oxygen content: C_ref = C (21 − O_ref) / (21 − O_measured), volume percent of
  // dry gas (eu-ied-2010, Annex VI, from memory).
  const double oxygen = flows[oxygen_gas_] / dry;
  return concentration * (0.21 - reference_oxygen_) / (0.21 - oxygen);
}

// The dry concentration c(N) of the limit gas leaving an N-stage column falls with N (docs/units.md,
// "Stages for a limit"), so the answer is the N with c(N) ≤ limit < c(N − 1). Each trial count is
// the one the last column solved predicts: the gas leaving its stage N − k from the top stands for
// the outlet of a column of k stages (the lowest k stages meet the same gas; above them the liquor
// is close to its feed), and over its top the concentration goes on falling as it fell from its
// second stage to its top. Each trial starts from the nearest column solved. Three predictions,
// then bisection, so that a poor prediction costs a few solves at most.
std::size_t Scrubber::fewest_stages_for_limit(const ColumnProfile& solved, const ColumnSpecification& specification,
                                              const ColumnFeeds& feeds) {
  const auto concentration = [&](const ColumnProfile& column, std::size_t stage) { return dry_concentration(column, limit_gas_, stage); };
  const auto predicted = [&](const ColumnProfile& column, std::size_t first, std::size_t last) {
    const std::size_t m = column.stages;
    const double ln_top = std::log(concentration(column, 0));
    const double fall = m > 1 ? std::min(ln_top - std::log(concentration(column, 1)), 0.0) : 0.0;
    for (std::size_t k = first; k <= last; ++k) {
      const double estimate = k <= m ? concentration(column, m - k) : std::exp(ln_top + fall * static_cast<double>(k - m));
      if (estimate <= emission_limit_) return k;
    }
    return last;
  };
  std::map<std::size_t, ColumnProfile> columns{{solved.stages, solved}};
  // c(low) > limit (0: no column tried), c(high) ≤ limit (none: no column found).
  std::size_t low = 0, high = none;
  (concentration(solved, 0) <= emission_limit_ ? high : low) = solved.stages;
  const ColumnProfile* last = &columns.begin()->second;
  for (int trial_count = 0; high == none ? low < most_stages_for_limit : high - low > 1; ++trial_count) {
    const std::size_t top = high == none ? most_stages_for_limit : high - 1;
    const std::size_t bisected = high == none ? most_stages_for_limit : (low + high) / 2;
    const std::size_t trial = trial_count < 3 ? predicted(*last, low + 1, top) : bisected;
    const ColumnProfile* nearest = nullptr;
    for (const auto& [stages, column] : columns)
      if (nearest == nullptr || (stages > trial ? stages - trial : trial - stages) <
                                    (nearest->stages > trial ? nearest->stages - trial : trial - nearest->stages))
        nearest = &column;
    const ColumnProfile& column = columns.emplace(trial, solve_stages(trial, specification, feeds, nearest)).first->second;
    (concentration(column, 0) <= emission_limit_ ? high : low) = trial;
    last = &column;
  }
  return high;
}

void Scrubber::solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
                     unit::Warnings& warnings) {
  const unit::InletState& gas_in = inlets[0];
  const unit::InletState& liquor_in = inlets[1];
  const std::size_t slate_count = gas_in.component_count;
  const std::size_t gas_count = chemistry_.gases.size();
  const std::size_t liquid_count = chemistry_.slate_component.size();

  // Feeds: the gas inlet's gas row onto the column's gases, the liquor's aqueous row onto its
  // liquid components. Anything in another phase row is refused, not silently dropped.
  const std::size_t rows = gas_in.flows.size() / slate_count;
  for (std::size_t row = 0; row < rows; ++row) {
    for (std::size_t c = 0; c < slate_count; ++c) {
      if (row != PFU_GAS_ROW && gas_in.flow(row, c) != 0.0)
        throw unit::UnitError(PFU_BAD_INLET, "unit 'scrubber': inlet 'gas_in' carries liquid or solid " +
                                                 std::string(c < slate_count ? "flow" : "") + "; the column takes a gas only");
      if (row != PFU_AQUEOUS_ROW && liquor_in.flow(row, c) != 0.0)
        throw unit::UnitError(PFU_BAD_INLET, "unit 'scrubber': inlet 'liquor_in' carries gas or solids; the column takes a liquor only");
    }
  }
  ColumnFeeds feeds;
  feeds.gas.assign(gas_count, 0.0);
  for (std::size_t c = 0; c < slate_count; ++c) {
    const double flow = gas_in.flow(PFU_GAS_ROW, c);
    if (flow == 0.0) continue;
    const std::size_t k = chemistry_.gas_of_slate_component[c];
    if (k == none)
      throw unit::UnitError(PFU_BAD_INLET, "unit 'scrubber': inlet 'gas_in' carries component " + std::to_string(c) +
                                               ", which is not a gas of the species data");
    feeds.gas[k] = flow;
  }
  feeds.gas_temperature = gas_in.temperature;
  feeds.liquid = chemistry_.liquid_of(liquor_in.phase(PFU_AQUEOUS_ROW));
  for (double& amount : feeds.liquid) {
    if (amount < 0.0 && amount > -1e-12 * std::abs(feeds.liquid.front())) amount = 0.0;  // round-off of the re-expression
    if (amount < 0.0) throw unit::UnitError(PFU_BAD_INLET, "unit 'scrubber': the liquor cannot be written as the column's components");
  }
  feeds.liquid_temperature = liquor_in.temperature;
  // The reagent (optional port): into the sump, on the column's liquid components.
  std::vector<double> sump_reagent(liquid_count, 0.0);
  double reagent_temperature = fresh_water_temperature_;
  if (inlets.size() > 2) {
    const unit::InletState& reagent_in = inlets[2];
    for (std::size_t row = 0; row < rows; ++row)
      for (std::size_t c = 0; c < slate_count; ++c)
        if (row != PFU_AQUEOUS_ROW && reagent_in.flow(row, c) != 0.0)
          throw unit::UnitError(PFU_BAD_INLET, "unit 'scrubber': inlet 'reagent_in' carries gas or solids; the sump takes a solution only");
    sump_reagent = chemistry_.liquid_of(reagent_in.phase(PFU_AQUEOUS_ROW));
    for (double& amount : sump_reagent) {
      if (amount < 0.0 && amount > -1e-12 * std::abs(sump_reagent.front())) amount = 0.0;
      if (amount < 0.0) throw unit::UnitError(PFU_BAD_INLET, "unit 'scrubber': the reagent cannot be written as the column's components");
    }
    if (std::ranges::any_of(sump_reagent, [](double f) { return f > 0.0; })) reagent_temperature = reagent_in.temperature;
  }
  const bool reagent_flows = std::ranges::any_of(sump_reagent, [](double f) { return f > 0.0; });
  double gas_total = 0.0, liquid_total = 0.0;
  for (const double f : feeds.gas) gas_total += f;
  for (const double f : feeds.liquid) liquid_total += f;
  if (!(gas_total > 0.0)) throw unit::UnitError(PFU_BAD_INLET, "unit 'scrubber': inlet 'gas_in' has no gas flow");
  if (!sump_ && !(liquid_total > 0.0)) throw unit::UnitError(PFU_BAD_INLET, "unit 'scrubber': inlet 'liquor_in' has no flow");
  if (!sump_ && reagent_flows)
    throw unit::UnitError(PFU_BAD_INLET, "unit 'scrubber': inlet 'reagent_in' has flow but the column has no sump: set recirculation_rate");
  if (sump_ && !std::isnan(sump_ph_) && !reagent_flows)
    throw unit::UnitError(PFU_BAD_INLET,
                          "unit 'scrubber': sump_ph needs a reagent: connect inlet 'reagent_in' with a flow (its composition counts)");

  ColumnSpecification specification;
  specification.pressure = gas_in.pressure;
  specification.efficiency = efficiency_;
  std::optional<SumpAnswer> sump;
  if (sump_) sump = solve_with_sump(specification, feeds, sump_reagent, reagent_temperature);
  const ColumnProfile profile = sump ? sump->profile : solve_stages(stages_, specification, feeds);
  const std::size_t n = profile.stages;

  // Outlets: the top stage's gas, the bottom stage's liquid, each at its stage's temperature.
  unit::OutletState& gas_out = outlets[0];
  unit::OutletState& liquor_out = outlets[1];
  std::ranges::fill(gas_out.flows, 0.0);
  std::ranges::fill(liquor_out.flows, 0.0);
  for (std::size_t k = 0; k < gas_count; ++k)
    gas_out.flow(PFU_GAS_ROW, chemistry_.slate_component[chemistry_.gases[k].liquid_component]) = profile.gas[k];
  for (std::size_t c = 0; c < liquid_count; ++c)
    liquor_out.flow(PFU_AQUEOUS_ROW, chemistry_.slate_component[c]) = sump ? sump->bleed[c] : profile.liquid[(n - 1) * liquid_count + c];
  gas_out.temperature = profile.temperature.front();
  gas_out.pressure = specification.pressure;
  liquor_out.temperature = sump ? sump->mix.temperature : profile.temperature.back();
  liquor_out.pressure = specification.pressure;
  // A recycle's pass before the last reads the outlets alone (unit ABI 1.4): the search for the
  // stages an emission limit needs, the profiles, the results and the warnings are for the
  // reporting pass.
  if (results.outlets_only()) return;

  // Results per gas of the trade.
  double gas_out_total = 0.0;
  for (std::size_t k = 0; k < gas_count; ++k) gas_out_total += profile.gas[k];
  const thermo::ChemicalSystem& system = *chemistry_.liquid_system;
  // The stages' liquids as solved, kept: the search for the stages an emission limit needs solves
  // other columns on the same stage model.
  std::vector<thermo::Speciation> states;
  states.reserve(n + 1);
  for (std::size_t j = 0; j <= n; ++j) states.push_back(model_->state(j));
  const thermo::Speciation& spent = states[n - 1];
  const thermo::Speciation& fed = states[n];
  double reagent = 0.0, reagent_to_co2 = 0.0;
  const double bleed_share = sump ? units::mass_flow(system, sump->bleed) / units::mass_flow(system, sump->mix.totals) : 0.0;
  for (std::size_t t = 0; t < trade_gases.size(); ++t) {
    const std::string gas_name = trade_gases[t];
    double ppmv = not_a_number, concentration = not_a_number, removal = not_a_number;
    for (std::size_t k = 0; k < gas_count; ++k) {
      if (chemistry_.gases[k].component != trade_formulas[t]) continue;
      ppmv = profile.gas[k] / gas_out_total * 1e6;
      concentration = dry_concentration(profile, k);
      if (feeds.gas[k] > 0.0) removal = 1.0 - profile.gas[k] / feeds.gas[k];
    }
    results.set("outlet_" + gas_name + "_ppmv", ppmv);
    results.set("outlet_" + gas_name + "_concentration", concentration);
    results.set("removal_" + gas_name, removal);
  }
  // Reagent: protons handed over by each gas that dissolves as one basis species.
  for (std::size_t k = 0; k < gas_count; ++k) {
    const ColumnGas& gas = chemistry_.gases[k];
    const auto& nu = gas.data.stoichiometry;
    std::size_t basis = none;
    for (std::size_t b = 1; b < nu.size(); ++b)
      if (nu[b] != 0.0) basis = b;
    if (basis == none) continue;  // water
    const double absorbed = feeds.gas[k] - profile.gas[k];
    // The column alone: its spent liquor against its feed. With a sump, the unit as a whole: the
    // bleed (the sump's liquor, scaled) against the make-up and the reagent dosed.
    const double bound_change =
        sump ? bound_protons(system, sump->mix.state, basis) * bleed_share - bound_protons(system, sump->mix.make_up_state, basis) -
                   sump->mix.reagent_scale * bound_protons(system, sump->mix.reagent_state, basis)
             : bound_protons(system, spent, basis) - bound_protons(system, fed, basis);
    const double handed = absorbed * nu[0] / nu[basis] - bound_change / nu[basis];
    reagent += handed;
    if (gas.component == "CO2") reagent_to_co2 = handed;
  }
  results.set("reagent_consumed", reagent);
  results.set("reagent_to_co2", reagent_to_co2);
  results.set("reagent_share_to_co2", reagent > 0.0 ? reagent_to_co2 / reagent : not_a_number);
  if (sump) {
    const double outflow = units::mass_flow(system, sump->mix.totals);
    const double water = sump->mix.totals[system.index_of_component("H2O")] * system.component_molar_mass(system.index_of_component("H2O"));
    results.set("sump_ph", sump->mix.state.ph);
    results.set("sump_temperature", sump->mix.temperature);
    results.set("reagent_flow", sump->mix.reagent_flow);
    results.set("fresh_water", sump->mix.fresh_water);
    results.set("bleed_flow", units::mass_flow(system, sump->bleed));
    results.set("sump_dissolved_solids", (outflow - water) / outflow);
    results.set("sump_iterations", static_cast<double>(sump->iterations));
    results.set("sump_residual", sump->residual);
  } else {
    for (const char* name : {"sump_ph", "sump_temperature", "reagent_flow", "fresh_water", "bleed_flow", "sump_dissolved_solids",
                             "sump_iterations", "sump_residual"})
      results.set(name, not_a_number);
  }
  double water_evaporated = not_a_number;
  for (std::size_t k = 0; k < gas_count; ++k)
    if (chemistry_.gases[k].component == "H2O") water_evaporated = profile.gas[k] - feeds.gas[k];
  results.set("water_evaporated", water_evaporated);
  results.set("gas_outlet_temperature", profile.temperature.front());
  results.set("liquor_outlet_temperature", profile.temperature.back());
  results.set("liquor_outlet_ph", spent.ph);
  results.set("newton_iterations", static_cast<double>(profile.iterations));

  // Warnings, worst first.
  const std::string prefix = "unit 'scrubber': ";
  double stages_for_limit = not_a_number;
  if (limit_gas_ != none) {
    const double reached = dry_concentration(profile, limit_gas_);
    const std::string gas_name = chemistry_.gases[limit_gas_].component;
    const std::size_t fewest = fewest_stages_for_limit(profile, specification, feeds);
    if (fewest != none) stages_for_limit = static_cast<double>(fewest);
    if (reached > emission_limit_) {
      warnings.add(prefix + "the emission limit for " + gas_name + " is NOT met: " + number_text(reached * 1e6, 4) +
                   " mg per normal m3 of dry gas against " + number_text(emission_limit_ * 1e6, 4) + " mg/m3; " +
                   (fewest != none ? number_text(stages_for_limit, 3) + " stages would meet it at these flows"
                                   : std::string("no column of up to 100 stages meets it with this liquor: change the liquor")));
    }
  }
  results.set("stages_for_limit", stages_for_limit);

  // Stage profiles from the column as solved.
  unit::Series& temperature_profile = results.series("stage_temperature");
  unit::Series& ph_profile = results.series("stage_ph");
  for (std::size_t j = 0; j < n; ++j) {
    temperature_profile.add(double(j + 1), profile.temperature[j]);
    ph_profile.add(double(j + 1), states[j].ph);
  }
  for (std::size_t k = 0; k < gas_count; ++k) {
    const ColumnGas& gas = chemistry_.gases[k];
    const std::size_t trade = trade_index(gas.component);
    if (trade == none && gas.component != "H2O") continue;
    const std::string name = trade == none ? std::string("h2o") : std::string(trade_gases[trade]);
    unit::Series& in_gas = results.series("stage_gas_" + name);
    for (std::size_t j = 0; j < n; ++j) {
      double stage_gas = 0.0;
      for (std::size_t q = 0; q < gas_count; ++q) stage_gas += profile.gas[j * gas_count + q];
      in_gas.add(double(j + 1), profile.gas[j * gas_count + k] / stage_gas);
    }
    if (trade == none) continue;
    unit::Series& in_liquid = results.series("stage_liquid_" + name);
    for (std::size_t j = 0; j < n; ++j)
      in_liquid.add(double(j + 1), profile.liquid[j * liquid_count + gas.liquid_component] / states[j].water_mass);
  }

  double highest_ph = 0.0;
  double highest_index = -std::numeric_limits<double>::infinity();
  std::string scaling_solid;
  for (std::size_t j = 0; j < n; ++j) {
    const thermo::Speciation& state = states[j];
    highest_ph = std::max(highest_ph, state.ph);
    for (std::size_t s = 0; s < state.saturation_index.size(); ++s) {
      if (state.saturation_index[s] > highest_index) {
        highest_index = state.saturation_index[s];
        scaling_solid = system.solids()[s].name;
      }
    }
  }
  if (sump) {
    const thermo::Speciation& state = sump->mix.state;
    highest_ph = std::max(highest_ph, state.ph);
    for (std::size_t s = 0; s < state.saturation_index.size(); ++s) {
      if (state.saturation_index[s] > highest_index) {
        highest_index = state.saturation_index[s];
        scaling_solid = system.solids()[s].name;
      }
    }
  }
  if (reagent_to_co2 > 0.25 * reagent && reagent > 0.0 && highest_ph > carbon_dioxide_ph)
    warnings.add(prefix + "the liquor reaches pH " + number_text(highest_ph, 3) + " and CO2 pickup takes " +
                 number_text(100.0 * reagent_to_co2 / reagent, 3) +
                 " % of the reagent: a lower pH setpoint or less reagent would waste less");
  if (highest_index > scaling_index)
    warnings.add(prefix + scaling_solid + " is near or beyond saturation in the liquor (saturation index " +
                 number_text(highest_index, 3) + "): scale on packing and nozzles; the column does not precipitate it");
  for (std::size_t k = 0; k < gas_count; ++k) {
    if (chemistry_.gases[k].component == "Cl2" && feeds.gas[k] > 0.0)
      warnings.add(prefix + "chlorine in the gas: toxic; in alkaline liquor it forms hypochlorite, which releases chlorine "
                            "again if the spent liquor meets acid, and its hydrolysis is not modelled here");
  }
  if (sump && sump->mix.setpoint_passed)
    warnings.add(prefix + "sump_ph " + number_text(sump_ph_, 4) + " is not held: with no reagent the sump is at pH " +
                 number_text(sump->mix.state.ph, 4) + ", past the setpoint; the reagent would move it further");
  units::warn_about_model(type, "spent liquor", spent, warnings);
  units::InletPhases none_in{"inlets", 0.0, std::vector<double>(system.solids().size(), 0.0)};
  units::warn_about_product(type, "scale on packing, nozzles and the sump", system, spent, none_in, warnings);
  warnings.add(prefix + "emission limits and the design of a scrubber are set by the local permit and codes; these "
                        "results are estimates for a qualified engineer to check");
}

}  // namespace protonflow::scrubber
