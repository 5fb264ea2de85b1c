#include "acid_mixer.hpp"

#include <protonflow/thermo/errors.hpp>
#include <protonflow/thermo/water_properties.hpp>
#include <protonflow/units/message_text.hpp>
#include <protonflow/units/thermo_failure.hpp>
#include <protonflow/units/toxic_release.hpp>

#include <boost/math/tools/roots.hpp>

#include "mixture_density.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <string>
#include <utility>

namespace protonflow::units {

namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();
constexpr double reference_temperature = 298.15;  // K, 25 °C: the NBS tables' reference
// Hot liquor: above 60 °C a splash scalds (common practice; the same limit as product_warnings).
constexpr double hot_liquor_temperature = 333.15;
// Closer than this to boiling, a small upset boils the mix (common practice).
constexpr double boiling_margin_warning = 5.0;  // K
// Acid vapour over the outlet worth a warning: 0.1 Pa is about 1 ppm by volume at 1 atm, the order
// of the ceiling exposure limits for HCl and HNO3 vapour (common practice; check the local limit).
constexpr double fume_partial_pressure = 0.1;  // Pa
// H2SO4 vapour worth an acid-mist warning: the pressure at which a saturated headspace at 25 °C holds
// 1 mg/m³, the NIOSH recommended exposure limit for sulfuric acid (niosh-pocket-guide, from memory):
// p = c R T / M = 1e-6 kg/m³ × 8.314 J/(mol K) × 298.15 K / 0.098079 kg/mol.
constexpr double sulfuric_acid_molar_mass = 0.09807848;  // kg/mol, python3-periodictable
constexpr double gas_constant = 8.314462618;              // J/(mol K), CODATA 2018
constexpr double sulfuric_acid_mist_pressure = 1e-6 * gas_constant * 298.15 / sulfuric_acid_molar_mass;  // Pa
// An inlet of at least 20 % acid or caustic by mass is "concentrated" for the standing caution
// (common practice).
constexpr double concentrated_fraction = 0.2;
// Solutes without a tabulated partial molar volume worth naming: above 1 % of the liquid's mass they
// may shift the density by some tenths of a per cent (docs/units.md, "acid_mixer", density).
constexpr double untabulated_volume_mass_fraction = 0.01;

std::string inlet_name(std::size_t k) { return "inlet " + std::to_string(k + 1) + " of 'feed'"; }

std::string solute_name(thermo::ConcentratedBinary binary) { return std::string(thermo::describe(binary).solute); }

// A unit error from a binary model's refusal, naming what was being done.
[[noreturn]] void throw_binary_error(const thermo::ThermoError& error, const std::string& what, pfu_status status) {
  throw unit::UnitError(status, "unit 'acid_mixer': " + what + ": " + error.what());
}

// A binary inlet hotter than its own bubble point at its own pressure is not the liquid it is said to
// be: in the pipe it would already have flashed steam and acid vapour. The mixer keeps the liquid's
// enthalpy as given (the model extends smoothly past the bubble point) and warns, naming the inlet,
// its bubble point and the margin, so that the feed's real state is given instead (its true pressure,
// or the vapour split off first). Beyond the model's temperature range the inlet is refused
// elsewhere (binary_enthalpy throws). Docs: docs/units.md, "acid_mixer".
void warn_if_above_bubble_point(thermo::ConcentratedBinary fallback, const BinaryComposition& composition,
                                const unit::InletState& inlet, const std::string& name, unit::Warnings& warnings) {
  const thermo::ConcentratedBinary binary = composition.binary.value_or(fallback);
  const std::string what = composition.binary ? number_text(100.0 * composition.solute_fraction, 4) + " wt % " +
                                                    solute_name(binary) + "-water"
                                              : "water";
  double bubble = 0.0;
  try {
    bubble = thermo::bubble_temperature(binary, composition.solute_fraction, inlet.pressure);
  } catch (const thermo::BinaryRangeError& error) {
    if (error.value() > 0.0) return;  // boils above the model's range: below its bubble point here
    warnings.add("unit 'acid_mixer': " + name + " (" + what + ") at " + number_text(inlet.pressure) +
                 " Pa boils below the model's lowest temperature, 0 °C: at " + celsius_text(inlet.temperature) +
                 " it cannot be a liquid; it flashes as it enters (acid vapour, spatter). Give the feed's true pressure "
                 "or its vapour separately");
    return;
  }
  if (inlet.temperature <= bubble) return;
  warnings.add("unit 'acid_mixer': " + name + " (" + what + ") enters at " + celsius_text(inlet.temperature) +
               ", above its bubble point " + celsius_text(bubble) + " at its pressure " + number_text(inlet.pressure) +
               " Pa by " + number_text(inlet.temperature - bubble, 3) +
               " K: no such liquid exists there; it flashes as it enters (steam and acid vapour, spatter). The mixer "
               "takes it as the superheated liquid given; give the feed's true pressure, or cool it, or split its vapour "
               "off first");
}

}  // namespace

