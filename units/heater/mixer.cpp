#include "mixer.hpp"

#include <algorithm>
#include <string>

#include <protonflow/units/message_text.hpp>

namespace protonflow::units {

Mixer::Mixer(const unit::Parameters& parameters, const unit::Slate& slate)
    : duty_(parameters.number("duty")),
      pressure_drop_(parameters.number("pressure_drop")),
      system_(make_stream_system(type, slate, parameters.text("activity_model"))),
      placement_(type, *system_, slate),
      product_(type, *system_),
      inlet_phases_{"inlets", 0.0, std::vector<double>(system_->solids().size(), 0.0)} {
  inlets_.reserve(inlet_count);
  for (std::size_t k = 0; k < inlet_count; ++k) inlets_.emplace_back(type, *system_);
}

void Mixer::solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
                  unit::Warnings& warnings) {
  unit::OutletState& product = outlets[0];
  const auto port = [](std::size_t k) { return std::string("'") + ports[k].name + "'"; };

  // Totals per inlet, and their sum in port order: what the product's equilibrium sees. The
  // product's pressure is set by the lowest-pressure inlet that carries flow (one without flow
  // enters nothing, so an unconnected inlet never sets it), or by the lowest of all if none does.
  product_.clear();
  std::size_t lowest = inlet_count;
  bool lowest_flows = false;
  for (std::size_t k = 0; k < inlet_count; ++k) {
    inlets_[k].clear();
    inlets_[k].add(inlets[k]);
    product_.add(inlets[k]);
    const bool flows = !inlets_[k].empty();
    if (lowest == inlet_count || (flows && !lowest_flows) ||
        (flows == lowest_flows && inlets[k].pressure < inlets[lowest].pressure)) {
      lowest = k;
      lowest_flows = flows;
    }
  }
  const double outlet_pressure = inlets[lowest].pressure - pressure_drop_;
  if (!(outlet_pressure > 0.0)) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'mixer': pressure_drop " + number_text(pressure_drop_) +
                                                     " Pa is not less than the lowest inlet pressure " +
                                                     number_text(inlets[lowest].pressure) + " Pa, of inlet " + port(lowest));
  }
  product.pressure = outlet_pressure;
  if (product_.empty()) {
    // No flow at all: nothing to mix. A duty into nothing has no answer.
    if (duty_ != 0.0) {
      throw unit::UnitError(PFU_BAD_INLET, "unit 'mixer': no inlet has flow, so a duty of " + number_text(duty_) +
                                               " W has no outlet temperature");
    }
    product.temperature = inlets[0].temperature;
    std::ranges::fill(product.flows, 0.0);
    results.set("duty", 0.0);
    results.set("outlet_temperature", product.temperature);
    results.set("gas_flow", 0.0);
    results.set("solid_flow", 0.0);
    return;
  }

  // Each inlet at its own equilibrium, T and P: its enthalpy, and the phases it brings.
  double inlet_enthalpy = 0.0;
  inlet_phases_.gas_amount = 0.0;
  std::ranges::fill(inlet_phases_.solid_amount, 0.0);
  for (std::size_t k = 0; k < inlet_count; ++k) {
    if (inlets_[k].empty()) continue;
    inlets_[k].equilibrate(inlets[k].temperature, inlets[k].pressure,
                           "equilibrating inlet " + port(k) + " at " + number_text(inlets[k].temperature) + " K",
                           PFU_BAD_INLET);
    inlet_enthalpy += inlets_[k].enthalpy();
    const thermo::Speciation& in = inlets_[k].state();
    if (in.gas_phase_present) inlet_phases_.gas_amount += in.gas_phase_amount;
    for (std::size_t s = 0; s < in.solid_amount.size(); ++s) inlet_phases_.solid_amount[s] += in.solid_amount[s];
  }
  // Adiabatic mixing that lands out of range (the heat of mixing boils the liquor away) is the
  // inlets' doing; with a duty, the duty's.
  product_.equilibrate_at_enthalpy(inlet_enthalpy + duty_, outlet_pressure,
                                   "finding the product temperature for the inlets' enthalpy" +
                                       (duty_ == 0.0 ? std::string(" (adiabatic mixing)")
                                                     : " plus a duty of " + number_text(duty_) + " W"),
                                   duty_ == 0.0 ? PFU_BAD_INLET : PFU_INVALID_PARAMETER);
  const thermo::Speciation& out = product_.state();
  product.temperature = out.temperature;

  warn_about_product(type, "scaling and fouling of the vessel and the lines after it, blocked outlets", *system_, out,
                     inlet_phases_, warnings);
  for (std::size_t k = 0; k < inlet_count; ++k) {
    if (!inlets_[k].empty()) warn_about_model(type, ports[k].name, inlets_[k].state(), warnings);
  }
  warn_about_model(type, "product", out, warnings);
  placement_.write(product_.totals(), out, product, warnings);

  double solid_flow = 0.0;
  for (const double amount : out.solid_amount) solid_flow += amount;
  results.set("duty", product_.enthalpy() - inlet_enthalpy);
  results.set("outlet_temperature", out.temperature);
  results.set("outlet_ph", out.ph);
  results.set("gas_flow", out.gas_phase_present ? out.gas_phase_amount : 0.0);
  results.set("solid_flow", solid_flow);
}

}  // namespace protonflow::units
