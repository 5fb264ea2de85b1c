// neutraliser: an acid or alkaline waste dosed with a reagent in a stirred tank, to equilibrium:
// at a fixed reagent flow (the pH is the result) or to a target pH (the reagent flow is the
// result, by TOMS 748 on the titration curve); adiabatic or held at a temperature; solids
// precipitate, gases leave as off-gas. Equations, results and limits: docs/units.md, "neutraliser".
//
//   n(x)  = n_feed + s n_reagent,  s = x m_feed / m_reagent     (x: kg reagent per kg feed)
//   fixed_reagent: s = 1;  target_ph: x such that pH(equilibrium of n(x) at T_out) = pH_set
//   adiabatic:      H(equilibrium of n(x) at T_out) = H_feed + s H_reagent
//   at_temperature: T_out = T_set;  duty = H_out − H_feed − s H_reagent
//   aeration (fe2_oxidised_fraction f > 0): n_feed takes Fe^2+ + 1/4 O2 + H^+ -> Fe^3+ + 1/2 H2O for
//     f of its Fe(II) before all of the above (ferrous_aeration.hpp); the O2 enters at 25 °C, H = 0
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/units/dry_stream.hpp>
#include <protonflow/units/equilibrium_stream.hpp>
#include <protonflow/units/phase_placement.hpp>
#include <protonflow/units/product_warnings.hpp>
#include <protonflow/units/stream_chemistry.hpp>

#include <array>
#include <memory>
#include <span>
#include <vector>

#include "ferrous_aeration.hpp"
#include "liquor_analysis.hpp"
#include <protonflow/units/titration.hpp>

namespace protonflow::units {

class Neutraliser {
 public:
  static constexpr std::uint32_t all_phases = PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID;
  static constexpr const char* type = "neutraliser";
  static constexpr const char* summary =
      "Doses reagents into an acid or alkaline waste to a set flow or a target pH: precipitation, off-gas, heat, "
      "titration gain";
  static constexpr std::array ports{
      unit::inlet("feed", all_phases, "the waste to treat, acid or alkaline, solids allowed"),
      unit::inlet_list("reagents", all_phases, 1, PFU_UNBOUNDED_STREAMS,
                       "one or more reagents as delivered (NaOH or soda ash solution, lime or Mg(OH)2 slurry, ammonia, "
                       "H2SO4, HCl), dosed together in the proportions of their flows; with mode target_ph only those "
                       "proportions and compositions count"),
      unit::outlet("product", PFU_PHASE_AQUEOUS | PFU_PHASE_SOLID, "the treated slurry: liquor and precipitated solids"),
      unit::outlet("off_gas", PFU_PHASE_GAS, "gases released (CO2, H2S, Cl2, NH3, water vapour)")};
  static constexpr std::array<const char*, 2> modes{"fixed_reagent", "target_ph"};
  static constexpr std::array<const char*, 2> energy_modes{"adiabatic", "at_temperature"};
  static constexpr std::array parameters{
      unit::choice("mode", modes, "fixed_reagent",
                   "fixed_reagent: the reagents are dosed as they come, the pH is the result; target_ph: the reagent "
                   "flow that gives target_ph is the result"),
      unit::number("target_ph", "1", 7.0, 0.0, 14.0, "the pH to dose to; used with mode target_ph only"),
      unit::number("max_reagent_ratio", "1", 1.0, 1e-9, 1e6,
                   "kg of reagent per kg of feed: the upper end of the dose search of mode target_ph"),
      unit::choice("energy", energy_modes, "adiabatic",
                   "adiabatic: the outlet temperature is the result; at_temperature: the duty to hold "
                   "outlet_temperature is the result"),
      // 273.15 K and 647.096 K: the ice point and water's critical temperature (IAPWS-95); the
      // species data narrow this further, checked at solve.
      unit::number("outlet_temperature", "K", 298.15, 273.15, 647.096, "the held temperature of energy at_temperature"),
      // Common practice: a settled metal-hydroxide sludge holds about 1-3 % dry solids, a gypsum-rich
      // lime sludge more; the default is a round figure of that range, not a design value.
      unit::number("sludge_dry_solids", "1", 0.02, 1e-4, 1.0,
                   "mass fraction of dry solids in the settled sludge, for the sludge flow"),
      // Common practice (from memory, cf. McMillan, pH Measurement and Control): a reagent valve
      // resolves about 0.5 % of its flow, and a loop holds its pH within a few tenths.
      unit::number("reagent_resolution", "1", 0.005, 1e-6, 0.5,
                   "the smallest step of the reagent flow a valve or pump makes, as a fraction of the flow"),
      unit::number("ph_tolerance", "1", 0.5, 1e-3, 7.0,
                   "how far the outlet pH may wander from the setpoint; sets the staging warning"),
      unit::number("curve_points", "1", 101.0, 2.0, 10001.0, "points of the titration curve, evenly spaced in the ratio"),
      unit::number("curve_ratio_max", "1", 0.0, 0.0, 1e6,
                   "kg of reagent per kg of feed at the curve's end; 0: twice the operating ratio (max_reagent_ratio "
                   "where that is 0)"),
      activity_model_parameter, precipitate_form_parameter,
      unit::number(FerrousAeration::parameter, "1", 0.0, 0.0, 1.0,
                   "share of the feed's Fe(II) oxidised to Fe(III) by aeration before the equilibrium, "
                   "Fe^2+ + 1/4 O2 + H^+ -> Fe^3+ + 1/2 H2O; 0: no aeration; needs an Fe(III) component (Fe(OH)3, FeCl3, "
                   "Fe2(SO4)3) on the slate")};
  static constexpr std::array results{
      unit::result("outlet_ph", "1", "pH of the treated liquor, -log10 a(H+)"),
      unit::result("feed_ph", "1", "pH of the feed at its own equilibrium"),
      unit::result("outlet_temperature", "K", "temperature of the treated slurry"),
      unit::result("duty", "W", "heat added to hold outlet_temperature (negative: removed); 0 when adiabatic"),
      unit::result("reagent_flow", "kg/s", "reagent dosed"),
      unit::result("reagent_ratio", "1", "kg of reagent dosed per kg of feed"),
      unit::result("dose_solves", "1", "equilibrium solves of the dose search (0 with mode fixed_reagent)"),
      unit::result("process_gain", "s/kg", "d(pH)/d(reagent flow) at the operating point"),
      unit::result("buffer_capacity", "mol/kg", "Van Slyke buffer capacity of the liquor, per pH unit, per kg of water"),
      unit::result("off_gas_flow", "mol/s", "gases released, water vapour included"),
      unit::result("dry_solids_flow", "kg/s", "precipitated and undissolved solids in the product"),
      unit::result("sludge_flow", "kg/s", "settled sludge at sludge_dry_solids"),
      unit::result("dissolved_fe", "mg/L", "iron still dissolved at the outlet pH; NaN where the slate has none"),
      unit::result("dissolved_al", "mg/L", "aluminium still dissolved; NaN where the slate has none"),
      unit::result("dissolved_zn", "mg/L", "zinc still dissolved; NaN where the slate has none"),
      unit::result("dissolved_cu", "mg/L", "copper still dissolved; NaN where the slate has none"),
      unit::result("dissolved_ni", "mg/L", "nickel still dissolved; NaN where the slate has none"),
      unit::result("dissolved_ca", "mg/L", "calcium still dissolved; NaN where the slate has none"),
      unit::result("dissolved_mg", "mg/L", "magnesium still dissolved; NaN where the slate has none"),
      unit::result("dissolved_f", "mg/L", "fluoride still dissolved; NaN where the slate has none"),
      unit::result("fe2_oxidised", "mol/s", "Fe(II) oxidised to Fe(III) by aeration (fe2_oxidised_fraction of the feed's)"),
      unit::result("o2_demand", "mol/s", "O2 the aeration consumes: 1/4 mol per mol of Fe(II) oxidised (stoichiometric)"),
      unit::result("o2_demand_mass", "kg/h", "the same O2 by mass"),
      unit::result("air_demand", "mol/s", "air carrying that O2 at 20.9476 mol % (U.S. Standard Atmosphere 1976), "
                                          "all of it consumed: the blower's air is this over the O2 transfer efficiency"),
      unit::result("air_demand_volume", "m3/h", "the same air as normal volume, ideal gas at 0 °C and 101.325 kPa"),
      unit::result("dissolved_cr", "mg/L", "chromium(III) still dissolved; NaN where the slate has none")};
  static constexpr std::array series{
      unit::series("titration", "reagent_ratio", "1", "pH", "1", 10001,
                   "pH of feed and reagent at equilibrium at the outlet temperature, against kg of reagent per kg of feed")};

