// scrubber: a counter-current absorption column of N stages with a Murphree vapour efficiency.
// Gas enters the bottom stage, liquor the top; every stage's liquid is speciated with the chosen
// activity model, every dissolving gas (water included) meets it through the engine's Henry's-law
// and vapour-pressure data, and each stage closes its energy balance, so stage temperatures and the
// gas's humidification come out of the model. All stages are solved together by KINSOL on the
// banded structure (column_solver.hpp). Equations, results and limits: docs/units.md, "scrubber".
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/units/stream_chemistry.hpp>

#include <array>
#include <map>
#include <memory>
#include <span>
#include <vector>

#include "chemistry_stage_model.hpp"
#include "column_chemistry.hpp"
#include "column_solver.hpp"
#include "sump.hpp"

namespace protonflow::scrubber {

class Scrubber {
 public:
  static constexpr const char* type = "scrubber";
  static constexpr std::size_t most_stages = 200;
  static constexpr const char* summary =
      "Counter-current absorption column of N stages: acid and basic gases into water or alkaline liquor, "
      "stage temperatures and humidification from the energy balance";
  static constexpr std::array ports{
      unit::inlet("gas_in", PFU_PHASE_GAS, "gas to clean, into the bottom stage"),
      unit::inlet("liquor_in", PFU_PHASE_AQUEOUS,
                  "scrubbing liquor (water, caustic, soda ash) onto the top stage; with recirculation_rate, the make-up "
                  "into the sump"),
      unit::inlet("reagent_in", PFU_PHASE_AQUEOUS,
                  "with recirculation_rate: reagent solution (NaOH, soda ash) into the sump, dosed to hold sump_ph "
                  "(then only its composition counts) or as it comes",
                  PFU_PORT_OPTIONAL),
      unit::outlet("gas_out", PFU_PHASE_GAS, "cleaned gas, from the top stage"),
      unit::outlet("liquor_out", PFU_PHASE_AQUEOUS, "spent liquor from the bottom stage; with recirculation_rate, the bleed from the sump")};
  // The gases of the trade, as the results and per-gas efficiencies name them, and their formulas.
  static constexpr std::array<const char*, 7> trade_gases{"hcl", "so2", "hf", "cl2", "nh3", "h2s", "co2"};
  static constexpr std::array<const char*, 7> trade_formulas{"HCl", "SO2", "HF", "Cl2", "NH3", "H2S", "CO2"};
  static constexpr std::array<const char*, 7> limit_choices{"none", "hcl", "so2", "hf", "cl2", "nh3", "h2s"};
  static constexpr std::array parameters{
      unit::number("stages", "1", 5.0, 1.0, double(most_stages), "number of stages, a whole number"),
      unit::number("efficiency", "1", 1.0, 0.01, 1.0, "Murphree vapour efficiency of every gas not given its own"),
      unit::number("efficiency_hcl", "1", 1.0, 0.01, 1.0, "Murphree vapour efficiency for HCl; default: efficiency"),
      unit::number("efficiency_so2", "1", 1.0, 0.01, 1.0, "Murphree vapour efficiency for SO2; default: efficiency"),
      unit::number("efficiency_hf", "1", 1.0, 0.01, 1.0, "Murphree vapour efficiency for HF; default: efficiency"),
      unit::number("efficiency_cl2", "1", 1.0, 0.01, 1.0, "Murphree vapour efficiency for Cl2; default: efficiency"),
      unit::number("efficiency_nh3", "1", 1.0, 0.01, 1.0, "Murphree vapour efficiency for NH3; default: efficiency"),
      unit::number("efficiency_h2s", "1", 1.0, 0.01, 1.0, "Murphree vapour efficiency for H2S; default: efficiency"),
      unit::number("efficiency_co2", "1", 1.0, 0.01, 1.0, "Murphree vapour efficiency for CO2; default: efficiency"),
      unit::number("efficiency_h2o", "1", 1.0, 0.01, 1.0, "Murphree vapour efficiency for water vapour; default: efficiency"),
      unit::choice("limit_gas", limit_choices, "none", "the gas an emission limit applies to"),
      unit::number("emission_limit", "kg/m^3", 0.0, 0.0, unit::unbounded,
                   "emission limit for limit_gas, per normal cubic metre (0 degC, 101.325 kPa) of dry gas"),
      unit::number("reference_oxygen", "1", 0.0, 0.0, 0.2,
                   "O2 volume fraction of dry gas the outlet concentrations are corrected to; default: no correction"),
      unit::number("recirculation_rate", "kg/s", 0.0, 0.0, unit::unbounded,
                   "liquor pumped from the sump over the column; 0: no sump, the liquor passes once"),
      unit::number("bleed_rate", "kg/s", 0.0, 0.0, unit::unbounded,
                   "liquor bled from the sump (with recirculation_rate; or give bleed_fraction)"),
      unit::number("bleed_fraction", "1", 0.0, 0.0, 0.99,
                   "the sump's outflow that is bled rather than recirculated (with recirculation_rate; or give bleed_rate)"),
      unit::number("sump_ph", "1", 7.0, 0.0, 14.0,
                   "pH the reagent dose holds in the sump; default: the reagent as it comes"),
      unit::number("fresh_water_temperature", "K", 293.15, 273.15, 373.15,
                   "temperature of the fresh water the sump takes to hold its liquor balance"),
      units::activity_model_parameter};
  static constexpr std::array results{
      unit::result("gas_outlet_temperature", "K", "temperature of the cleaned gas (top stage)"),
      unit::result("liquor_outlet_temperature", "K", "temperature of the spent liquor (bottom stage)"),
      unit::result("liquor_outlet_ph", "1", "pH of the spent liquor, -log10 a(H+)"),
      unit::result("outlet_hcl_ppmv", "1e-6", "HCl in the cleaned gas, mole fraction of the wet gas; NaN if not on the slate"),
      unit::result("outlet_so2_ppmv", "1e-6", "SO2 in the cleaned gas, mole fraction of the wet gas; NaN if not on the slate"),
      unit::result("outlet_hf_ppmv", "1e-6", "HF in the cleaned gas, mole fraction of the wet gas; NaN if not on the slate"),
      unit::result("outlet_cl2_ppmv", "1e-6", "Cl2 in the cleaned gas, mole fraction of the wet gas; NaN if not on the slate"),
      unit::result("outlet_nh3_ppmv", "1e-6", "NH3 in the cleaned gas, mole fraction of the wet gas; NaN if not on the slate"),
      unit::result("outlet_h2s_ppmv", "1e-6", "H2S in the cleaned gas, mole fraction of the wet gas; NaN if not on the slate"),
      unit::result("outlet_co2_ppmv", "1e-6", "CO2 in the cleaned gas, mole fraction of the wet gas; NaN if not on the slate"),
      unit::result("outlet_hcl_concentration", "kg/m^3", "HCl in the cleaned gas per normal cubic metre of dry gas, at reference_oxygen if given"),
      unit::result("outlet_so2_concentration", "kg/m^3", "SO2 in the cleaned gas per normal cubic metre of dry gas, at reference_oxygen if given"),
      unit::result("outlet_hf_concentration", "kg/m^3", "HF in the cleaned gas per normal cubic metre of dry gas, at reference_oxygen if given"),
      unit::result("outlet_cl2_concentration", "kg/m^3", "Cl2 in the cleaned gas per normal cubic metre of dry gas, at reference_oxygen if given"),
      unit::result("outlet_nh3_concentration", "kg/m^3", "NH3 in the cleaned gas per normal cubic metre of dry gas, at reference_oxygen if given"),
      unit::result("outlet_h2s_concentration", "kg/m^3", "H2S in the cleaned gas per normal cubic metre of dry gas, at reference_oxygen if given"),
      unit::result("outlet_co2_concentration", "kg/m^3", "CO2 in the cleaned gas per normal cubic metre of dry gas, at reference_oxygen if given"),
      unit::result("removal_hcl", "1", "fraction of the HCl fed in the gas that the column removes"),
      unit::result("removal_so2", "1", "fraction of the SO2 fed in the gas that the column removes"),
      unit::result("removal_hf", "1", "fraction of the HF fed in the gas that the column removes"),
      unit::result("removal_cl2", "1", "fraction of the Cl2 fed in the gas that the column removes"),
      unit::result("removal_nh3", "1", "fraction of the NH3 fed in the gas that the column removes"),
      unit::result("removal_h2s", "1", "fraction of the H2S fed in the gas that the column removes"),
      unit::result("removal_co2", "1", "fraction of the CO2 fed in the gas that the column removes (negative: released)"),
      unit::result("stages_for_limit", "1", "fewest stages that meet emission_limit at these flows (NaN: no limit, or not within 100)"),
      unit::result("reagent_consumed", "mol/s", "protons the absorbed gases hand to the liquor's base, all gases (with recirculation_rate: the bleed against make-up and reagent)"),
      unit::result("reagent_to_co2", "mol/s", "the part of reagent_consumed taken by CO2 pickup (negative: carbonate gives CO2 up)"),
      unit::result("water_evaporated", "mol/s", "water vapour gained by the gas (negative: condensed)"),
      unit::result("newton_iterations", "1", "Newton iterations of the column solve"),
      unit::result("reagent_share_to_co2", "1", "reagent_to_co2 as a fraction of reagent_consumed (NaN when none is consumed)"),
      unit::result("sump_ph", "1", "pH of the sump's liquor at its temperature (NaN without recirculation)"),
      unit::result("sump_temperature", "K", "temperature of the sump's liquor (NaN without recirculation)"),
      unit::result("reagent_flow", "kg/s", "reagent dosed into the sump (NaN without recirculation)"),
      unit::result("fresh_water", "kg/s", "fresh water the sump takes to hold its liquor balance (NaN without recirculation)"),
      unit::result("bleed_flow", "kg/s", "liquor bled from the sump (NaN without recirculation)"),
      unit::result("sump_dissolved_solids", "1", "kg of everything but water per kg of the sump's liquor (NaN without recirculation)"),
      unit::result("sump_iterations", "1", "passes of column and sump to the steady recirculation (NaN without recirculation)"),
      unit::result("sump_residual", "1", "largest relative change of the recirculated liquor in the last pass (NaN without recirculation)")};

