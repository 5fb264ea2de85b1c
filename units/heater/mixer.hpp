// mixer: two to four streams combined into one at chemical and phase equilibrium, adiabatically or
// with a duty; acid meeting base releases its heat of neutralisation, acid meeting carbonate its
// CO2. Equations and limits: docs/units.md; the enthalpy model: docs/energy.md.
//
//   H_k   = H(equilibrium of inlet k's totals at T_k, P_k), for every inlet that carries flow
//   P_out = the lowest pressure of those inlets − ΔP
//   T_out such that H(equilibrium of Σ_k totals at T_out, P_out) = Σ_k H_k + Q; duty = H_out − Σ_k H_k
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>

#include <array>
#include <memory>
#include <span>
#include <vector>

#include <protonflow/units/equilibrium_stream.hpp>
#include <protonflow/units/phase_placement.hpp>
#include <protonflow/units/product_warnings.hpp>
#include <protonflow/units/stream_chemistry.hpp>

namespace protonflow::units {

class Mixer {
 public:
  static constexpr std::uint32_t all_phases = PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID;
  static constexpr const char* type = "mixer";
  static constexpr const char* summary =
      "Mixes two to four streams to equilibrium, adiabatically or with a duty: heats of reaction and gas evolution included";
  static constexpr std::array ports{
      unit::inlet("feed_1", all_phases, "first stream in, any phases"),
      unit::inlet("feed_2", all_phases, "second stream in, any phases"),
      unit::inlet("feed_3", all_phases, "third stream in, any phases; may stay unconnected", PFU_PORT_OPTIONAL),
      unit::inlet("feed_4", all_phases, "fourth stream in, any phases; may stay unconnected", PFU_PORT_OPTIONAL),
      unit::outlet("product", all_phases, "the mixed stream at equilibrium, phases as they settle")};
  static constexpr std::size_t inlet_count = 4;
  static constexpr std::array parameters{
      unit::number("duty", "W", 0.0, -unit::unbounded, unit::unbounded,
                   "heat added to the mix (negative: removed); 0 for adiabatic mixing"),
      unit::number("pressure_drop", "Pa", 0.0, 0.0, unit::unbounded,
                   "pressure lost from the lowest inlet pressure to the product"),
      activity_model_parameter};
  static constexpr std::array results{
      unit::result("duty", "W", "heat added, H_out - sum of the inlets' H as computed (negative: removed)"),
      unit::result("outlet_temperature", "K", "product temperature"),
      unit::result("outlet_ph", "1", "pH of the product, -log10 a(H^+); NaN for no flow"),
      unit::result("gas_flow", "mol/s", "gas phase in the product at equilibrium, all gases and vapour"),
      unit::result("solid_flow", "mol/s", "solids in the product at equilibrium, all solid phases")};

  Mixer(const unit::Parameters& parameters, const unit::Slate& slate);

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings& warnings);

 private:
  double duty_;           // W
  double pressure_drop_;  // Pa
  std::unique_ptr<thermo::ChemicalSystem> system_;  // the streams' solvers point at it: it must not move
  PhasePlacement placement_;
  std::vector<EquilibriumStream> inlets_;  // one per inlet port, in port order
  EquilibriumStream product_;
  InletPhases inlet_phases_;
};

}  // namespace protonflow::units
