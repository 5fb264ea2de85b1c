// The stage model of the scrubber: each stage's liquid speciated by the equilibrium engine (the
// chosen activity model), the partial pressure of every dissolving gas over it from the same
// mass-action data (Henry's law and water's vapour pressure, thermo/data/gases.yaml), and its
// enthalpy (docs/energy.md). Gases are ideal. docs/units.md, "scrubber", "Stage chemistry".
#pragma once

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <memory>
#include <string>
#include <vector>

#include "stage_model.hpp"

namespace protonflow::scrubber {

// A gas of the column: its data and the liquid component it dissolves as (StageModel::no_component
// for a gas the liquid does not take up).
struct ColumnGas {
  std::string component;  // the formula as the slate writes it: "HCl", "H2O"
  std::size_t liquid_component = StageModel::no_component;
  std::size_t phase_gas = 0;  // its index among the flash system's phase gases
  thermo::PhaseSpecies data;  // formation from the liquid system's basis, log K(T), ΔfH°, Cp
};

class ChemistryStageModel final : public StageModel {
 public:
  // liquid_system: the column's components, no gas phase, no precipitation; it must outlive the
  // model. One equilibrium solver per stage (and one for the liquor feed) warm-starts each stage
  // from its own previous answer.
  // flash_system: the same components with a gas phase, for the starting profile's stage flashes.
  ChemistryStageModel(const thermo::ChemicalSystem& liquid_system, const thermo::ChemicalSystem& flash_system,
                      std::vector<ColumnGas> gases);

  // Sizes the per-stage solvers: stages + 1 slots (the last is the liquor feed).
  void prepare(std::size_t stages);

  std::size_t liquid_count() const override { return system_->components().size(); }
  std::size_t gas_count() const override { return gases_.size(); }
  std::size_t gas_component(std::size_t gas) const override { return gases_[gas].liquid_component; }
  void evaluate(std::size_t stage, double temperature, double pressure, std::span<const double> liquid,
                StageEquilibrium& out) override;
  double gas_enthalpy(std::size_t gas, double temperature) const override;
  bool has_flash() const override { return true; }
  void flash(std::size_t stage, double temperature, double pressure, std::span<const double> totals, std::span<double> liquid,
             std::span<double> gas) override;
  double minimum_temperature() const override { return system_->minimum_temperature(); }
  double maximum_temperature() const override { return system_->maximum_temperature(); }

  // The speciation of a stage's liquid at the last evaluation.
  const thermo::Speciation& state(std::size_t stage) const { return states_[stage]; }
  const std::vector<ColumnGas>& gases() const noexcept { return gases_; }
  const thermo::ChemicalSystem& system() const noexcept { return *system_; }

 private:
  // The amounts with every positive one below 1e-16 of their sum raised to that floor (evaluate()).
  const std::vector<double>& with_traces_at_floor(std::span<const double> amounts);

  const thermo::ChemicalSystem* system_;
  std::vector<ColumnGas> gases_;
  const thermo::ChemicalSystem* flash_system_;
  std::vector<thermo::EquilibriumSolver> solvers_;
  std::vector<thermo::EquilibriumSolver> flash_solvers_;
  thermo::Speciation flash_state_;
  std::vector<thermo::Speciation> states_;
  std::vector<double> ln_total_ratio_;  // per basis species, scratch of evaluate()
  std::vector<double> solve_amounts_;  // the liquid with its traces at their floor, scratch of evaluate()
};

}  // namespace protonflow::scrubber
