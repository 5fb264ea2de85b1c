#include "neutraliser.hpp"

#include <protonflow/thermo/errors.hpp>
#include <protonflow/units/message_text.hpp>
#include <protonflow/units/thermo_failure.hpp>

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "release_warnings.hpp"

namespace protonflow::units {

namespace {

// The adiabatic dose search alternates a dose at a fixed temperature and the adiabatic temperature
// of that dose; it stops when the temperature moves less than this (K), where the pH moves by less
// than 1e-8 (|d pH/dT| is below 0.03 per K in water, Bandura & Lvov 2006).
constexpr double temperature_settled = 1e-6;
constexpr int max_temperature_rounds = 20;
// The gain is a central difference over this relative step of the ratio: small enough that the
// steepest curve (a strong acid at neutrality) stays near linear, large against the solver's 1e-13.
constexpr double gain_step = 1e-6;

// Aeration: O2 from air enters at 25 °C, where as an element in its standard state its enthalpy is
// zero on the NBS convention the species data use [nbs-1982]; the heat of the oxidation is then the
// difference of the species' formation enthalpies, carried by the product's enthalpy.
constexpr double oxygen_enthalpy = 0.0;  // J/mol
// Air: O2 20.9476 mol % of dry air at sea level [us-standard-atmosphere-1976]. O2 31.998 g/mol
// (IUPAC standard atomic weight of O, 15.999 [iupac-atomic-weights]). Normal volume: the ideal
// gas at 273.15 K and 101325 Pa, R T / P = 0.0224140 m3/mol (R from CODATA 2018).
constexpr double oxygen_in_air = 0.209476;
constexpr double oxygen_molar_mass = 0.031998;  // kg/mol
constexpr double normal_molar_volume = 8.314462618 * 273.15 / 101325.0;  // m3/mol

double nan() { return std::numeric_limits<double>::quiet_NaN(); }

}  // namespace

Neutraliser::Neutraliser(const unit::Parameters& parameters, const unit::Slate& slate)
    : to_target_(parameters.text("mode") == "target_ph"),
      target_ph_(parameters.number("target_ph")),
      max_ratio_(parameters.number("max_reagent_ratio")),
      adiabatic_(parameters.text("energy") == "adiabatic"),
      outlet_temperature_(parameters.number("outlet_temperature")),
      sludge_dry_solids_(parameters.number("sludge_dry_solids")),
      reagent_resolution_(parameters.number("reagent_resolution")),
      ph_tolerance_(parameters.number("ph_tolerance")),
      curve_points_(static_cast<std::size_t>(parameters.number("curve_points"))),
      curve_ratio_max_(parameters.number("curve_ratio_max")),
      system_(make_stream_system(type, slate, parameters.text("activity_model"),
                                      parameters.text("precipitate_form"))),
      placement_(type, *system_, slate),
      analysis_(*system_),
      feed_(type, *system_),
      reagent_(type, *system_),
      dry_(type, *system_, slate),
      product_(type, *system_),
      titration_(*system_),
      inlet_phases_{"inlets", 0.0, std::vector<double>(system_->solids().size(), 0.0)},
      aeration_(type, *system_, parameters.number(FerrousAeration::parameter)),
      aerated_feed_(slate.components.size(), 0.0),
      flows_(slate.components.size(), 0.0) {
  const std::string prefix = "unit 'neutraliser': ";
  if (!to_target_ && parameters.given("target_ph")) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix + "parameter 'target_ph' does not apply with mode fixed_reagent (the pH is the result)");
  }
  if (to_target_ && !parameters.given("target_ph")) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, prefix + "mode target_ph needs parameter 'target_ph'");
  }
  if (adiabatic_ && parameters.given("outlet_temperature")) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix + "parameter 'outlet_temperature' does not apply with energy adiabatic (it is the result)");
  }
}

// The product of a dose: its totals, then its equilibrium at the held temperature or at the
// enthalpy the feed and the dosed reagent bring.
void Neutraliser::settle_product(double ratio, double feed_enthalpy, double reagent_enthalpy, double pressure) {
  const std::span<const double> totals = titration_.totals_at(ratio);
  std::ranges::copy(totals, flows_.begin());
  product_.clear();
  product_.add(unit::InletState{0.0, pressure, flows_.size(), flows_});
  const double scale = titration_.reagent_mass() > 0.0 ? ratio * titration_.feed_mass() / titration_.reagent_mass() : 0.0;
  if (adiabatic_) {
    // thermo::solve_at_enthalpy from the product's last state (the last round, or the last pass of
    // a recycle), its first step sized by the product's last heat capacity (equilibrium_stream.hpp).
    product_.equilibrate_at_enthalpy(feed_enthalpy + scale * reagent_enthalpy, pressure,
                                     "finding the adiabatic outlet temperature at reagent ratio " + number_text(ratio) + " kg/kg",
                                     PFU_BAD_INLET);
  } else {
    product_.equilibrate(outlet_temperature_, pressure,
                         "equilibrating the product at outlet_temperature " + number_text(outlet_temperature_) + " K",
                         PFU_INVALID_PARAMETER);
  }
}