  // Stage profiles, top stage first (x: the stage number, 1 at the top). A gas not on the slate
  // leaves its two series empty.
  static constexpr std::array series{
      unit::series("stage_temperature", "stage", "1", "temperature", "K", most_stages, "temperature of each stage"),
      unit::series("stage_ph", "stage", "1", "pH", "1", most_stages, "pH of the liquor leaving each stage"),
      unit::series("stage_gas_h2o", "stage", "1", "mole_fraction", "1", most_stages, "water vapour in the gas leaving each stage"),
      unit::series("stage_gas_hcl", "stage", "1", "mole_fraction", "1", most_stages, "HCl in the gas leaving each stage"),
      unit::series("stage_gas_so2", "stage", "1", "mole_fraction", "1", most_stages, "SO2 in the gas leaving each stage"),
      unit::series("stage_gas_hf", "stage", "1", "mole_fraction", "1", most_stages, "HF in the gas leaving each stage"),
      unit::series("stage_gas_cl2", "stage", "1", "mole_fraction", "1", most_stages, "Cl2 in the gas leaving each stage"),
      unit::series("stage_gas_nh3", "stage", "1", "mole_fraction", "1", most_stages, "NH3 in the gas leaving each stage"),
      unit::series("stage_gas_h2s", "stage", "1", "mole_fraction", "1", most_stages, "H2S in the gas leaving each stage"),
      unit::series("stage_gas_co2", "stage", "1", "mole_fraction", "1", most_stages, "CO2 in the gas leaving each stage"),
      unit::series("stage_liquid_hcl", "stage", "1", "molality", "mol/kg", most_stages, "HCl absorbed in the liquor leaving each stage, all its species, per kg water"),
      unit::series("stage_liquid_so2", "stage", "1", "molality", "mol/kg", most_stages, "SO2 absorbed in the liquor leaving each stage, all its species, per kg water"),
      unit::series("stage_liquid_hf", "stage", "1", "molality", "mol/kg", most_stages, "HF absorbed in the liquor leaving each stage, all its species, per kg water"),
      unit::series("stage_liquid_cl2", "stage", "1", "molality", "mol/kg", most_stages, "Cl2 absorbed in the liquor leaving each stage, all its species, per kg water"),
      unit::series("stage_liquid_nh3", "stage", "1", "molality", "mol/kg", most_stages, "NH3 absorbed in the liquor leaving each stage, all its species, per kg water"),
      unit::series("stage_liquid_h2s", "stage", "1", "molality", "mol/kg", most_stages, "H2S absorbed in the liquor leaving each stage, all its species, per kg water"),
      unit::series("stage_liquid_co2", "stage", "1", "molality", "mol/kg", most_stages, "CO2 absorbed in the liquor leaving each stage, all its species, per kg water")};
  std::size_t series_length(std::size_t) const { return stages_; }
  // Passes of a recycle before the last need the outlets alone (unit ABI 1.4).
  static constexpr bool outlets_only_passes = true;