  std::size_t series_length(std::size_t) const { return curve_points_; }
  // Passes of a recycle before the last need the outlets alone (unit ABI 1.4).
  static constexpr bool outlets_only_passes = true;

  Neutraliser(const unit::Parameters& parameters, const unit::Slate& slate);

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings& warnings);

 private:
  // The dose (kg/kg) and the product state for the mode; leaves the product in product_.
  double dose_to_target(double feed_enthalpy, double reagent_enthalpy, double pressure);
  void settle_product(double ratio, double feed_enthalpy, double reagent_enthalpy, double pressure);
  void warn_about_control(double ratio, double gain, double pressure, unit::Warnings& warnings);
  void fill_curve(double ratio, double pressure, unit::Series& curve);

  bool to_target_;
  double target_ph_;
  double max_ratio_;
  bool adiabatic_;
  double outlet_temperature_;  // K
  double sludge_dry_solids_;
  double reagent_resolution_;
  double ph_tolerance_;
  std::size_t curve_points_;
  double curve_ratio_max_;
  std::unique_ptr<thermo::ChemicalSystem> system_;  // the solvers point at it: it must not move
  PhasePlacement placement_;
  LiquorAnalysis analysis_;
  EquilibriumStream feed_;
  EquilibriumStream reagent_;                  // every reagent together: the titration's
  std::vector<EquilibriumStream> reagent_streams_;  // one per reagent stream, for its enthalpy
  std::vector<bool> reagent_dry_;                   // per reagent stream: no aqueous phase (dry lime, say)
  DryStream dry_;                                   // the enthalpy of a dry reagent, its phases as given
  EquilibriumStream product_;
  Titration titration_;
  InletPhases inlet_phases_;
  FerrousAeration aeration_;
  std::vector<double> aerated_feed_;  // the feed's totals after aeration (a copy without it)
  std::vector<double> flows_;  // scratch: the product's totals as one aqueous row
  double last_ratio_ = 0.0;  // kg/kg: the last dose to target_ph, where the next search starts
};

}  // namespace protonflow::units