AcidMixer::AcidMixer(const unit::Parameters& parameters, const unit::Slate& slate)
    : held_(parameters.text("mode") == "held_temperature"),
      outlet_temperature_(parameters.number("outlet_temperature")),
      pressure_drop_(parameters.number("pressure_drop")),
      path_points_(static_cast<std::size_t>(parameters.number("path_points"))),
      system_(make_stream_system(type, slate, parameters.text("activity_model"),
                                      parameters.text("precipitate_form"))),
      columns_(slate),
      placement_(type, *system_, slate),
      dry_(type, *system_, slate),
      product_(type, *system_),
      probe_(type, *system_),
      inlet_phases_{"inlets", 0.0, std::vector<double>(system_->solids().size(), 0.0)} {
  if (parameters.number("path_points") != std::floor(parameters.number("path_points"))) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'acid_mixer': parameter 'path_points' = " +
                                                     number_text(parameters.number("path_points")) + " is not a whole number");
  }
  if (!held_ && parameters.given("outlet_temperature")) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          "unit 'acid_mixer': parameter 'outlet_temperature' does not apply with mode adiabatic (it is the result)");
  }
  if (held_ && !parameters.given("outlet_temperature")) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'acid_mixer': mode held_temperature needs parameter 'outlet_temperature' (K)");
  }
  if (parameters.given("material_temperature_limit")) material_limit_ = parameters.number("material_temperature_limit");
}

void AcidMixer::solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
                      unit::Warnings& warnings) {
  unit::OutletState& product = outlets[0];
  std::ranges::fill(product.flows, 0.0);

  // The product's pressure: the lowest of the inlets that carry flow, less the pressure drop.
  inlets_.assign(inlets.size(), Inlet{});
  double pressure = std::numeric_limits<double>::infinity();
  double lowest_any = std::numeric_limits<double>::infinity();
  double total_mass = 0.0;
  for (std::size_t k = 0; k < inlets.size(); ++k) {
    Inlet& inlet = inlets_[k];
    double acid_mass = 0.0;
    for (std::size_t c = 0; c < inlets[k].component_count; ++c) {
      double flow = 0.0;
      for (std::size_t row = 0; row * inlets[k].component_count < inlets[k].flows.size(); ++row) flow += inlets[k].flow(row, c);
      const double mass = flow * system_->component_molar_mass(c);
      inlet.mass += mass;
      if (std::ranges::find(columns_.solutes, c, &BinaryColumns::Solute::column) != columns_.solutes.end()) acid_mass += mass;
    }
    inlet.acid_fraction = inlet.mass > 0.0 ? acid_mass / inlet.mass : 0.0;
    total_mass += inlet.mass;
    lowest_any = std::min(lowest_any, inlets[k].pressure);
    if (inlet.mass > 0.0) pressure = std::min(pressure, inlets[k].pressure);
  }
  if (!std::isfinite(pressure)) pressure = lowest_any;
  pressure -= pressure_drop_;
  if (!(pressure > 0.0)) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'acid_mixer': pressure_drop " + number_text(pressure_drop_) +
                                                     " Pa is not less than the lowest inlet pressure " +
                                                     number_text(pressure + pressure_drop_) + " Pa");
  }
  product.pressure = pressure;
  if (total_mass == 0.0) {
    // Nothing to mix; a held temperature has no duty to give.
    product.temperature = held_ ? outlet_temperature_ : inlets[0].temperature;
    for (const char* name : {"duty", "gas_flow", "solid_flow", "heat_released", "mass_flow", "vapour_flow"}) results.set(name, 0.0);
    results.set("outlet_temperature", product.temperature);
    return;
  }

  // Concentrated acid or caustic and water alone: the binary model. Anything else: the engine.
  std::optional<thermo::ConcentratedBinary> binary;
  bool all_binary = true;
  for (std::size_t k = 0; k < inlets.size(); ++k) {
    inlets_[k].binary = binary_composition(columns_, *system_, inlets[k]);
    if (!inlets_[k].binary) {
      all_binary = all_binary && inlets_[k].mass == 0.0;
      continue;
    }
    if (const auto solute = inlets_[k].binary->binary) {
      if (binary && *binary != *solute) all_binary = false;
      binary = solute;
    }
  }
  if (all_binary && binary) {
    solve_binary(*binary, inlets, pressure, product, results, warnings);
  } else {
    solve_engine(inlets, pressure, product, results, warnings);
  }
}