double Neutraliser::dose_to_target(double feed_enthalpy, double reagent_enthalpy, double pressure) {
  double temperature = adiabatic_ ? feed_.state().temperature : outlet_temperature_;
  // The search starts from the last dose found: in a recycle the feed changes little between passes.
  double ratio = last_ratio_;
  for (int round = 0; round < max_temperature_rounds; ++round) {
    try {
      ratio = titration_.find_ratio(target_ph_, temperature, pressure, max_ratio_, type, ratio);
    } catch (const thermo::ThermoError& error) {
      throw_unit_error(error, type, "dosing to target_ph " + number_text(target_ph_, 4) + " at " + celsius_text(temperature),
                       PFU_INVALID_PARAMETER);
    }
    settle_product(ratio, feed_enthalpy, reagent_enthalpy, pressure);
    const double settled = product_.state().temperature;
    if (!adiabatic_ || std::abs(settled - temperature) <= temperature_settled) {
      last_ratio_ = ratio;
      return ratio;
    }
    temperature = settled;
  }
  throw unit::UnitError(PFU_NOT_CONVERGED, "unit 'neutraliser': the dose to target_ph " + number_text(target_ph_, 4) +
                                               " and its adiabatic temperature did not settle in " +
                                               std::to_string(max_temperature_rounds) + " rounds (last " +
                                               number_text(temperature, 10) + " K)");
}

