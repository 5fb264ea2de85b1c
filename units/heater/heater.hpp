// heater: one stream heated or cooled, to a set temperature or by a set duty, with the energy
// balance taken through the equilibrium engine. Equations, phase bookkeeping and limits:
// docs/units.md; the enthalpy model: docs/energy.md.
//
//   H_in  = H(equilibrium of the feed's totals at T_in, P_in)
//   to_temperature: H_out = H(equilibrium at T_set, P_in − ΔP); duty = H_out − H_in
//   by_duty:        T_out such that H(equilibrium at T_out, P_in − ΔP) = H_in + Q; duty = H_out − H_in
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>

#include <array>
#include <memory>
#include <span>

#include <protonflow/units/dry_stream.hpp>
#include <protonflow/units/equilibrium_stream.hpp>
#include <protonflow/units/phase_placement.hpp>
#include <protonflow/units/product_warnings.hpp>
#include <protonflow/units/stream_chemistry.hpp>

namespace protonflow::units {

class Heater {
 public:
  static constexpr std::uint32_t all_phases = PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID;
  static constexpr const char* type = "heater";
  static constexpr const char* summary =
      "Heats or cools a stream to a set temperature or by a set duty, energy balance through equilibrium enthalpies";
  static constexpr std::array ports{unit::inlet("feed", all_phases, "stream in, any phases"),
                                    unit::outlet("product", all_phases, "stream out at equilibrium, phases as they settle")};
  static constexpr std::array<const char*, 2> modes{"to_temperature", "by_duty"};
  static constexpr std::array parameters{
      unit::choice("mode", modes, "to_temperature",
                   "to_temperature: give outlet_temperature, get the duty; by_duty: give duty, get the outlet temperature"),
      // 273.15 K and 647.096 K: the ice point and water's critical temperature (IAPWS-95); the
      // species data narrow this further, checked at solve.
      unit::number("outlet_temperature", "K", 298.15, 273.15, 647.096,
                    "product temperature; must be given with mode to_temperature, not used otherwise"),
      unit::number("duty", "W", 0.0, -unit::unbounded, unit::unbounded,
                   "heat added (negative: removed); used with mode by_duty only"),
      unit::number("pressure_drop", "Pa", 0.0, 0.0, unit::unbounded, "pressure lost from feed to product"),
      activity_model_parameter, precipitate_form_parameter};
  static constexpr std::array results{
      unit::result("duty", "W", "heat added, H_out - H_in as computed (negative: removed)"),
      unit::result("outlet_temperature", "K", "product temperature"),
      unit::result("outlet_ph", "1", "pH of the product, -log10 a(H^+); NaN for no flow"),
      unit::result("inlet_ph", "1", "pH of the feed at its own equilibrium; NaN for no flow"),
      unit::result("gas_flow", "mol/s", "gas phase in the product at equilibrium, all gases and vapour"),
      unit::result("solid_flow", "mol/s", "solids in the product at equilibrium, all solid phases")};

  Heater(const unit::Parameters& parameters, const unit::Slate& slate);

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings& warnings);

 private:
  void solve_dry(const unit::InletState& feed, double outlet_pressure, unit::OutletState& product, unit::Results& results);

  bool to_temperature_;
  double outlet_temperature_;  // K
  double duty_;                // W
  double pressure_drop_;       // Pa
  std::unique_ptr<thermo::ChemicalSystem> system_;  // the streams' solvers point at it: it must not move
  PhasePlacement placement_;
  DryStream dry_;  // a feed without an aqueous phase: a dry gas, dry solids
  EquilibriumStream feed_;
  EquilibriumStream product_;
  InletPhases feed_phases_;
};

}  // namespace protonflow::units
