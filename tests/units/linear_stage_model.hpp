// A stage model with linear equilibrium, for checking the column numerics against closed forms:
// liquid components 0 (solvent) and 1 (solute); gases 0 (carrier, does not dissolve) and 1 (the
// solute), with y* = m x, x = l_1 / (l_0 + l_1); constant heat capacities and no heat of
// absorption, so a column fed at one temperature stays at it.
#pragma once

#include <stage_model.hpp>

namespace protonflow::scrubber::testing {

class LinearStageModel final : public StageModel {
 public:
  explicit LinearStageModel(double slope) : slope_(slope) {}
  std::size_t liquid_count() const override { return 2; }
  std::size_t gas_count() const override { return 2; }
  std::size_t gas_component(std::size_t gas) const override { return gas == 1 ? 1 : no_component; }
  void evaluate(std::size_t, double temperature, double pressure, std::span<const double> liquid,
                StageEquilibrium& out) override {
    const double total = liquid[0] + liquid[1];
    out.partial_pressure[0] = 0.0;
    out.partial_pressure[1] = slope_ * pressure * liquid[1] / total;
    out.liquid_enthalpy = liquid_heat_capacity * (temperature - 298.15) * total;
  }
  double gas_enthalpy(std::size_t, double temperature) const override { return gas_heat_capacity * (temperature - 298.15); }
  double minimum_temperature() const override { return 250.0; }
  double maximum_temperature() const override { return 400.0; }

  // Any constant values serve: the test model has no heat of absorption (J/(mol K)).
  static constexpr double liquid_heat_capacity = 75.0;
  static constexpr double gas_heat_capacity = 30.0;

 private:
  double slope_;
};

}  // namespace protonflow::scrubber::testing