void Neutraliser::solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets,
                        unit::Results& results, unit::Warnings& warnings) {
  constexpr std::size_t feed_port = unit::port_index(ports, "feed");
  constexpr std::size_t reagents_port = unit::port_index(ports, "reagents");
  constexpr std::size_t product_port = unit::port_index(ports, "product");
  constexpr std::size_t off_gas_port = unit::port_index(ports, "off_gas");
  const unit::InletState& feed = unit::on_port(inlets, feed_port)[0];
  const std::span<const unit::InletState> reagents = unit::on_port(inlets, reagents_port);
  unit::OutletState& product = unit::on_port(outlets, product_port)[0];
  unit::OutletState& off_gas = unit::on_port(outlets, off_gas_port)[0];

  feed_.clear();
  feed_.add(feed);
  reagent_.clear();
  double pressure = feed.pressure;
  while (reagent_streams_.size() < reagents.size()) reagent_streams_.emplace_back(type, *system_);
  reagent_dry_.assign(reagents.size(), false);
  for (std::size_t k = 0; k < reagents.size(); ++k) {
    reagent_dry_[k] = DryStream::is_dry(reagents[k]);
    reagent_.add(reagents[k]);
    reagent_streams_[k].clear();
    reagent_streams_[k].add(reagents[k]);
    if (!reagent_streams_[k].empty()) pressure = std::min(pressure, reagents[k].pressure);
  }
  if (feed_.empty()) throw unit::UnitError(PFU_BAD_INLET, "unit 'neutraliser': the feed has no flow: there is nothing to treat");
  if (to_target_ && reagent_.empty()) {
    throw unit::UnitError(PFU_BAD_INLET,
                          "unit 'neutraliser': no reagent has flow; mode target_ph needs their composition to find the dose");
  }
  // Aeration (when asked) oxidises Fe(II) in the feed's totals; the ratio stays per kg of feed as it enters.
  aeration_.apply(feed_.totals(), aerated_feed_);
  titration_.set_streams(aerated_feed_, reagent_.totals(), mass_flow(*system_, feed_.totals()));
  titration_.reset_count();

  feed_.equilibrate(feed.temperature, feed.pressure, "equilibrating the feed at " + number_text(feed.temperature) + " K",
                    PFU_BAD_INLET);
  double reagent_enthalpy = 0.0;
  std::vector<double> dry_reagent_solids(system_->solids().size(), 0.0);
  double dry_gas = 0.0;
  for (std::size_t k = 0; k < reagents.size(); ++k) {
    if (reagent_streams_[k].empty()) continue;
    if (reagent_dry_[k]) {
      // Dry lime or soda ash: no water to equilibrate in, so its phases as given (dry_stream.hpp).
      reagent_enthalpy += dry_.enthalpy(reagents[k], reagents[k].temperature, "reagent " + std::to_string(k + 1) + " (dry)");
      dry_gas += dry_.gas_amount();
      for (std::size_t s = 0; s < dry_reagent_solids.size(); ++s) dry_reagent_solids[s] += dry_.solid_amount()[s];
      continue;
    }
    reagent_streams_[k].equilibrate(reagents[k].temperature, reagents[k].pressure,
                                    "equilibrating reagent " + std::to_string(k + 1) + " at " +
                                        number_text(reagents[k].temperature) + " K",
                                    PFU_BAD_INLET);
    reagent_enthalpy += reagent_streams_[k].enthalpy();
  }
  // The feed with the O2 its aeration takes (oxygen_enthalpy): what enters besides the reagents.
  const double feed_enthalpy = feed_.enthalpy() + aeration_.oxygen() * oxygen_enthalpy;

  double ratio = titration_.inlet_ratio();
  if (to_target_) {
    ratio = dose_to_target(feed_enthalpy, reagent_enthalpy, pressure);
  } else {
    settle_product(ratio, feed_enthalpy, reagent_enthalpy, pressure);
  }
  const long dose_solves = titration_.solves();
  const thermo::Speciation& out = product_.state();
  const double scale = titration_.reagent_mass() > 0.0 ? ratio * titration_.feed_mass() / titration_.reagent_mass() : 0.0;
  const double inlet_enthalpy = feed_enthalpy + scale * reagent_enthalpy;
  const double product_enthalpy = product_.enthalpy();

  // Outlets: the equilibrium's phases on the slate, then the gas row moved to the off-gas.
  product.temperature = out.temperature;
  product.pressure = pressure;
  placement_.write(product_.totals(), out, product, warnings);
  off_gas.temperature = out.temperature;
  off_gas.pressure = pressure;
  std::ranges::fill(off_gas.flows, 0.0);
  const std::span<double> gas_row = product.phase(PFU_GAS_ROW);
  std::ranges::copy(gas_row, off_gas.phase(PFU_GAS_ROW).begin());
  std::ranges::fill(gas_row, 0.0);
  // A recycle's pass before the last reads the outlets alone (unit ABI 1.4): the gain, the curve,
  // the warnings and the results are for the reporting pass.
  if (results.outlets_only()) return;

  // Gain d(pH)/d(reagent flow) at the operating point, at the outlet temperature.
  double gain = nan();
  if (titration_.reagent_mass() > 0.0) {
    try {
      const double step = ratio > 0.0 ? gain_step * ratio : gain_step * max_ratio_;
      const double low = std::max(0.0, ratio - step);
      const double high = ratio + step;
      const double ph_low = titration_.ph_at(low, out.temperature, pressure);
      const double ph_high = titration_.ph_at(high, out.temperature, pressure);
      gain = (ph_high - ph_low) / ((high - low) * titration_.feed_mass());
    } catch (const thermo::ThermoError& error) {
      throw_unit_error(error, type, "finding the process gain at reagent ratio " + number_text(ratio) + " kg/kg",
                       PFU_NOT_CONVERGED);
    }
  }

  // Warnings: the shared ones about the product and the models, then the neutraliser's own.
  inlet_phases_.gas_amount = scale * dry_gas;
  for (std::size_t s = 0; s < dry_reagent_solids.size(); ++s) inlet_phases_.solid_amount[s] = scale * dry_reagent_solids[s];
  for (std::size_t k = 0; k <= reagents.size(); ++k) {
    const EquilibriumStream& inlet = k == 0 ? feed_ : reagent_streams_[k - 1];
    if (inlet.empty() || (k > 0 && reagent_dry_[k - 1])) continue;
    const double share = k == 0 ? 1.0 : scale;
    const thermo::Speciation& in = inlet.state();
    if (in.gas_phase_present) inlet_phases_.gas_amount += share * in.gas_phase_amount;
    for (std::size_t s = 0; s < in.solid_amount.size(); ++s) inlet_phases_.solid_amount[s] += share * in.solid_amount[s];
  }
  warn_about_product(type, "a sludge to settle and remove; scaling of pH probes, mixers and lines", *system_, out,
                     inlet_phases_, warnings);
  warn_about_release(type, *system_, out, warnings);
  warn_about_model(type, "feed", feed_.state(), warnings);
  for (std::size_t k = 0; k < reagents.size(); ++k) {
    if (!reagent_streams_[k].empty() && !reagent_dry_[k]) {
      warn_about_model(type, "reagent " + std::to_string(k + 1), reagent_streams_[k].state(), warnings);
    }
  }
  warn_about_model(type, "product", out, warnings);
  if (std::isfinite(gain)) warn_about_control(ratio, gain, pressure, warnings);

  fill_curve(ratio, pressure, results.series("titration"));

  const double dry_solids = analysis_.solids_mass(out);
  results.set("outlet_ph", out.ph);
  results.set("feed_ph", feed_.state().ph);
  results.set("outlet_temperature", out.temperature);
  results.set("duty", adiabatic_ ? 0.0 : product_enthalpy - inlet_enthalpy);
  results.set("reagent_flow", ratio * titration_.feed_mass());
  results.set("reagent_ratio", ratio);
  results.set("dose_solves", to_target_ ? static_cast<double>(dose_solves) : 0.0);
  results.set("process_gain", gain);
  results.set("buffer_capacity", analysis_.buffer_capacity(out));
  results.set("off_gas_flow", out.gas_phase_present ? out.gas_phase_amount : 0.0);
  results.set("dry_solids_flow", dry_solids);
  results.set("sludge_flow", dry_solids / sludge_dry_solids_);
  static constexpr std::array<const char*, reported_elements.size()> dissolved{
      "dissolved_fe", "dissolved_al", "dissolved_zn", "dissolved_cu", "dissolved_ni", "dissolved_ca", "dissolved_mg", "dissolved_f",
      "dissolved_cr"};
  for (std::size_t e = 0; e < reported_elements.size(); ++e) {
    results.set(dissolved[e], analysis_.dissolved_mg_per_litre(e, out).value_or(nan()));
  }
  const double oxygen = aeration_.oxygen();
  results.set("fe2_oxidised", aeration_.oxidised());
  results.set("o2_demand", oxygen);
  results.set("o2_demand_mass", oxygen * oxygen_molar_mass * 3600.0);
  results.set("air_demand", oxygen / oxygen_in_air);
  results.set("air_demand_volume", oxygen / oxygen_in_air * normal_molar_volume * 3600.0);
}

