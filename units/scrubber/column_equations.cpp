#include "column_equations.hpp"

#include <sundials/sundials_band.h>
#include <sunmatrix/sunmatrix_band.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace protonflow::scrubber::detail {

namespace {

// Scale of the energy residual: 75.3 J/(mol K), the molar heat capacity of liquid water near
// 25 °C (NIST-JANAF, Chase 1998; from memory), so a residual of 1 is the heat that warms the whole
// throughput by about one kelvin. A scale only: it changes no answer.
constexpr double energy_scale_heat_capacity = 75.3;

// Every gas leaves a stage with at least this mole fraction (1e-24 ppmv): far below anything an
// analyser or a permit knows, it keeps the trace of a gas that a caustic column absorbs stage after
// stage at a definite scale instead of one that can sink without bound (the equations of a gas at
// trace level are otherwise homogeneous in its amounts).
constexpr double trace_mole_fraction = 1e-30;

// No flow on a stage exceeds a thousand times the column's throughput: the unknowns are measured
// from this bound and KINSOL keeps them below it (docs/units.md, "Solution").
constexpr double largest_flow_per_throughput = 1e3;

// Difference-quotient steps: the square root of the double epsilon on ln(flow) (a relative step
// of 1.5e-8) and on T relative to its size (common practice, Dennis & Schnabel 1983, §5.4).
constexpr double log_step = 1.4901161193847656e-08;

double positive_sum(const double* values, std::size_t count) {
  double sum = 0.0;
  for (std::size_t i = 0; i < count; ++i) sum += values[i];
  return sum;
}

}  // namespace

ColumnEquations::ColumnEquations(StageModel& model, const ColumnSpecification& specification, const ColumnFeeds& feeds)
    : model_(model),
      stages_(specification.stages),
      liquid_count_(model.liquid_count()),
      gas_count_(model.gas_count()),
      pressure_(specification.pressure),
      efficiency_(specification.efficiency),
      feeds_(feeds),
      component_gas_(model.liquid_count(), StageModel::no_component) {
  if (stages_ < 1) throw std::invalid_argument("a column needs at least one stage");
  if (feeds.liquid.size() != liquid_count_ || feeds.gas.size() != gas_count_ || efficiency_.size() != gas_count_)
    throw std::invalid_argument("the feeds and efficiencies do not match the stage model's components and gases");
  if (!(pressure_ > 0.0)) throw std::invalid_argument("the column pressure must be positive");
  for (const double e : efficiency_)
    if (!(e > 0.0 && e <= 1.0)) throw std::invalid_argument("a Murphree efficiency must lie in (0, 1]");
  for (const double f : feeds.liquid)
    if (!(f >= 0.0) || !std::isfinite(f)) throw std::invalid_argument("a liquor flow is negative or not finite");
  for (const double f : feeds.gas)
    if (!(f >= 0.0) || !std::isfinite(f)) throw std::invalid_argument("a gas flow is negative or not finite");
  const double liquid_total = positive_sum(feeds.liquid.data(), liquid_count_);
  const double gas_total = positive_sum(feeds.gas.data(), gas_count_);
  if (!(liquid_total > 0.0)) throw std::invalid_argument("the liquor feed has no flow");
  if (!(gas_total > 0.0)) throw std::invalid_argument("the gas feed has no flow");

  for (std::size_t k = 0; k < gas_count_; ++k)
    if (model.gas_component(k) != StageModel::no_component) component_gas_[model.gas_component(k)] = k;
  for (std::size_t c = 0; c < liquid_count_; ++c) {
    const std::size_t k = component_gas_[c];
    if (feeds.liquid[c] > 0.0 || (k != StageModel::no_component && feeds.gas[k] > 0.0)) liquid_unknowns_.push_back(c);
  }
  for (std::size_t k = 0; k < gas_count_; ++k) {
    const std::size_t c = model.gas_component(k);
    const bool dissolved_present =
        c != StageModel::no_component && std::find(liquid_unknowns_.begin(), liquid_unknowns_.end(), c) != liquid_unknowns_.end();
    if (feeds.gas[k] > 0.0 || dissolved_present) gas_unknowns_.push_back(k);
  }
  block_ = liquid_unknowns_.size() + gas_unknowns_.size() + 1;
  flow_scale_ = liquid_total + gas_total;
  energy_scale_ = flow_scale_ * energy_scale_heat_capacity;
  log_flow_limit_ = std::log(largest_flow_per_throughput * flow_scale_);
  temperature_floor_ = model.minimum_temperature();

  l_.assign(stages_ * liquid_count_, 0.0);
  v_.assign(stages_ * gas_count_, 0.0);
  t_.assign(stages_, feeds.liquid_temperature);
  const StageEquilibrium empty{std::vector<double>(gas_count_, 0.0), 0.0};
  equilibrium_.assign(stages_, empty);
  feed_liquid_ = empty;
  trial_ = empty;
  f_base_.assign(size(), 0.0);
  f_trial_.assign(size(), 0.0);
  x_evaluated_.assign(size(), 0.0);
  moved_.assign(size(), 0.0);
  // The liquor feed at its own temperature: its enthalpy enters the top stage. Stage index
  // `stages` is the feed's slot in the model.
  model_.evaluate(stages_, feeds.liquid_temperature, pressure_, feeds.liquid, feed_liquid_);
}