  Scrubber(const unit::Parameters& parameters, const unit::Slate& slate);

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings& warnings);

 private:
  // The column of `stages` stages at these feeds: from its own last answer where there is one, else
  // from `nearby` (a column of another stage count at the same feeds) where given, else cold.
  ColumnProfile solve_stages(std::size_t stages, const ColumnSpecification& base, const ColumnFeeds& feeds,
                             const ColumnProfile* nearby = nullptr);
  // kg per normal m³ of dry gas of `gas` leaving stage `stage` (0: the top, the outlet).
  double dry_concentration(const ColumnProfile& profile, std::size_t gas, std::size_t stage = 0) const;
  // The fewest stages, at most most_stages_for_limit, at which the limit gas meets the emission
  // limit at these feeds, given the answer of `stages`-stage column; none if no column does.
  std::size_t fewest_stages_for_limit(const ColumnProfile& solved, const ColumnSpecification& specification,
                                      const ColumnFeeds& feeds);
  // Column and sump to the steady recirculation (docs/units.md, "scrubber", "Sump"): the column's
  // liquor feed, the sump's mix and the bleed (mol/s per liquid component) at the answer.
  struct SumpAnswer {
    ColumnProfile profile;
    SumpMix mix;
    std::vector<double> bleed;
    long iterations = 0;
    double residual = 0.0;
  };
  SumpAnswer solve_with_sump(const ColumnSpecification& specification, ColumnFeeds& feeds, std::span<const double> reagent,
                             double reagent_temperature);

  std::size_t stages_;
  std::vector<double> efficiency_;  // per column gas
  std::size_t limit_gas_;           // column gas the limit applies to, or StageModel::no_component
  double emission_limit_;           // kg/m³
  double reference_oxygen_;         // dry volume fraction, NaN for no correction
  std::size_t oxygen_gas_;          // column gas O2, or StageModel::no_component
  double recirculation_;            // kg/s; 0: no sump
  double bleed_rate_;               // kg/s, or NaN when bleed_fraction is given
  double bleed_fraction_;
  double sump_ph_;                  // NaN: the reagent as it comes
  double fresh_water_temperature_;  // K
  ColumnChemistry chemistry_;       // owns the liquid system the stage model points at: must not move
  std::unique_ptr<ChemistryStageModel> model_;
  std::unique_ptr<Sump> sump_;      // with recirculation only
  std::map<std::size_t, ColumnProfile> previous_profiles_;  // the last answer at each stage count solved
  std::map<std::size_t, ColumnMemory> column_memories_;     // and the last Jacobian's LU factors there
  std::vector<double> last_recirculation_;  // the last steady recirculated liquor (mol/kg per component) and its T (K)
};

}  // namespace protonflow::scrubber
