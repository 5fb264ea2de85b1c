// acid_mixer: any number of streams mixed into one, adiabatically (the outlet temperature is the
// answer) or held at a temperature (the duty is). Concentrated acid or caustic and water — H2SO4,
// HCl, HNO3 or NaOH with water alone — go through the full-range binary models of thermo
// (concentrated_binary.hpp); every other mixture, dilute acids, salts, carbonates and solids,
// through the ionic equilibrium engine. Equations, warnings and limits: docs/units.md, "acid_mixer".
//
//   H_k  = enthalpy of inlet k at its own T and P (binary model, or the engine's equilibrium)
//   P    = the lowest pressure of the inlets with flow − ΔP
//   adiabatic:         H_out = Σ_k H_k;            held_temperature: T_out given, duty = H_out − Σ_k H_k
//   mixing path:       T(φ) of all water-side inlets plus a fraction φ of the acid-side ones, adiabatic
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
#include <optional>
#include <span>
#include <vector>

#include "binary_stream.hpp"

namespace protonflow::units {

class AcidMixer {
 public:
  static constexpr std::uint32_t all_phases = PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID;
  static constexpr const char* type = "acid_mixer";
  static constexpr const char* summary =
      "Mixes any number of streams, concentrated acids and caustic included, adiabatically or at a held temperature";
  static constexpr std::array ports{
      unit::inlet_list("feed", all_phases, 1, PFU_UNBOUNDED_STREAMS,
                       "the streams to mix, as a list: acids, water, salt or caustic solutions, slurries"),
      unit::outlet("product", all_phases, "the mix at equilibrium; vapour it flashes in the gas row")};
  static constexpr std::array<const char*, 2> modes{"adiabatic", "held_temperature"};
  static constexpr std::array parameters{
      unit::choice("mode", modes, "adiabatic",
                   "adiabatic: the outlet temperature is found; held_temperature: give outlet_temperature, get the duty"),
      // 273.15 K and 647.096 K: the ice point and water's critical temperature (IAPWS-95); the
      // models' own ranges narrow this at solve.
      unit::number("outlet_temperature", "K", 298.15, 273.15, 647.096, "outlet temperature held (mode held_temperature)"),
      unit::number("pressure_drop", "Pa", 0.0, 0.0, unit::unbounded, "pressure lost from the lowest inlet pressure"),
      unit::number("material_temperature_limit", "K", 373.15, 273.15, 1273.15,
                   "highest temperature the vessel's material may see; warned of only when given"),
      unit::number("path_points", "1", 21.0, 2.0, 1001.0, "points of the mixing path series, a whole number"),
      activity_model_parameter, precipitate_form_parameter};
  static constexpr std::array results{
      unit::result("duty", "W", "heat added, H_out - sum of the inlets' H (negative: removed); 0 when adiabatic"),
      unit::result("outlet_temperature", "K", "product temperature"),
      unit::result("outlet_ph", "1", "pH of the product, -log10 a(H+); NaN where no model gives one (a warning says why)"),
      unit::result("gas_flow", "mol/s", "gas phase in the product: vapour flashed, gases released"),
      unit::result("solid_flow", "mol/s", "solids in the product at equilibrium"),
      unit::result("heat_released", "W", "heat the mixing releases at 25 C: sum of the inlets' H minus the mix's H, all at 298.15 K"),
      unit::result("mass_flow", "kg/s", "total mass flow of the product"),
      unit::result("solute_mass_fraction", "1", "binary model: acid or caustic mass fraction of the liquid (x100: wt %); else NaN"),
      unit::result("solute_molality", "mol/kg", "binary model: mol acid or caustic per kg water in the liquid; else NaN"),
      unit::result("density", "kg/m3",
                   "liquid density at the outlet: the binary model's, or for mixtures water plus the ions' partial molar volumes"),
      unit::result("volumetric_flow", "m3/s", "liquid volumetric flow at the outlet"),
      unit::result("boiling_temperature", "K", "bubble point of the outlet liquid at the outlet pressure"),
      unit::result("boiling_margin", "K", "boiling_temperature - outlet_temperature (0 when it boils)"),
      unit::result("vapour_flow", "kg/s", "vapour flashed (water and acid), the product's gas row by mass"),
      unit::result("path_peak_temperature", "K", "hottest point of the mixing path, acid into water; NaN without one"),
      unit::result("path_peak_fraction", "1", "fraction of the acid-side inlets added at that point"),
      unit::result("model", "1", "which model answered: 1 the concentrated binary model, 2 the ionic equilibrium engine")};
  static constexpr std::array series{unit::series(
      "mixing_path", "acid_fraction", "1", "temperature", "K", 1001,
      "adiabatic temperature as the acid-side inlets are added to the water-side ones, fraction 0 to 1")};

  AcidMixer(const unit::Parameters& parameters, const unit::Slate& slate);

  std::size_t series_length(std::size_t) const { return path_points_; }

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings& warnings);

 private:
  struct Inlet {
    std::optional<BinaryComposition> binary;  // the inlet as a binary, when it is one
    double enthalpy = 0.0;                    // J/s = W at its own T and P
    double enthalpy_at_25 = 0.0;              // W at 298.15 K (for the heat released)
    double acid_fraction = 0.0;               // kg of H2SO4, HCl and HNO3 (or the binary's solute) per kg
    double mass = 0.0;                        // kg/s
  };

  void solve_binary(thermo::ConcentratedBinary binary, std::span<const unit::InletState> inlets, double pressure,
                    unit::OutletState& product, unit::Results& results, unit::Warnings& warnings);
  void solve_engine(std::span<const unit::InletState> inlets, double pressure, unit::OutletState& product,
                    unit::Results& results, unit::Warnings& warnings);
  void warn_common(double outlet_temperature, double product_acid_fraction, unit::Results& results, unit::Warnings& warnings) const;

  bool held_;
  double outlet_temperature_;          // K, held mode
  double pressure_drop_;               // Pa
  std::optional<double> material_limit_;  // K, when given
  std::size_t path_points_;
  std::unique_ptr<thermo::ChemicalSystem> system_;  // the streams' solvers point at it: it must not move
  BinaryColumns columns_;
  PhasePlacement placement_;
  DryStream dry_;                         // inlets without an aqueous phase
  std::vector<EquilibriumStream> feeds_;  // one per inlet, grown as lists grow
  EquilibriumStream product_;
  EquilibriumStream probe_;               // the mixing path and the 25 C states
  std::vector<Inlet> inlets_;
  InletPhases inlet_phases_;
};

}  // namespace protonflow::units