void AcidMixer::solve_binary(thermo::ConcentratedBinary binary, std::span<const unit::InletState> inlets, double pressure,
                             unit::OutletState& product, unit::Results& results, unit::Warnings& warnings) {
  const std::size_t solute_column = std::ranges::find(columns_.solutes, binary, &BinaryColumns::Solute::binary)->column;
  const std::size_t water_column = *columns_.water;
  const double solute_mass_per_mol = system_->component_molar_mass(solute_column);
  const double water_mass_per_mol = system_->component_molar_mass(water_column);
  const std::string solute = solute_name(binary);

  // Each inlet's enthalpy at its own temperature and at 25 °C, from the binary model.
  double mass = 0.0, solute_mass = 0.0, enthalpy = 0.0, enthalpy_at_25 = 0.0;
  for (std::size_t k = 0; k < inlets.size(); ++k) {
    Inlet& inlet = inlets_[k];
    if (inlet.mass == 0.0) continue;
    try {
      inlet.enthalpy = inlet.mass * binary_enthalpy(binary, *inlet.binary, inlets[k].temperature);
      inlet.enthalpy_at_25 = inlet.mass * binary_enthalpy(binary, *inlet.binary, reference_temperature);
    } catch (const thermo::ThermoError& error) {
      throw_binary_error(error, inlet_name(k) + " (" + solute + "-water, " + number_text(100.0 * inlet.binary->solute_fraction, 4) +
                                    " wt %, " + number_text(inlets[k].temperature) + " K)",
                         PFU_BAD_INLET);
    }
    warn_if_above_bubble_point(binary, *inlet.binary, inlets[k], inlet_name(k), warnings);
    mass += inlet.mass;
    solute_mass += inlet.mass * inlet.binary->solute_fraction;
    enthalpy += inlet.enthalpy;
    enthalpy_at_25 += inlet.enthalpy_at_25;
  }
  const double fraction = solute_mass / mass;

  thermo::AdiabaticOutlet out{};
  double duty = 0.0;
  try {
    if (held_) {
      double boiling = std::numeric_limits<double>::infinity();
      try {
        boiling = thermo::bubble_temperature(binary, fraction, pressure);
      } catch (const thermo::BinaryRangeError&) {
        // It boils above the model's temperature range, so above any temperature it can hold.
      }
      if (outlet_temperature_ >= boiling) {
        throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'acid_mixer': outlet_temperature " + number_text(outlet_temperature_) +
                                                         " K is at or above the boiling point of the mix, " +
                                                         number_text(boiling) + " K at " + number_text(pressure) + " Pa");
      }
      out = {outlet_temperature_, fraction, 0.0, 0.0, false};
      duty = mass * thermo::binary_specific_enthalpy(binary, outlet_temperature_, fraction) - enthalpy;
    } else {
      out = thermo::adiabatic_outlet(binary, fraction, enthalpy / mass, pressure);
    }
  } catch (const thermo::ThermoError& error) {
    throw_binary_error(error, "the mix (" + solute + "-water, " + number_text(100.0 * fraction, 4) + " wt %)",
                       held_ ? PFU_INVALID_PARAMETER : PFU_BAD_INLET);
  }

  // The outlet: the vapour the mix flashes in the gas row, the rest liquid.
  const double vapour_mass = mass * out.vapour_fraction;
  const double vapour_solute = vapour_mass * out.vapour_solute_mass_fraction / solute_mass_per_mol;
  const double vapour_water = vapour_mass * (1.0 - out.vapour_solute_mass_fraction) / water_mass_per_mol;
  double water_total = 0.0, solute_total = 0.0;
  for (const unit::InletState& inlet : inlets) {
    water_total += inlet.flow(PFU_AQUEOUS_ROW, water_column);
    solute_total += inlet.flow(PFU_AQUEOUS_ROW, solute_column);
  }
  product.temperature = out.temperature;
  product.flow(PFU_GAS_ROW, water_column) = std::min(vapour_water, water_total);
  product.flow(PFU_GAS_ROW, solute_column) = std::min(vapour_solute, solute_total);
  product.flow(PFU_AQUEOUS_ROW, water_column) = water_total - product.flow(PFU_GAS_ROW, water_column);
  product.flow(PFU_AQUEOUS_ROW, solute_column) = solute_total - product.flow(PFU_GAS_ROW, solute_column);

  const double liquid_mass = mass - vapour_mass;
  thermo::BinaryProperties properties{};
  try {
    properties = thermo::binary_properties(binary, out.temperature, out.liquid_solute_mass_fraction);
  } catch (const thermo::ThermoError& error) {
    throw_binary_error(error, "the outlet liquid", PFU_BAD_INLET);
  }
  double boiling = out.boiling ? out.temperature : nan;
  if (!out.boiling) {
    try {
      boiling = thermo::bubble_temperature(binary, out.liquid_solute_mass_fraction, pressure);
    } catch (const thermo::ThermoError&) {
      // Above the model's temperature range: the mix boils higher than the model reaches; NaN says so.
    }
  }

  // pH: where an ionic model describes the liquid, the engine's; else the reason there is none.
  double ph = nan;
  if (properties.ionic_scope.meaningful) {
    std::vector<double> liquid(product.flows.begin(), product.flows.end());
    std::fill(liquid.begin() + static_cast<std::ptrdiff_t>(product.component_count), liquid.end(), 0.0);
    const unit::InletState state{out.temperature, pressure, product.component_count, liquid, 0};
    product_.clear();
    product_.add(state);
    try {
      product_.equilibrate(out.temperature, pressure, "the pH of the outlet liquid", PFU_BAD_INLET);
      ph = product_.state().ph;
      warn_about_model(type, "product", product_.state(), warnings);
    } catch (const unit::UnitError& error) {
      warnings.add("unit 'acid_mixer': no pH for the product: the ionic engine cannot describe it (" + std::string(error.what()) + ")");
    }
  } else {
    warnings.add("unit 'acid_mixer': no pH for the product: " + properties.ionic_scope.reason);
  }

  // The mixing path, acid into water: the water side (inlets leaner than the mix) plus a fraction
  // of the acid side, adiabatic.
  double water_mass = 0.0, water_solute = 0.0, water_enthalpy = 0.0;
  double acid_mass = 0.0, acid_solute = 0.0, acid_enthalpy = 0.0;
  for (const Inlet& inlet : inlets_) {
    if (inlet.mass == 0.0) continue;
    const bool acid_side = inlet.binary->solute_fraction > fraction;
    (acid_side ? acid_mass : water_mass) += inlet.mass;
    (acid_side ? acid_solute : water_solute) += inlet.mass * inlet.binary->solute_fraction;
    (acid_side ? acid_enthalpy : water_enthalpy) += inlet.enthalpy;
  }
  unit::Series& path = results.series("mixing_path");
  if (acid_mass > 0.0 && water_mass > 0.0) {
    for (std::size_t i = 0; i < path.capacity(); ++i) {
      const double phi = static_cast<double>(i) / static_cast<double>(path.capacity() - 1);
      const double m = water_mass + phi * acid_mass;
      try {
        const thermo::AdiabaticOutlet point =
            thermo::adiabatic_outlet(binary, (water_solute + phi * acid_solute) / m, (water_enthalpy + phi * acid_enthalpy) / m, pressure);
        path.add(phi, point.temperature);
      } catch (const thermo::ThermoError& error) {
        warnings.add("unit 'acid_mixer': the mixing path stops at " + number_text(100.0 * phi, 3) +
                     " % of the acid side added: " + error.what());
        break;
      }
    }
  }

  results.set("duty", duty);
  results.set("outlet_temperature", out.temperature);
  results.set("outlet_ph", ph);
  double gas = 0.0;
  for (const double flow : product.phase(PFU_GAS_ROW)) gas += flow;
  results.set("gas_flow", gas);
  results.set("solid_flow", 0.0);
  try {
    results.set("heat_released", enthalpy_at_25 - mass * thermo::binary_specific_enthalpy(binary, reference_temperature, fraction));
  } catch (const thermo::ThermoError& error) {
    throw_binary_error(error, "the mix at 25 C", PFU_BAD_INLET);
  }
  results.set("mass_flow", mass);
  results.set("solute_mass_fraction", out.liquid_solute_mass_fraction);
  results.set("solute_molality", properties.solute_molality);
  results.set("density", properties.density);
  results.set("volumetric_flow", liquid_mass / properties.density);
  results.set("boiling_temperature", boiling);
  results.set("boiling_margin", out.boiling ? 0.0 : boiling - out.temperature);
  results.set("vapour_flow", vapour_mass);
  results.set("model", 1.0);

  const std::string at = "unit 'acid_mixer': ";
  if (out.boiling) {
    warnings.add(at + "the mix boils: it reaches its bubble point, " + celsius_text(out.temperature) + " at " +
                 number_text(pressure / 1e3, 4) + " kPa, and flashes " + number_text(vapour_mass, 4) + " kg/s of vapour (" +
                 number_text(100.0 * out.vapour_solute_mass_fraction, 3) + " % " + solute +
                 "): steam and acid spray at the mixing point; the vessel, its vent, condenser and relief must be "
                 "designed for it, or the acid added slower with cooling (defer to local codes and a qualified engineer)");
  } else if (std::isfinite(boiling) && boiling - out.temperature < boiling_margin_warning) {
    warnings.add(at + "the outlet is " + number_text(boiling - out.temperature, 3) + " K below its boiling point (" +
                 celsius_text(boiling) + "): a small upset boils it");
  }
  if (properties.solute_vapour_pressure > fume_partial_pressure) {
    warnings.add(at + solute + " fumes: " + number_text(properties.solute_vapour_pressure, 3) + " Pa of " + solute +
                 " over the outlet liquid (about " + number_text(1e6 * properties.solute_vapour_pressure / pressure, 3) +
                 " ppm by volume at the outlet pressure): corrosive and toxic; enclose and scrub the vent, and check the "
                 "local exposure limit");
  }
  if (binary == thermo::ConcentratedBinary::sulfuric_acid && out.liquid_solute_mass_fraction > 0.0) {
    // H2SO4 vapour over strong hot acid condenses to mist as it cools (concentrated_binary.hpp).
    const double p_acid = thermo::sulfuric_acid_vapour_pressure(out.temperature, out.liquid_solute_mass_fraction);
    if (p_acid > sulfuric_acid_mist_pressure) {
      const double milligram_per_m3 = 1e6 * p_acid * sulfuric_acid_molar_mass / (gas_constant * out.temperature);
      warnings.add(at + "H2SO4 vapour: " + number_text(p_acid, 3) + " Pa over the outlet liquid (" +
                   number_text(milligram_per_m3, 3) + " mg/m3 in a saturated headspace, above the 1 mg/m3 exposure "
                   "limit): it condenses to acid mist as it cools; enclose the vessel and take its vent through a mist "
                   "eliminator, and check the local exposure limit");
    }
  }
  if (out.temperature > hot_liquor_temperature) {
    warnings.add(at + "hot corrosive liquor: the product leaves at " + celsius_text(out.temperature) + " with " +
                 number_text(100.0 * out.liquid_solute_mass_fraction, 3) + " wt % " + solute +
                 ": it burns on contact and corrodes fast; choose materials, guarding and protective equipment by local "
                 "codes and a qualified engineer");
  }
  warn_common(out.temperature, fraction, results, warnings);
}

