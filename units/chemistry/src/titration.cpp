#include <protonflow/units/titration.hpp>

#include <protonflow/thermo/errors.hpp>
#include <protonflow/unit_module.hpp>
#include <protonflow/units/message_text.hpp>

#include <boost/math/tools/roots.hpp>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <utility>

namespace protonflow::units {

namespace {

// Stopping rules of the dose search: a pH within 1e-9 of the target is the target (far below any
// meter's resolution, 0.01 pH), and a bracket of relative width 1e-13 cannot be narrowed further
// in a useful way (a few ulps of the ratio).
constexpr double ph_match = 1e-9;
constexpr double relative_bracket = 1e-13;
constexpr std::uintmax_t max_search_steps = 100;
// The bracket tried around a hint, relative: a few kelvin of adiabatic heating, or a recycle pass
// near its answer, move the dose of a steep curve by far less. It widens sixteenfold at a time
// towards the target where that is not so.
constexpr double hint_width = 1e-4;
constexpr double hint_widening = 16.0;
// Secant steps from a hint start only within this many pH units of the target, take at most this
// many steps, and measure the curve's slope, where none is known, by this relative step.
constexpr double secant_reach = 1.0;
constexpr int most_secant_steps = 6;
constexpr double slope_probe = 1e-6;

}  // namespace

double mass_flow(const thermo::ChemicalSystem& system, std::span<const double> totals) {
  double mass = 0.0;
  for (std::size_t c = 0; c < totals.size(); ++c) mass += totals[c] * system.component_molar_mass(c);
  return mass;
}

Titration::Titration(const thermo::ChemicalSystem& system)
    : system_(&system),
      solver_(system),
      reagent_solver_(system),
      feed_(system.components().size(), 0.0),
      reagent_(system.components().size(), 0.0),
      displaced_(system.components().size(), 0.0),
      totals_(system.components().size(), 0.0) {}

void Titration::set_streams(std::span<const double> feed, std::span<const double> reagent) {
  std::ranges::copy(feed, feed_.begin());
  std::ranges::copy(reagent, reagent_.begin());
  feed_mass_ = mass_flow(*system_, feed_);
  reagent_mass_ = mass_flow(*system_, reagent_);
  std::ranges::fill(displaced_, 0.0);
  displaced_mass_ = 0.0;
}

void Titration::set_streams(std::span<const double> feed, std::span<const double> reagent,
                            std::span<const double> displaced) {
  set_streams(feed, reagent);
  std::ranges::copy(displaced, displaced_.begin());
  displaced_mass_ = mass_flow(*system_, displaced_);
}

double Titration::displacement_limit() const noexcept {
  return displaced_mass_ > 0.0 ? displaced_mass_ / feed_mass_ : std::numeric_limits<double>::infinity();
}

void Titration::name_parameters(std::string target, std::string ratio_max) {
  target_name_ = std::move(target);
  ratio_max_name_ = std::move(ratio_max);
}

void Titration::set_streams(std::span<const double> feed, std::span<const double> reagent, double feed_mass) {
  set_streams(feed, reagent);
  feed_mass_ = feed_mass;
}

std::span<const double> Titration::totals_at(double ratio) {
  const double scale = reagent_mass_ > 0.0 ? ratio * feed_mass_ / reagent_mass_ : 0.0;
  const double displaced = displaced_mass_ > 0.0 ? ratio * feed_mass_ / displaced_mass_ : 0.0;
  for (std::size_t c = 0; c < totals_.size(); ++c) totals_[c] = feed_[c] + scale * reagent_[c] - displaced * displaced_[c];
  return totals_;
}

const thermo::Speciation& Titration::equilibrate(double ratio, double temperature, double pressure) {
  const std::span<const double> totals = totals_at(ratio);
  ++solves_;
  solver_.solve(temperature, pressure, totals, {}, state_);
  return state_;
}

double Titration::reagent_ph(double temperature, double pressure) {
  ++solves_;
  reagent_solver_.solve(temperature, pressure, reagent_, {}, reagent_state_);
  return reagent_state_.ph;
}

double Titration::miss_tracked(double ratio, double target, double temperature, double pressure, double& best_ratio,
                               double& best_miss) {
  const double g = ph_at(ratio, temperature, pressure) - target;
  if (std::abs(g) < std::abs(best_miss)) {
    best_ratio = ratio;
    best_miss = g;
  }
  return std::abs(g) <= ph_match ? 0.0 : g;
}

std::optional<double> Titration::find_ratio_near(double target, double temperature, double pressure, double ratio_max,
                                                 const std::string& unit_type, double hint) {
  if (!(hint > 0.0 && hint <= ratio_max)) return std::nullopt;
  double width = hint_width;
  double low = hint * (1.0 - width);
  double high = std::min(hint * (1.0 + width), ratio_max);
  double low_miss = ph_at(low, temperature, pressure) - target;
  double high_miss = ph_at(high, temperature, pressure) - target;
  while ((low_miss < 0.0) == (high_miss < 0.0)) {
    // Same sign at both ends: the target lies beyond the end nearer to it.
    const bool beyond_high = std::abs(high_miss) < std::abs(low_miss);
    width *= hint_widening;
    if (beyond_high) {
      if (high == ratio_max) return std::nullopt;
      low = high;
      low_miss = high_miss;
      high = std::min(hint * (1.0 + width), ratio_max);
      high_miss = ph_at(high, temperature, pressure) - target;
    } else {
      if (width >= 1.0) return std::nullopt;  // down to x = 0: the ends' checks decide
      high = low;
      high_miss = low_miss;
      low = hint * (1.0 - width);
      low_miss = ph_at(low, temperature, pressure) - target;
    }
  }
  return search(target, temperature, pressure, low, high, low_miss, high_miss, unit_type);
}

// Between the column-and-sump passes of a solve, and between the passes of dose and temperature,
// the dose moves by a small fraction of itself, on a titration curve that is steep (the plant's
// unbuffered scrubber sump liquor: 0.3 pH per 0.01 % of dose at its setpoint) but smooth there: a secant
// step from the last dose, with the slope the last dose was found on, and TOMS 748
// [alefeld-potra-shi-1995] once two steps straddle the target, meet it in two to four equilibria
// where a bracket of ±0.01 % around the last dose takes about seven. Far from the target (more
// than one pH off, on the steep part of the curve, where a secant step overshoots) or where a
// step goes against the slope, the bracketing search decides instead.
std::optional<double> Titration::find_ratio_by_secant(double target, double temperature, double pressure, double ratio_max,
                                                      double hint, double& last_slope) {
  if (!(hint > 0.0 && hint <= ratio_max)) return std::nullopt;
  double best_ratio = hint;
  double best_miss = ph_at(best_ratio, temperature, pressure) - target;
  const auto miss = [&](double ratio) { return miss_tracked(ratio, target, temperature, pressure, best_ratio, best_miss); };
  if (std::abs(best_miss) <= ph_match) return best_ratio;
  if (std::abs(best_miss) > secant_reach) return std::nullopt;
  double ratio = best_ratio, ratio_miss = best_miss;
  // No slope yet (the last dose came from a bracket): the first step measures it.
  const bool known = last_slope != 0.0 && std::isfinite(last_slope);
  double slope = last_slope;
  for (int step = 0; step < most_secant_steps; ++step) {
    const double next = !known && step == 0 ? ratio * (1.0 + slope_probe) : ratio - ratio_miss / slope;
    if (!(next > 0.0 && next <= ratio_max)) return std::nullopt;
    const double next_miss = miss(next);
    if (next_miss == 0.0) break;
    const double secant = (next_miss - ratio_miss) / (next - ratio);
    if (!std::isfinite(secant) || secant == 0.0 || (step > 0 || known ? !(secant * slope > 0.0) : false)) return std::nullopt;
    if ((next_miss < 0.0) != (ratio_miss < 0.0)) {
      // The setpoint between the last two doses: TOMS 748 there, to the titration's own stopping
      // rules (a pH within 1e-9, or a bracket of relative width 1e-13).
      double low = std::min(ratio, next), high = std::max(ratio, next);
      const double low_miss = low == ratio ? ratio_miss : next_miss, high_miss = low == ratio ? next_miss : ratio_miss;
      const auto narrow_enough = [](double a, double b) { return b - a <= relative_bracket * std::max(std::abs(a), std::abs(b)); };
      std::uintmax_t steps = max_search_steps;
      boost::math::tools::toms748_solve(miss, low, high, low_miss, high_miss, narrow_enough, steps);
      last_slope = secant;
      if (!(std::abs(best_miss) <= ph_match)) return std::nullopt;  // left to the bracketing search, which says why
      return best_ratio;
    }
    ratio = next;
    ratio_miss = next_miss;
    slope = secant;
  }
  if (!(std::abs(best_miss) <= ph_match)) return std::nullopt;
  if (slope != 0.0 && std::isfinite(slope)) last_slope = slope;
  return best_ratio;
}

double Titration::find_ratio(double target, double temperature, double pressure, double ratio_max,
                             const std::string& unit_type, double hint) {
  if (const std::optional<double> near = find_ratio_near(target, temperature, pressure, ratio_max, unit_type, hint)) return *near;
  const std::string prefix = "unit '" + unit_type + "': " + target_name_ + " " + number_text(target, 4) + ": ";
  const double start = ph_at(0.0, temperature, pressure);
  if (std::abs(start - target) <= ph_match) return 0.0;
  const double end = ph_at(ratio_max, temperature, pressure);
  const bool raises = end > start;  // the reagent is a base for this feed
  const bool needs_raise = target > start;
  if (raises != needs_raise) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix + "the feed alone is at pH " + number_text(start, 4) + " and this reagent " +
                              (raises ? "raises" : "lowers") + " the pH (to " + number_text(end, 4) + " at " + ratio_max_name_ + " " +
                              number_text(ratio_max, 4) + " kg/kg); the target needs " + (needs_raise ? "a base" : "an acid"));
  }
  if ((raises && end < target) || (!raises && end > target)) {
    double limit = 0.0;
    try {
      limit = reagent_ph(temperature, pressure);
    } catch (const thermo::ThermoError&) {
      // A dry reagent (lime powder) has no water and so no pH of its own to bound the curve.
      throw unit::UnitError(PFU_INVALID_PARAMETER,
                            prefix + "not reached within " + ratio_max_name_ + " " + number_text(ratio_max, 4) +
                                " kg/kg, where the pH is " + number_text(end, 4) +
                                "; the reagent alone cannot be equilibrated (it carries no water), so the highest pH it "
                                "can give is not known here: raise " + ratio_max_name_ + " or choose a stronger reagent");
    }
    const bool beyond_reagent = raises ? target >= limit : target <= limit;
    if (beyond_reagent) {
      throw unit::UnitError(PFU_INVALID_PARAMETER,
                            prefix + "unreachable: the " + (raises ? "highest" : "lowest") + " pH this reagent can give is " +
                                number_text(limit, 4) + " at " + celsius_text(temperature) +
                                " (the reagent's own pH, approached as the dose grows without bound); at " + ratio_max_name_ + " " +
                                number_text(ratio_max, 4) + " kg/kg the pH is " + number_text(end, 4) +
                                "; a stronger reagent is needed");
    }
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix + "not reached within " + ratio_max_name_ + " " + number_text(ratio_max, 4) +
                              " kg/kg, where the pH is " + number_text(end, 4) + "; the reagent alone is at pH " +
                              number_text(limit, 4) + ", so a larger " + ratio_max_name_ + " will reach it");
  }
  if (std::abs(end - target) <= ph_match) return ratio_max;

  return search(target, temperature, pressure, 0.0, ratio_max, start - target, end - target, unit_type);
}