// The titration curve at the outlet temperature, from no reagent to curve_ratio_max (or twice the
// dose), each point warm-started from the one before. A host that asked for no points gets none.
void Neutraliser::fill_curve(double ratio, double pressure, unit::Series& curve) {
  const std::size_t points = std::min(curve.capacity(), curve_points_);
  if (points == 0) return;
  const double end = curve_ratio_max_ > 0.0 ? curve_ratio_max_ : ratio > 0.0 ? 2.0 * ratio : max_ratio_;
  const double temperature = product_.state().temperature;
  for (std::size_t i = 0; i < points; ++i) {
    const double x = end * static_cast<double>(i) / static_cast<double>(points - 1);
    try {
      curve.add(x, titration_.ph_at(x, temperature, pressure));
    } catch (const thermo::ThermoError& error) {
      throw_unit_error(error, type, "the titration curve at reagent ratio " + number_text(x) + " kg/kg", PFU_NOT_CONVERGED);
    }
  }
}

// One valve step of the reagent moves the pH by |gain| × resolution × flow. Where that passes the
// tolerance, upstream stages must take the bulk of the dose so that the last stage trims a small
// part of it: each stage takes the remaining dose down tenfold (common practice, from memory, cf.
// McMillan, pH Measurement and Control), so a trim fraction f needs 1 + ceil(log10(1/f)) stages.
void Neutraliser::warn_about_control(double ratio, double gain, double pressure, unit::Warnings& warnings) {
  const double flow = ratio * titration_.feed_mass();
  const double step = std::abs(gain) * reagent_resolution_ * flow;
  if (!(flow > 0.0) || !(step > ph_tolerance_)) return;
  const double trim = ph_tolerance_ / step;
  const int stages = 1 + static_cast<int>(std::ceil(std::log10(1.0 / trim)));
  const double temperature = product_.state().temperature;
  std::string plan;
  try {
    for (int k = 1; k < stages; ++k) {
      const double share = 1.0 - std::pow(10.0, -k);
      plan += "stage " + std::to_string(k) + " doses " + number_text(100.0 * share, 4) + " % of the reagent, to pH " +
              number_text(titration_.ph_at(share * ratio, temperature, pressure), 3) + "; ";
    }
  } catch (const thermo::ThermoError&) {
    plan += "(the intermediate pH values could not be computed); ";
  }
  std::string text = "unit 'neutraliser': the titration curve is too steep at pH " + number_text(product_.state().ph, 3) +
                     " for one stage: d(pH)/d(reagent flow) = " + number_text(gain, 3) + " s/kg, so one step of the reagent (" +
                     number_text(100.0 * reagent_resolution_, 3) + " % of " + number_text(flow, 4) +
                     " kg/s) moves the pH by " + number_text(step, 3) + ", beyond ph_tolerance " + number_text(ph_tolerance_, 3) +
                     ". " + std::to_string(stages) + " stages in series would serve: " + plan + "the last trims to the setpoint";
  if (stages > 3) {
    text += "; more than three stages is seldom practical: consider a buffering reagent (Mg(OH)2, soda ash, lime) or a "
            "wider tolerance";
  }
  warnings.add(text);
}

}  // namespace protonflow::units
