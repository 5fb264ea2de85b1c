// The column's first profile: a cheap pass of stage-to-stage sweeps (docs/units.md, "scrubber",
// "Starting profile"). Each sweep linearises every stage's equilibrium around the current profile,
// y*_jk = m_jk x_jc with m from the stage's own speciation, and solves each gas's component
// balances down the column as one tridiagonal system (the Thomas algorithm): the absorption-factor
// method of Kremser (1930) and Souders & Brown (1932) with an absorption factor per stage. Stage
// temperatures then move by their energy imbalance over the heat capacity of the stage's flows.
// New flows are taken halfway (in ln) from the old ones, so a reacting solute that swings between
// "all absorbed" and "none absorbed" settles instead of oscillating.
#include <algorithm>
#include <cmath>
#include <exception>
#include <vector>

#include "column_equations.hpp"

namespace protonflow::scrubber::detail {

namespace {

constexpr double relaxation = 0.5;  // fraction of the step in ln(flow) taken per sweep
constexpr double largest_log_step = 2.0;  // and at most a factor e² per sweep
// Molar heat capacities for the temperature step only, J/(mol K): liquid water 75.3 and water
// vapour 33.6 near 25 °C (NIST-JANAF, Chase 1998; from memory). They set the step, not the answer.
constexpr double liquid_heat_capacity = 75.3;
constexpr double gas_heat_capacity = 33.6;
constexpr double largest_temperature_step = 20.0;  // K per sweep
// Floor for flows in the start, relative to the throughput: ln of a flow stays finite.
constexpr double flow_floor = 1e-30;

// Solves a_j l_(j−1) + b_j l_j + c_j l_(j+1) = d_j for j = 0 … n−1 (a_0 and c_(n−1) unused),
// overwriting d with the answer; b is overwritten too. Thomas algorithm (Conte & de Boor 1980).
void solve_tridiagonal(const std::vector<double>& a, std::vector<double>& b, const std::vector<double>& c,
                       std::vector<double>& d) {
  const std::size_t n = d.size();
  for (std::size_t j = 1; j < n; ++j) {
    const double w = a[j] / b[j - 1];
    b[j] -= w * c[j - 1];
    d[j] -= w * d[j - 1];
  }
  d[n - 1] /= b[n - 1];
  for (std::size_t j = n - 1; j-- > 0;) d[j] = (d[j] - c[j] * d[j + 1]) / b[j];
}

}  // namespace

ColumnProfile ColumnEquations::start_profile(int sweeps) {
  initial_profile();
  return sweep(sweeps);
}

ColumnProfile ColumnEquations::start_profile_from(const ColumnProfile& previous, int sweeps) {
  initial_profile();
  if (previous.stages == stages_ && previous.liquid.size() == l_.size() && previous.gas.size() == v_.size() &&
      previous.temperature.size() == stages_) {
    const double t_low = model_.minimum_temperature() + 0.5;
    const double t_high = model_.maximum_temperature() - 0.5;
    for (std::size_t j = 0; j < stages_; ++j) {
      for (const std::size_t c : liquid_unknowns_)
        if (previous.liquid[j * liquid_count_ + c] > 0.0) l_[j * liquid_count_ + c] = previous.liquid[j * liquid_count_ + c];
      for (const std::size_t k : gas_unknowns_)
        if (previous.gas[j * gas_count_ + k] > 0.0) v_[j * gas_count_ + k] = previous.gas[j * gas_count_ + k];
      t_[j] = std::clamp(previous.temperature[j], t_low, t_high);
    }
  }
  return sweep(sweeps);
}

// Every stage at the liquor's temperature, with half of each dissolving gas in the liquid and
// half in the gas: a start from which the sweeps move by factors, never from nothing.
void ColumnEquations::initial_profile() {
  const std::size_t n = stages_;
  const double floor = flow_floor * flow_scale_;
  const double t_low = model_.minimum_temperature() + 0.5;
  const double t_high = model_.maximum_temperature() - 0.5;
  for (std::size_t j = 0; j < n; ++j) {
    for (const std::size_t c : liquid_unknowns_) {
      const std::size_t k = component_gas_[c];
      l_[j * liquid_count_ + c] = std::max(feeds_.liquid[c] + (k == StageModel::no_component ? 0.0 : 0.5 * feeds_.gas[k]), floor);
    }
    for (const std::size_t k : gas_unknowns_) {
      const bool inert = model_.gas_component(k) == StageModel::no_component;
      v_[j * gas_count_ + k] = std::max(inert ? feeds_.gas[k] : 0.5 * feeds_.gas[k], floor);
    }
    t_[j] = std::clamp(feeds_.liquid_temperature, t_low, t_high);
  }
}

ColumnProfile ColumnEquations::sweep(int sweeps) {
  evaluated_ = false;  // the sweeps overwrite the working profile and the stages' equilibria
  const std::size_t n = stages_;
  const double floor = flow_floor * flow_scale_;
  const double t_low = model_.minimum_temperature() + 0.5;
  const double t_high = model_.maximum_temperature() - 0.5;
  const auto total = [](const double* values, std::size_t count) {
    double sum = 0.0;
    for (std::size_t i = 0; i < count; ++i) sum += values[i];
    return sum;
  };
  std::vector<double> a(n), b(n), c(n), d(n), stripping(n), energy(n);
  std::vector<double> totals(liquid_count_), liquid(liquid_count_), gas(gas_count_);
  for (int sweep = 0; sweep < sweeps; ++sweep) {
    if (model_.has_flash()) {
      // Stage flashes, Gauss–Seidel, down the column and up again by turns: each stage takes
      // what reaches it (the liquid from above, the gas from below) to equilibrium at its
      // temperature. An inert gas passes and lowers the pressure the others share.
      for (std::size_t step = 0; step < n; ++step) {
        const std::size_t j = sweep % 2 == 0 ? step : n - 1 - step;
        const double* liquid_in = j == 0 ? feeds_.liquid.data() : l_.data() + (j - 1) * liquid_count_;
        const double* gas_in = j + 1 == n ? feeds_.gas.data() : v_.data() + (j + 1) * gas_count_;
        std::fill(totals.begin(), totals.end(), 0.0);
        for (const std::size_t comp : liquid_unknowns_) totals[comp] = liquid_in[comp];
        double inert = 0.0, all = 0.0;
        for (const std::size_t k : gas_unknowns_) {
          all += gas_in[k];
          if (model_.gas_component(k) == StageModel::no_component) inert += gas_in[k];
          else totals[model_.gas_component(k)] += gas_in[k];
        }
        try {
          model_.flash(j, t_[j], pressure_ * (1.0 - inert / all), totals, liquid, gas);
        } catch (const std::exception&) {
          continue;  // this stage keeps its previous flows; Newton starts from them
        }
        // The flash is a stage of efficiency 1; a stage of efficiency E passes on (1 − E) of what
        // came in as it came and E of the flash's gas (Murphree, on flows rather than mole
        // fractions: the start's approximation), the liquid keeping the rest.
        for (const std::size_t k : gas_unknowns_) {
          const std::size_t comp = model_.gas_component(k);
          if (comp == StageModel::no_component) continue;
          const double passed = (1.0 - efficiency_[k]) * gas_in[k] + efficiency_[k] * gas[k];
          liquid[comp] += gas[k] - passed;
          gas[k] = passed;
        }
        for (const std::size_t comp : liquid_unknowns_) l_[j * liquid_count_ + comp] = std::max(liquid[comp], floor);
        for (const std::size_t k : gas_unknowns_)
          v_[j * gas_count_ + k] = std::max(model_.gas_component(k) == StageModel::no_component ? gas_in[k] : gas[k], floor);
      }
    }
    if (!model_.has_flash())
      for (std::size_t j = 0; j < n; ++j) evaluate_stage(j, equilibrium_[j]);
    // Flows: one tridiagonal system per dissolving gas, with the stage's stripping factor
    // S_j = E m_j V_j / L_j, m_j = (p*_j / P) / x_j:  −l_(j−1) + (1 + S_j) l_j − S_(j+1) l_(j+1) = 0,
    // the liquor feed above the top stage and the gas feed below the bottom one.
    for (const std::size_t k : gas_unknowns_) {
      const std::size_t comp = model_.gas_component(k);
      if (comp == StageModel::no_component || model_.has_flash()) continue;  // an inert gas passes unchanged
      for (std::size_t j = 0; j < n; ++j) {
        const double liquid_total = total(l_.data() + j * liquid_count_, liquid_count_);
        const double gas_total = total(v_.data() + j * gas_count_, gas_count_);
        const double fraction = std::max(l_[j * liquid_count_ + comp], floor) / liquid_total;
        const double slope = equilibrium_[j].partial_pressure[k] / pressure_ / fraction;
        stripping[j] = efficiency_[k] * slope * gas_total / liquid_total;
      }
      for (std::size_t j = 0; j < n; ++j) {
        a[j] = -1.0;
        b[j] = 1.0 + stripping[j];
        c[j] = j + 1 < n ? -stripping[j + 1] : 0.0;
        d[j] = 0.0;
      }
      d[0] += feeds_.liquid[comp];
      d[n - 1] += feeds_.gas[k];
      solve_tridiagonal(a, b, c, d);
      // A linearised stage can strip what the next one absorbs, and circulate more of a gas
      // than the column is fed: no flow of the start exceeds the component's feeds.
      const double fed = feeds_.liquid[comp] + feeds_.gas[k];
      for (std::size_t j = 0; j < n; ++j) {
        double& liquid = l_[j * liquid_count_ + comp];
        double& gas = v_[j * gas_count_ + k];
        const double new_liquid = std::clamp(d[j], floor, fed);
        const double new_gas = std::clamp(stripping[j] * d[j], floor, fed);
        liquid *= std::exp(std::clamp(relaxation * std::log(new_liquid / liquid), -largest_log_step, largest_log_step));
        gas *= std::exp(std::clamp(relaxation * std::log(new_gas / gas), -largest_log_step, largest_log_step));
      }
    }
    // Temperatures: each stage's energy imbalance at the new flows over its flows' heat capacity.
    try {
      for (std::size_t j = 0; j < n; ++j) evaluate_stage(j, equilibrium_[j]);
    } catch (const std::exception&) {
      continue;  // temperatures stay; Newton starts from them
    }
    for (std::size_t j = 0; j < n; ++j) {
      const bool bottom = j + 1 == n;
      const double* gas_in = bottom ? feeds_.gas.data() : v_.data() + (j + 1) * gas_count_;
      const double* gas_out = v_.data() + j * gas_count_;
      energy[j] = above(j).liquid_enthalpy + gas_enthalpy_flow(gas_in, bottom ? feeds_.gas_temperature : t_[j + 1]) -
                  equilibrium_[j].liquid_enthalpy - gas_enthalpy_flow(gas_out, t_[j]);
    }
    for (std::size_t j = 0; j < n; ++j) {
      const double heat_capacity = liquid_heat_capacity * total(l_.data() + j * liquid_count_, liquid_count_) +
                                   gas_heat_capacity * total(v_.data() + j * gas_count_, gas_count_);
      const double step = std::clamp(energy[j] / heat_capacity, -largest_temperature_step, largest_temperature_step);
      t_[j] = std::clamp(t_[j] + step, t_low, t_high);
    }
  }
  ColumnProfile profile;
  profile.stages = n;
  profile.liquid = l_;
  profile.gas = v_;
  profile.temperature = t_;
  return profile;
}

}  // namespace protonflow::scrubber::detail