// TOMS 748 on g(x) = pH(x) − target over [low, high], where g changes sign.
double Titration::search(double target, double temperature, double pressure, double low, double high, double low_miss,
                         double high_miss, const std::string& unit_type) {
  const std::string prefix = "unit '" + unit_type + "': " + target_name_ + " " + number_text(target, 4) + ": ";
  double best_ratio = low;
  double best_miss = low_miss;
  if (std::abs(high_miss) < std::abs(low_miss)) {
    best_ratio = high;
    best_miss = high_miss;
  }
  const auto miss = [&](double ratio) { return miss_tracked(ratio, target, temperature, pressure, best_ratio, best_miss); };
  const auto narrow_enough = [](double a, double b) { return b - a <= relative_bracket * std::max(std::abs(a), std::abs(b)); };
  std::uintmax_t steps = max_search_steps;
  boost::math::tools::toms748_solve(miss, low, high, low_miss, high_miss, narrow_enough, steps);
  // A step function (a pure strong acid meeting a pure strong base at a pKw/2 target is not one, but
  // a curve can be steeper than the ratio's resolution) may leave the pH off the target: say so.
  if (!(std::abs(best_miss) <= 1e-6)) {
    throw unit::UnitError(PFU_NOT_CONVERGED,
                          prefix + "the dose search ended at ratio " + number_text(best_ratio, 10) + " kg/kg with pH " +
                              number_text(best_miss + target, 8) + " after " + std::to_string(steps) +
                              " steps: the titration curve jumps across the target faster than the ratio can resolve");
  }
  if (state_.ph - target != best_miss) equilibrate(best_ratio, temperature, pressure);
  return best_ratio;
}

}  // namespace protonflow::units