std::string ColumnEquations::equation_name(std::size_t slot) const {
  if (slot < liquid_unknowns_.size()) return "balance of liquid component " + std::to_string(liquid_unknowns_[slot]);
  slot -= liquid_unknowns_.size();
  if (slot < gas_unknowns_.size()) return "equilibrium of gas " + std::to_string(gas_unknowns_[slot]);
  return "energy balance";
}

void ColumnEquations::constraints(double* c) const {
  for (std::size_t i = 0; i < size(); ++i) c[i] = i % block_ == temperature_slot() ? 2.0 : -2.0;
}

bool ColumnEquations::can_start_from(const ColumnProfile& profile) const {
  if (profile.stages != stages_ || profile.liquid.size() != stages_ * liquid_count_ || profile.gas.size() != stages_ * gas_count_ ||
      profile.temperature.size() != stages_)
    return false;
  const double largest = std::exp(log_flow_limit_);
  const auto fits = [&](double flow) { return flow > 0.0 && flow < largest && std::log(flow) - log_flow_limit_ > -700.0; };
  for (std::size_t j = 0; j < stages_; ++j) {
    for (const std::size_t c : liquid_unknowns_)
      if (!fits(profile.liquid[j * liquid_count_ + c])) return false;
    for (const std::size_t k : gas_unknowns_)
      if (!fits(profile.gas[j * gas_count_ + k])) return false;
    const double t = profile.temperature[j];
    if (!(t >= temperature_floor_ && t <= model_.maximum_temperature())) return false;
  }
  return true;
}

void ColumnEquations::pack(const ColumnProfile& profile, double* x) const {
  for (std::size_t j = 0; j < stages_; ++j) {
    double* block = x + j * block_;
    std::size_t slot = 0;
    for (const std::size_t c : liquid_unknowns_) block[slot++] = std::log(profile.liquid[j * liquid_count_ + c]) - log_flow_limit_;
    for (const std::size_t k : gas_unknowns_) block[slot++] = std::log(profile.gas[j * gas_count_ + k]) - log_flow_limit_;
    block[slot] = profile.temperature[j] - temperature_floor_;
  }
}

ColumnProfile ColumnEquations::unpack(const double* x) const {
  ColumnProfile profile;
  profile.stages = stages_;
  profile.liquid.assign(stages_ * liquid_count_, 0.0);
  profile.gas.assign(stages_ * gas_count_, 0.0);
  profile.temperature.assign(stages_, 0.0);
  for (std::size_t j = 0; j < stages_; ++j) {
    const double* block = x + j * block_;
    std::size_t slot = 0;
    for (const std::size_t c : liquid_unknowns_) profile.liquid[j * liquid_count_ + c] = std::exp(block[slot++] + log_flow_limit_);
    for (const std::size_t k : gas_unknowns_) profile.gas[j * gas_count_ + k] = std::exp(block[slot++] + log_flow_limit_);
    profile.temperature[j] = block[slot] + temperature_floor_;
  }
  return profile;
}

void ColumnEquations::read_stage(const double* x, std::size_t stage) {
  const double* block = x + stage * block_;
  std::size_t slot = 0;
  for (const std::size_t c : liquid_unknowns_) l_[stage * liquid_count_ + c] = std::exp(block[slot++] + log_flow_limit_);
  for (const std::size_t k : gas_unknowns_) v_[stage * gas_count_ + k] = std::exp(block[slot++] + log_flow_limit_);
  t_[stage] = block[slot] + temperature_floor_;
}