void AcidMixer::solve_engine(std::span<const unit::InletState> inlets, double pressure, unit::OutletState& product,
                             unit::Results& results, unit::Warnings& warnings) {
  while (feeds_.size() < inlets.size()) feeds_.emplace_back(type, *system_);
  product_.clear();
  inlet_phases_.gas_amount = 0.0;
  std::ranges::fill(inlet_phases_.solid_amount, 0.0);
  double enthalpy = 0.0, enthalpy_at_25 = 0.0, mass = 0.0, acid_mass = 0.0;
  for (std::size_t k = 0; k < inlets.size(); ++k) {
    Inlet& inlet = inlets_[k];
    product_.add(inlets[k]);
    if (inlet.mass == 0.0) continue;
    mass += inlet.mass;
    acid_mass += inlet.mass * inlet.acid_fraction;
    // A binary beyond the ionic engine's reach (98 % H2SO4 meeting a salt solution, say) enters with
    // the binary model's enthalpy, on the same NBS convention as the engine's.
    if (inlet.binary && inlet.binary->binary &&
        !thermo::ionic_model_scope(*inlet.binary->binary, inlet.binary->solute_fraction).meaningful) {
      try {
        inlet.enthalpy = inlet.mass * binary_enthalpy(*inlet.binary->binary, *inlet.binary, inlets[k].temperature);
        inlet.enthalpy_at_25 = inlet.mass * binary_enthalpy(*inlet.binary->binary, *inlet.binary, reference_temperature);
      } catch (const thermo::ThermoError& error) {
        throw_binary_error(error, inlet_name(k), PFU_BAD_INLET);
      }
      warn_if_above_bubble_point(*inlet.binary->binary, *inlet.binary, inlets[k], inlet_name(k), warnings);
    } else if (DryStream::is_dry(inlets[k])) {
      // A dry gas or dry solids: their phases as given, at the inlet's temperature (dry_stream.hpp).
      inlet.enthalpy_at_25 = dry_.enthalpy(inlets[k], reference_temperature, inlet_name(k) + " (dry) at 25 C");
      inlet.enthalpy = dry_.enthalpy(inlets[k], inlets[k].temperature, inlet_name(k) + " (dry)");
      inlet_phases_.gas_amount += dry_.gas_amount();
      for (std::size_t s = 0; s < dry_.solid_amount().size(); ++s) inlet_phases_.solid_amount[s] += dry_.solid_amount()[s];
    } else {
      EquilibriumStream& feed = feeds_[k];
      feed.clear();
      feed.add(inlets[k]);
      feed.equilibrate(reference_temperature, inlets[k].pressure, "equilibrating " + inlet_name(k) + " at 25 C", PFU_BAD_INLET);
      inlet.enthalpy_at_25 = feed.enthalpy();
      feed.equilibrate(inlets[k].temperature, inlets[k].pressure,
                       "equilibrating " + inlet_name(k) + " at " + number_text(inlets[k].temperature) + " K", PFU_BAD_INLET);
      inlet.enthalpy = feed.enthalpy();
      const thermo::Speciation& state = feed.state();
      if (state.gas_phase_present) inlet_phases_.gas_amount += state.gas_phase_amount;
      for (std::size_t s = 0; s < state.solid_amount.size(); ++s) inlet_phases_.solid_amount[s] += state.solid_amount[s];
      warn_about_model(type, inlet_name(k), state, warnings);
    }
    enthalpy += inlet.enthalpy;
    enthalpy_at_25 += inlet.enthalpy_at_25;
  }
  const double acid_fraction = acid_mass / mass;

  if (held_) {
    product_.equilibrate(outlet_temperature_, pressure,
                         "equilibrating the product at outlet_temperature " + number_text(outlet_temperature_) + " K",
                         PFU_INVALID_PARAMETER);
  } else {
    product_.equilibrate_at_enthalpy(enthalpy, pressure, "finding the product temperature for the inlets' enthalpy (adiabatic mixing)",
                                     PFU_BAD_INLET);
  }
  const thermo::Speciation out = product_.state();
  const double product_enthalpy = product_.enthalpy();
  product.temperature = out.temperature;
  warn_about_product(type, "scaling of the vessel and the lines after it, blocked outlets", *system_, out, inlet_phases_, warnings);
  warn_about_toxic_release(type, *system_, out, warnings);
  warn_about_model(type, "product", out, warnings);
  placement_.write(product_.totals(), out, product, warnings);

  // The mix at 25 °C, for the heat released.
  probe_.clear();
  for (const unit::InletState& inlet : inlets) probe_.add(inlet);
  probe_.equilibrate(reference_temperature, pressure, "equilibrating the mix at 25 C", PFU_BAD_INLET);
  const double heat_released = enthalpy_at_25 - probe_.enthalpy();

  // Boiling point by Raoult's law with the outlet's water activity: a_w p_sat(T_b) = P (volatile
  // solutes ignored; p_sat from IAPWS through thermo's water properties).
  double boiling = nan;
  const auto excess = [&](double t) { return out.water_activity * thermo::water_saturation_pressure(t) - pressure; };
  constexpr double critical_temperature = 647.096;  // K, IAPWS-95
  if (out.gas_phase_present || excess(out.temperature) >= 0.0) {
    boiling = out.temperature;
  } else if (excess(critical_temperature - 1e-6) > 0.0) {
    std::uintmax_t iterations = 100;
    const auto bracket = boost::math::tools::toms748_solve(excess, out.temperature, critical_temperature - 1e-6,
                                                           boost::math::tools::eps_tolerance<double>(40), iterations);
    boiling = 0.5 * (bracket.first + bracket.second);
  }

  // The mixing path: the water side (inlets leaner in acid than the mix) plus a fraction of the acid side.
  unit::Series& path = results.series("mixing_path");
  std::vector<bool> acid_side(inlets.size(), false);
  double water_enthalpy = 0.0, acid_enthalpy = 0.0, water_side_mass = 0.0, acid_side_mass = 0.0;
  for (std::size_t k = 0; k < inlets.size(); ++k) {
    if (inlets_[k].mass == 0.0) continue;
    acid_side[k] = inlets_[k].acid_fraction > acid_fraction;
    (acid_side[k] ? acid_enthalpy : water_enthalpy) += inlets_[k].enthalpy;
    (acid_side[k] ? acid_side_mass : water_side_mass) += inlets_[k].mass;
  }
  if (acid_side_mass > 0.0 && water_side_mass > 0.0) {
    std::vector<double> flows;
    for (std::size_t i = 0; i < path.capacity(); ++i) {
      const double phi = static_cast<double>(i) / static_cast<double>(path.capacity() - 1);
      probe_.clear();
      for (std::size_t k = 0; k < inlets.size(); ++k) {
        if (inlets_[k].mass == 0.0) continue;
        flows.assign(inlets[k].flows.begin(), inlets[k].flows.end());
        if (acid_side[k]) {
          for (double& f : flows) f *= phi;
        }
        probe_.add({inlets[k].temperature, inlets[k].pressure, inlets[k].component_count, flows, 0});
      }
      try {
        probe_.equilibrate_at_enthalpy(water_enthalpy + phi * acid_enthalpy, pressure, "the mixing path", PFU_BAD_INLET);
        path.add(phi, probe_.state().temperature);
      } catch (const unit::UnitError& error) {
        warnings.add("unit 'acid_mixer': the mixing path stops at " + number_text(100.0 * phi, 3) + " % of the acid side added: " +
                     error.what());
        break;
      }
    }
  }

  results.set("duty", held_ ? product_enthalpy - enthalpy : 0.0);
  results.set("outlet_temperature", out.temperature);
  results.set("outlet_ph", out.ph);
  results.set("gas_flow", out.gas_phase_present ? out.gas_phase_amount : 0.0);
  double solids = 0.0;
  for (const double amount : out.solid_amount) solids += amount;
  results.set("solid_flow", solids);
  results.set("heat_released", heat_released);
  results.set("mass_flow", mass);
  results.set("boiling_temperature", boiling);
  results.set("boiling_margin", std::isnan(boiling) ? nan : boiling - out.temperature);
  double vapour = 0.0;
  for (std::size_t c = 0; c < product.component_count; ++c) vapour += product.flow(PFU_GAS_ROW, c) * system_->component_molar_mass(c);
  results.set("vapour_flow", vapour);
  results.set("model", 2.0);

  // The liquid's density by infinite-dilution partial molar volumes (mixture_density.hpp).
  double liquid_mass = 0.0;
  for (std::size_t c = 0; c < product.component_count; ++c)
    liquid_mass += product.flow(PFU_AQUEOUS_ROW, c) * system_->component_molar_mass(c);
  if (liquid_mass > 0.0) {
    const MixtureDensity liquid = mixture_density(*system_, out, liquid_mass);
    results.set("density", liquid.density);
    results.set("volumetric_flow", liquid_mass / liquid.density);
    if (liquid.without_volume_mass_fraction > untabulated_volume_mass_fraction) {
      std::string names;
      for (const std::string& name : liquid.without_volume) names += (names.empty() ? "" : ", ") + name;
      warnings.add("unit 'acid_mixer': density: " + number_text(100.0 * liquid.without_volume_mass_fraction, 3) +
                   " % of the liquid's mass is in solutes without a tabulated partial molar volume (" + names +
                   "), counted at the density of water; the density may be off by some tenths of a per cent");
    }
  } else {
    results.set("density", 0.0);  // no liquid left: nothing has a density
    results.set("volumetric_flow", 0.0);
  }
  warn_common(out.temperature, acid_fraction, results, warnings);
}

