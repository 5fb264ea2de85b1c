#include <protonflow/units/equilibrium_stream.hpp>

#include <protonflow/thermo/errors.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>

#include <algorithm>
#include <cmath>

#include <protonflow/units/message_text.hpp>
#include <protonflow/units/thermo_failure.hpp>

namespace protonflow::units {

namespace {

// A temperature found for a target enthalpy is accepted when its enthalpy matches the target
// within this many kelvin times the stream's heat capacity. The engine brackets T to 1e-9 K by
// TOMS 748 (thermo/src/stream_enthalpy.cpp); the secant polish usually takes it to round-off of H.
constexpr double enthalpy_match_kelvin = 1e-6;

}  // namespace

EquilibriumStream::EquilibriumStream(std::string_view unit_type, const thermo::ChemicalSystem& system)
    : unit_type_(unit_type), system_(&system), solver_(system), excess_(thermo::make_excess_enthalpy_model(system)), totals_(system.components().size(), 0.0) {}

void EquilibriumStream::clear() { std::ranges::fill(totals_, 0.0); }

void EquilibriumStream::add(const unit::InletState& inlet) {
  const std::size_t rows = inlet.flows.size() / inlet.component_count;
  for (std::size_t c = 0; c < totals_.size(); ++c) {
    double sum = 0.0;
    for (std::size_t row = 0; row < rows; ++row) sum += inlet.flow(row, c);
    totals_[c] += sum;
  }
}

bool EquilibriumStream::empty() const noexcept {
  return std::ranges::all_of(totals_, [](double total) { return total == 0.0; });
}

void EquilibriumStream::equilibrate(double temperature, double pressure, const std::string& what,
                                    pfu_status out_of_range_status) {
  try {
    solver_.solve(temperature, pressure, totals_, {}, state_);
    enthalpy_ = thermo::state_enthalpy(*system_, state_, excess_.get());
  } catch (const thermo::ThermoError& error) {
    throw_unit_error(error, unit_type_, what, out_of_range_status);
  }
}

// H(T) − target of the equilibrium at T; leaves that state in state_.
double EquilibriumStream::mismatch_at(double temperature, double pressure, double target) {
  solver_.solve(temperature, pressure, totals_, {}, state_);
  return thermo::state_enthalpy(*system_, state_, excess_.get()) - target;
}

// thermo::solve_at_enthalpy brackets only the temperatures where a liquid state exists (a target
// that would boil the liquor away is an out-of-range error); a few secant steps then take H to the
// target within round-off where H is smooth in T.
void EquilibriumStream::equilibrate_at_enthalpy(double target, double pressure, const std::string& what,
                                                pfu_status out_of_range_status) {
  try {
    // The search starts from this stream's last state, its step sized by the last heat capacity
    // found here scaled to the present amounts.
    double amount = 0.0;
    for (const double total : totals_) amount += std::abs(total);
    thermo::TemperatureEstimate estimate;
    if (!state_.molality.empty()) estimate.temperature = state_.temperature;
    estimate.heat_capacity = heat_capacity_per_amount_ * amount;
    thermo::solve_at_enthalpy(solver_, target, pressure, totals_, {}, state_, excess_.get(), estimate);
    const double low = system_->minimum_temperature();
    const double high = system_->maximum_temperature();
    double best_t = state_.temperature;
    double best_miss = thermo::state_enthalpy(*system_, state_, excess_.get()) - target;
    // Heat capacity of the stream from a 1 mK step, kept inside the data's range.
    const double step = best_t + 1e-3 <= high ? 1e-3 : -1e-3;
    const double heat_capacity = (mismatch_at(best_t + step, pressure, target) - best_miss) / step;  // W/K
    if (heat_capacity > 0.0 && amount > 0.0) heat_capacity_per_amount_ = heat_capacity / amount;
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
    if (state_.temperature != best_t) best_miss = mismatch_at(best_t, pressure, target);
    if (!(heat_capacity > 0.0) || !(std::abs(best_miss) <= enthalpy_match_kelvin * heat_capacity)) {
      throw unit::UnitError(PFU_NOT_CONVERGED,
                            "unit '" + unit_type_ + "': " + what + ": at " + number_text(best_t, 10) +
                                " K the enthalpy misses its target by " + number_text(best_miss, 3) + " W (heat capacity " +
                                number_text(heat_capacity, 4) +
                                " W/K); the target may land on a phase change that temperature alone does not resolve, "
                                "such as boiling at fixed pressure");
    }
    enthalpy_ = thermo::state_enthalpy(*system_, state_, excess_.get());
  } catch (const thermo::ThermoError& error) {
    throw_unit_error(error, unit_type_, what, out_of_range_status);
  }
}

}  // namespace protonflow::units
