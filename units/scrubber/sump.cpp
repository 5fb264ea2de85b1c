#include "sump.hpp"

#include <protonflow/thermo/stream_enthalpy.hpp>
#include <protonflow/unit_module.hpp>
#include <protonflow/units/message_text.hpp>

#include <algorithm>
#include <cmath>
#include <optional>

namespace protonflow::scrubber {

namespace {

using units::number_text;

// The sump's temperature is found to 1e-9 K (far below any thermometer; thermo::solve_at_enthalpy's
// bracket); dose and temperature count as settled when the temperature moves by no more.
constexpr double temperature_match = 1e-9;
// Dose and temperature are found in turn (the dose at a temperature, the temperature of that
// dose) until the temperature stops moving; the heat of neutralisation couples them weakly.
constexpr int most_dose_passes = 30;
// A kg of fresh water is displaced by the reagent up to this fraction of the last one, so that the
// largest dose leaves no negative water behind through round-off.
constexpr double displacement_margin = 1e-12;

}  // namespace

Sump::Sump(const thermo::ChemicalSystem& liquid_system)
    : system_(&liquid_system),
      water_index_(liquid_system.index_of_component("H2O")),
      titration_(liquid_system),
      solver_(liquid_system),
      water_(liquid_system),
      bottoms_(liquid_system),
      make_up_(liquid_system),
      reagent_(liquid_system),
      feed_(liquid_system.components().size(), 0.0),
      water_flow_(liquid_system.components().size(), 0.0) {
  titration_.name_parameters("sump_ph", "the most reagent the flows allow, in");
}

double Sump::enthalpy_of(InflowEnthalpy& inflow, std::span<const double> totals, double temperature, double pressure) {
  if (std::ranges::equal(totals, inflow.totals) && temperature == inflow.temperature && pressure == inflow.pressure)
    return inflow.enthalpy;
  inflow.totals.assign(totals.begin(), totals.end());
  inflow.temperature = temperature;
  inflow.pressure = pressure;
  inflow.state = thermo::Speciation{};
  inflow.enthalpy = 0.0;
  if (std::ranges::all_of(totals, [](double n) { return n == 0.0; })) return 0.0;
  try {
    inflow.solver.solve(temperature, pressure, totals, {}, inflow.state);
    inflow.enthalpy = thermo::state_enthalpy(*system_, inflow.state);
  } catch (...) {
    inflow.totals.clear();  // nothing kept from a failed solve
    throw;
  }
  return inflow.enthalpy;
}

// T where the enthalpy of mix_.totals is the target, by thermo::solve_at_enthalpy from the guess, its
// first step sized by the liquor's last heat capacity; leaves the equilibrium at that T in
// mix_.state.
double Sump::temperature_at(double enthalpy, double pressure, double guess) {
  const double mass = units::mass_flow(*system_, mix_.totals);
  const double heat_capacity = thermo::solve_at_enthalpy(solver_, enthalpy, pressure, mix_.totals, {}, mix_.state, nullptr,
                                                         {guess, heat_capacity_per_mass_ * mass});
  if (heat_capacity > 0.0 && std::isfinite(heat_capacity) && mass > 0.0) heat_capacity_per_mass_ = heat_capacity / mass;
  return mix_.state.temperature;
}

const SumpMix& Sump::mix(SumpInflow bottoms, SumpInflow make_up, SumpInflow reagent, double fresh_water_temperature,
                         double outflow_mass, double pressure, SumpDose dose, double setpoint, double temperature_guess) {
  const std::size_t count = feed_.size();
  for (std::size_t c = 0; c < count; ++c) feed_[c] = bottoms.totals[c] + make_up.totals[c];
  const double inflow_mass = units::mass_flow(*system_, feed_);
  const double reagent_mass = units::mass_flow(*system_, reagent.totals);
  // Fresh water before any reagent: what holds the liquor balance.
  const double fresh_before = outflow_mass - inflow_mass;
  const double dosed_as_delivered = dose == SumpDose::as_delivered ? reagent_mass : 0.0;
  if (fresh_before - dosed_as_delivered < -1e-12 * outflow_mass) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          "unit 'scrubber': the sump overflows: the column's liquor, the make-up" +
                              std::string(dosed_as_delivered > 0.0 ? " and the reagent" : "") + " bring " +
                              number_text(inflow_mass + dosed_as_delivered, 6) + " kg/s, more than the recirculation and bleed take (" +
                              number_text(outflow_mass, 6) + " kg/s): raise bleed_rate or bleed_fraction");
  }
  // The enthalpy of each inflow at its own temperature, and of a kg/s of fresh water.
  std::ranges::fill(water_flow_, 0.0);
  water_flow_[water_index_] = 1.0 / system_->component_molar_mass(water_index_);
  const double water_enthalpy = enthalpy_of(water_, water_flow_, fresh_water_temperature, pressure);
  const double inflow_enthalpy = enthalpy_of(bottoms_, bottoms.totals, bottoms.temperature, pressure) +
                                 enthalpy_of(make_up_, make_up.totals, make_up.temperature, pressure);
  mix_.make_up_state = make_up_.state;
  const double reagent_enthalpy = reagent_mass > 0.0 ? enthalpy_of(reagent_, reagent.totals, reagent.temperature, pressure) : 0.0;
  mix_.reagent_state = reagent_mass > 0.0 ? reagent_.state : thermo::Speciation{};

  mix_.totals.assign(count, 0.0);
  mix_.setpoint_passed = false;
  if (dose == SumpDose::as_delivered || reagent_mass == 0.0) {
    const double scale = reagent_mass > 0.0 && dose == SumpDose::as_delivered ? 1.0 : 0.0;
    mix_.reagent_scale = scale;
    mix_.reagent_flow = scale * reagent_mass;
    mix_.fresh_water = std::max(0.0, fresh_before - mix_.reagent_flow);
    for (std::size_t c = 0; c < count; ++c)
      mix_.totals[c] = feed_[c] + scale * reagent.totals[c] + mix_.fresh_water * water_flow_[c];
    mix_.enthalpy = inflow_enthalpy + scale * reagent_enthalpy + mix_.fresh_water * water_enthalpy;
    mix_.temperature = temperature_at(mix_.enthalpy, pressure, temperature_guess);
    return mix_;
  }

  // Dosed: the titration of bottoms + make-up + fresh water by the reagent, each kg of reagent
  // displacing a kg of the fresh water.
  for (std::size_t c = 0; c < count; ++c) water_flow_[c] *= fresh_before;
  for (std::size_t c = 0; c < count; ++c) feed_[c] += water_flow_[c];
  titration_.set_streams(feed_, reagent.totals, water_flow_);
  const double most_ratio = fresh_before > 0.0 ? titration_.displacement_limit() * (1.0 - displacement_margin) : 0.0;
  double temperature = temperature_guess;
  for (int pass = 0; pass < most_dose_passes; ++pass) {
    double ratio = most_ratio;
    if (dose == SumpDose::setpoint) {
      // From the last dose (the last pass of the column, or of a recycle) where the setpoint is
      // bracketed near it: reachable and not passed, so the ends of the curve need no solving.
      std::optional<double> near;
      if (!mix_.setpoint_passed)
        near = titration_.find_ratio_by_secant(setpoint, temperature, pressure, most_ratio, last_ratio_, last_slope_);
      if (!near && pass == 0 && last_ratio_ > 0.0)
        near = titration_.find_ratio_near(setpoint, temperature, pressure, most_ratio, "scrubber", last_ratio_);
      if (pass == 0 && !near) {
        const double start = titration_.ph_at(0.0, temperature, pressure);
        const double end = titration_.ph_at(most_ratio, temperature, pressure);
        const bool raises = end > start;
        const bool needs_raise = setpoint > start;
        if ((raises && setpoint > end) || (!raises && setpoint < end))
          throw SumpSetpointUnreachable("the reagent reaches pH " + number_text(end, 4) + " at most", end);
        // Already past the setpoint with no reagent: none is dosed (the caller says so).
        mix_.setpoint_passed = raises != needs_raise;
      }
      if (mix_.setpoint_passed) {
        ratio = 0.0;
      } else {
        ratio = near ? *near : titration_.find_ratio(setpoint, temperature, pressure, most_ratio, "scrubber", pass == 0 ? 0.0 : last_ratio_);
        last_ratio_ = ratio;
      }
    }
    const std::span<const double> totals = titration_.totals_at(ratio);
    std::ranges::copy(totals, mix_.totals.begin());
    mix_.reagent_flow = ratio * titration_.feed_mass();
    mix_.reagent_scale = mix_.reagent_flow / reagent_mass;
    mix_.fresh_water = fresh_before - mix_.reagent_flow;
    mix_.enthalpy = inflow_enthalpy + mix_.reagent_scale * reagent_enthalpy + mix_.fresh_water * water_enthalpy;
    const double next = temperature_at(mix_.enthalpy, pressure, temperature);
    const bool settled = std::abs(next - temperature) <= temperature_match;
    temperature = next;
    if (settled || dose == SumpDose::most) {
      mix_.temperature = temperature;
      return mix_;
    }
  }
  throw unit::UnitError(PFU_NOT_CONVERGED, "unit 'scrubber': the sump's dose and temperature did not settle in " +
                                               std::to_string(most_dose_passes) + " passes");
}

}  // namespace protonflow::scrubber