// The warnings of both models: the hottest point of the mixing path, the material's limit, and the
// standing caution for concentrated acid or caustic.
void AcidMixer::warn_common(double outlet_temperature, double product_acid_fraction, unit::Results& results,
                            unit::Warnings& warnings) const {
  const std::string at = "unit 'acid_mixer': ";
  const unit::Series& path = results.series("mixing_path");
  double peak = nan, peak_fraction = nan;
  for (std::size_t i = 0; i < path.size(); ++i) {
    if (!(path.y(i) <= peak)) {
      peak = path.y(i);
      peak_fraction = path.x(i);
    }
  }
  results.set("path_peak_temperature", peak);
  results.set("path_peak_fraction", peak_fraction);
  // Hotter on the way than at the end: the acid-rich zone, where most of the heat is released.
  if (path.size() > 0 && peak > outlet_temperature + 0.5) {
    warnings.add(at + "the hottest point of the mixing path, acid into water, is " + celsius_text(peak) + " with " +
                 number_text(100.0 * peak_fraction, 3) + " % of the acid side added, hotter than the outlet's " +
                 celsius_text(outlet_temperature) + ": add the acid slowly, with stirring and cooling");
  }
  const double hottest = std::isnan(peak) ? outlet_temperature : std::max(peak, outlet_temperature);
  if (material_limit_ && hottest > *material_limit_) {
    warnings.add(at + "the material temperature limit " + celsius_text(*material_limit_) + " is exceeded: the mix reaches " +
                 celsius_text(hottest) + (hottest > outlet_temperature ? " on the mixing path" : " at the outlet"));
  }
  bool concentrated = false;
  for (const Inlet& inlet : inlets_) concentrated = concentrated || (inlet.mass > 0.0 && inlet.acid_fraction >= concentrated_fraction);
  if (concentrated) {
    warnings.add(at + "concentrated acid or caustic is mixed (" + number_text(100.0 * product_acid_fraction, 3) +
                 " wt % in the mix): add acid to water, never water to acid; follow local codes and the acid supplier's "
                 "data, and have a qualified engineer review the design");
  }
}

}  // namespace protonflow::units
