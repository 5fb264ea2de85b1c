#include "heater.hpp"

#include <boost/math/tools/roots.hpp>

#include <algorithm>
#include <cstdint>

#include <protonflow/units/message_text.hpp>

namespace protonflow::units {

namespace {

// The mode, after checking that the parameters given fit it.
bool to_temperature_mode(const unit::Parameters& parameters) {
  const bool to_temperature = parameters.text("mode") == "to_temperature";
  if (to_temperature && !parameters.given("outlet_temperature")) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'heater': mode to_temperature needs parameter 'outlet_temperature' (K)");
  }
  if (to_temperature && parameters.given("duty")) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          "unit 'heater': parameter 'duty' does not apply with mode to_temperature (the duty is the result)");
  }
  if (!to_temperature && parameters.given("outlet_temperature")) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          "unit 'heater': parameter 'outlet_temperature' does not apply with mode by_duty (it is the result)");
  }
  return to_temperature;
}

}  // namespace

Heater::Heater(const unit::Parameters& parameters, const unit::Slate& slate)
    : to_temperature_(to_temperature_mode(parameters)),
      outlet_temperature_(parameters.number("outlet_temperature")),
      duty_(parameters.number("duty")),
      pressure_drop_(parameters.number("pressure_drop")),
      system_(make_stream_system(type, slate, parameters.text("activity_model"),
                                      parameters.text("precipitate_form"))),
      placement_(type, *system_, slate),
      dry_(type, *system_, slate),
      feed_(type, *system_),
      product_(type, *system_),
      feed_phases_{"feed", 0.0, {}} {}

void Heater::solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
                   unit::Warnings& warnings) {
  const unit::InletState& feed = inlets[0];
  unit::OutletState& product = outlets[0];

  const double outlet_pressure = feed.pressure - pressure_drop_;
  if (!(outlet_pressure > 0.0)) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'heater': pressure_drop " + number_text(pressure_drop_) +
                                                     " Pa is not less than the feed pressure " + number_text(feed.pressure) +
                                                     " Pa");
  }
  // Totals per component over all phases: what the equilibrium sees. The product has the same.
  feed_.clear();
  feed_.add(feed);
  product_.clear();
  product_.add(feed);
  product.pressure = outlet_pressure;
  if (feed_.empty()) {
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

  if (DryStream::is_dry(feed)) {
    solve_dry(feed, outlet_pressure, product, results);
    return;
  }
  feed_.equilibrate(feed.temperature, feed.pressure, "equilibrating the feed at " + number_text(feed.temperature) + " K",
                    PFU_BAD_INLET);
  if (to_temperature_) {
    product_.equilibrate(outlet_temperature_, outlet_pressure,
                         "equilibrating the product at outlet_temperature " + number_text(outlet_temperature_) + " K",
                         PFU_INVALID_PARAMETER);
  } else {
    product_.equilibrate_at_enthalpy(feed_.enthalpy() + duty_, outlet_pressure,
                                     "finding the product temperature for a duty of " + number_text(duty_) + " W",
                                     PFU_INVALID_PARAMETER);
  }
  const thermo::Speciation& in = feed_.state();
  const thermo::Speciation& out = product_.state();
  product.temperature = out.temperature;

  feed_phases_.gas_amount = in.gas_phase_present ? in.gas_phase_amount : 0.0;
  feed_phases_.solid_amount = in.solid_amount;
  warn_about_product(type, "scaling and fouling of the heat-transfer surfaces, blocked lines", *system_, out, feed_phases_,
                     warnings);
  warn_about_model(type, "feed", in, warnings);
  warn_about_model(type, "product", out, warnings);
  placement_.write(product_.totals(), out, product, warnings);

  double solid_flow = 0.0;
  for (const double amount : out.solid_amount) solid_flow += amount;
  results.set("duty", product_.enthalpy() - feed_.enthalpy());
  results.set("outlet_temperature", out.temperature);
  results.set("outlet_ph", out.ph);
  results.set("inlet_ph", in.ph);
  results.set("gas_flow", out.gas_phase_present ? out.gas_phase_amount : 0.0);
  results.set("solid_flow", solid_flow);
}

// A dry gas or dry solids heated or cooled as they are: no phase change, no reaction (there is no
// water to react in), the enthalpy of each species at the temperature (dry_stream.hpp). By duty, the
// temperature whose enthalpy meets the target, by TOMS 748 over the species data's range.
void Heater::solve_dry(const unit::InletState& feed, double outlet_pressure, unit::OutletState& product,
                       unit::Results& results) {
  const double h_in = dry_.enthalpy(feed, feed.temperature, "the dry feed at " + number_text(feed.temperature) + " K");
  double t_out = outlet_temperature_;
  if (!to_temperature_) {
    const double low = system_->minimum_temperature(), high = system_->maximum_temperature();
    const auto miss = [&](double t) { return dry_.enthalpy(feed, t, "the dry product") - (h_in + duty_); };
    if (!(miss(low) <= 0.0 && miss(high) >= 0.0)) {
      throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'heater': a duty of " + number_text(duty_) +
                                                       " W takes the dry feed outside the species data's " +
                                                       number_text(low) + "-" + number_text(high) + " K");
    }
    std::uintmax_t iterations = 100;
    const auto bracket = boost::math::tools::toms748_solve(miss, low, high, boost::math::tools::eps_tolerance<double>(50), iterations);
    t_out = 0.5 * (bracket.first + bracket.second);
  }
  const double h_out = dry_.enthalpy(feed, t_out, "the dry product at " + number_text(t_out) + " K");
  std::ranges::copy(feed.flows, product.flows.begin());
  product.temperature = t_out;
  product.pressure = outlet_pressure;
  double solids = 0.0;
  for (const double amount : dry_.solid_amount()) solids += amount;
  results.set("duty", h_out - h_in);
  results.set("outlet_temperature", t_out);
  results.set("gas_flow", dry_.gas_amount());
  results.set("solid_flow", solids);
}

}  // namespace protonflow::units