void ColumnEquations::evaluate_stage(std::size_t stage, StageEquilibrium& out) {
  const std::span<const double> liquid(l_.data() + stage * liquid_count_, liquid_count_);
  model_.evaluate(stage, t_[stage], pressure_, liquid, out);
}

double ColumnEquations::gas_enthalpy_flow(const double* gas, double temperature) const {
  double h = 0.0;
  for (const std::size_t k : gas_unknowns_) h += gas[k] * model_.gas_enthalpy(k, temperature);
  return h;
}

void ColumnEquations::residual_block(std::size_t j, const StageEquilibrium& above, const StageEquilibrium& here,
                                     double* f) const {
  const bool top = j == 0;
  const bool bottom = j + 1 == stages_;
  const double* liquid_in = top ? feeds_.liquid.data() : l_.data() + (j - 1) * liquid_count_;
  const double* liquid_out = l_.data() + j * liquid_count_;
  const double* gas_in = bottom ? feeds_.gas.data() : v_.data() + (j + 1) * gas_count_;
  const double* gas_out = v_.data() + j * gas_count_;
  const double gas_in_total = positive_sum(gas_in, gas_count_);
  const double gas_out_total = positive_sum(gas_out, gas_count_);

  std::size_t slot = 0;
  for (const std::size_t c : liquid_unknowns_) {
    const std::size_t k = component_gas_[c];
    const double in = liquid_in[c] + (k == StageModel::no_component ? 0.0 : gas_in[k]);
    const double out = liquid_out[c] + (k == StageModel::no_component ? 0.0 : gas_out[k]);
    f[slot++] = std::log(in) - std::log(out);
  }
  for (const std::size_t k : gas_unknowns_) {
    if (model_.gas_component(k) == StageModel::no_component) {
      f[slot++] = std::log(gas_out[k]) - std::log(gas_in[k]);
      continue;
    }
    const double y_in = gas_in[k] / gas_in_total;
    const double e = efficiency_[k];
    const double target = (1.0 - e) * y_in + e * here.partial_pressure[k] / pressure_ + trace_mole_fraction;
    f[slot++] = std::log(gas_out[k]) - std::log(gas_out_total * std::max(target, 1e-300));
  }
  const double gas_in_enthalpy = gas_enthalpy_flow(gas_in, bottom ? feeds_.gas_temperature : t_[j + 1]);
  const double gas_out_enthalpy = gas_enthalpy_flow(gas_out, t_[j]);
  f[slot] = (above.liquid_enthalpy + gas_in_enthalpy - here.liquid_enthalpy - gas_out_enthalpy) / energy_scale_;
}

void ColumnEquations::residual(const double* x, double* f) {
  // A Newton step can land where no stage has an answer: refuse it here, before the engine sees
  // it (flows beyond a thousand times the throughput, a temperature outside the data).
  for (std::size_t i = 0; i < size(); ++i) {
    const bool temperature = i % block_ == temperature_slot();
    const bool outside = temperature ? !(x[i] >= 0.0 && x[i] + temperature_floor_ <= model_.maximum_temperature())
                                     : !(x[i] <= 0.0 && x[i] + log_flow_limit_ > -700.0);
    if (outside)
      throw std::domain_error("a Newton step left the range where stages have an answer (stage " +
                              std::to_string(i / block_ + 1) + ", unknown " + std::to_string(i % block_ + 1) + " = " +
                              std::to_string(x[i]) + ")");
  }
  evaluated_ = false;
  for (std::size_t j = 0; j < stages_; ++j) read_stage(x, j);
  for (std::size_t j = 0; j < stages_; ++j) evaluate_stage(j, equilibrium_[j]);
  for (std::size_t j = 0; j < stages_; ++j) residual_block(j, above(j), equilibrium_[j], f + j * block_);
  // Kept for the Jacobian, which KINSOL asks for at the point whose residual it has just had.
  std::copy(x, x + size(), x_evaluated_.begin());
  std::copy(f, f + size(), f_base_.begin());
  evaluated_ = true;
  // Each stage's speciation starts warm from that stage's last answer and meets its tolerance, not
  // round-off: F at one point differs in the last digits (about 1e-12) from one evaluation to the
  // next. KINSOL's line search assumes one F per point: where its step between a point that passed
  // the sufficient-decrease test and one that failed it shrinks to nothing, it stops only when F at
  // the passing point passes again, and near a point where Newton stalls a re-evaluation can fail
  // it every time (docs/units.md, "Solution"). So a point asked again within one Newton step gets
  // the F it got first; the stages are still evaluated, so the model's states, equilibrium_ and
  // f_base_ are those of this evaluation at x.
  const std::size_t n = size();
  for (std::size_t at = 0; at < remembered_.size(); at += 2 * n) {
    if (!std::equal(x, x + n, remembered_.begin() + static_cast<std::ptrdiff_t>(at))) continue;
    std::copy_n(remembered_.begin() + static_cast<std::ptrdiff_t>(at + n), n, f);
    return;
  }
  // A guard, not a limit met in practice: a line search takes some fifty points at most, twice
  // that where it bisects back (docs/units.md, "Solution").
  constexpr std::size_t most_points_per_step = 1000;
  if (remembered_.size() >= most_points_per_step * 2 * n)
    throw std::runtime_error("the line search of one Newton step asked for more than " + std::to_string(most_points_per_step) +
                             " points of the column");
  remembered_.insert(remembered_.end(), x, x + n);
  remembered_.insert(remembered_.end(), f, f + n);
}

void ColumnEquations::jacobian(const double* x, SUNMatrix band) {
  // The residual at x, with every stage's equilibrium, is at hand when x is the point last
  // evaluated (KINSOL evaluates F where it then wants J): no stage is speciated twice.
  if (!evaluated_ || !std::equal(x, x + size(), x_evaluated_.begin())) residual(x, f_trial_.data());
  // A new Newton step: F is remembered from here on, starting with the point it starts from and
  // the F KINSOL has for it.
  const std::size_t n = size();
  std::size_t start = remembered_.size();
  for (std::size_t at = 0; at < remembered_.size(); at += 2 * n)
    if (std::equal(x, x + n, remembered_.begin() + static_cast<std::ptrdiff_t>(at))) start = at;
  if (start == remembered_.size()) {
    remembered_.assign(x, x + n);
    remembered_.insert(remembered_.end(), f_base_.begin(), f_base_.end());
  } else {
    remembered_.erase(remembered_.begin(), remembered_.begin() + static_cast<std::ptrdiff_t>(start));
    remembered_.resize(2 * n);
  }
  SUNMatZero(band);
  std::copy(x, x + size(), moved_.begin());
  for (std::size_t j = 0; j < stages_; ++j) {
    const std::size_t first_row_block = j == 0 ? 0 : j - 1;
    const std::size_t last_row_block = std::min(j + 1, stages_ - 1);
    for (std::size_t a = 0; a < block_; ++a) {
      const std::size_t column = j * block_ + a;
      const bool is_temperature = a == temperature_slot();
      const double step = log_step * std::max(std::abs(is_temperature ? x[column] + temperature_floor_ : x[column] + log_flow_limit_), 1.0);
      moved_[column] = x[column] + step;
      const double actual_step = moved_[column] - x[column];  // the step as represented
      read_stage(moved_.data(), j);
      // Only a liquid flow or the temperature changes the stage's equilibrium.
      const bool changes_equilibrium = a < liquid_unknowns_.size() || is_temperature;
      if (changes_equilibrium) evaluate_stage(j, trial_);
      const StageEquilibrium& here_j = changes_equilibrium ? trial_ : equilibrium_[j];
      for (std::size_t r = first_row_block; r <= last_row_block; ++r) {
        const StageEquilibrium& here = r == j ? here_j : equilibrium_[r];
        const StageEquilibrium& over = r == 0 ? feed_liquid_ : (r - 1 == j ? here_j : equilibrium_[r - 1]);
        residual_block(r, over, here, f_trial_.data() + r * block_);
        for (std::size_t s = 0; s < block_; ++s) {
          const std::size_t row = r * block_ + s;
          SM_ELEMENT_B(band, row, column) = (f_trial_[row] - f_base_[row]) / actual_step;
        }
      }
      moved_[column] = x[column];
      read_stage(x, j);
    }
  }
}

}  // namespace protonflow::scrubber::detail
