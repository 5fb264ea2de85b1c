// What the column numerics ask of one equilibrium stage's thermodynamics, and nothing more: the
// partial pressures a liquid of given flows would hold over itself, its enthalpy flow, and the
// enthalpy of each gas. The chemistry model (chemistry_stage_model.hpp) answers through the
// equilibrium engine; a linear-equilibrium model answers for tests against the Kremser equation.
// Equations: docs/units.md, "scrubber".
#pragma once

#include <cstddef>
#include <limits>
#include <span>
#include <vector>

namespace protonflow::scrubber {

// The answer for one stage's liquid: sized once by the caller to the model's gas count.
struct StageEquilibrium {
  std::vector<double> partial_pressure;  // Pa, per gas, over the liquid (0 for an inert gas)
  double liquid_enthalpy = 0.0;          // W: J/mol of the liquid state times its flows in mol/s
};

class StageModel {
 public:
  static constexpr std::size_t no_component = std::numeric_limits<std::size_t>::max();

  virtual ~StageModel() = default;
  virtual std::size_t liquid_count() const = 0;  // liquid components, mol/s each
  virtual std::size_t gas_count() const = 0;     // gases, mol/s each
  // The liquid component gas k dissolves as, or no_component for a gas that does not dissolve.
  virtual std::size_t gas_component(std::size_t gas) const = 0;
  // The liquid of flows `liquid` (mol/s per component) on stage `stage` at temperature (K) and
  // pressure (Pa). A model may keep per-stage state (a warm start), so the stage index is given.
  // Throws thermo::ThermoError (or another std::exception) when it has no answer.
  virtual void evaluate(std::size_t stage, double temperature, double pressure, std::span<const double> liquid,
                        StageEquilibrium& out) = 0;
  // Molar enthalpy of gas k, J/mol, ideal gas at temperature (K).
  virtual double gas_enthalpy(std::size_t gas, double temperature) const = 0;
  // Optional, for the column's starting profile: the isothermal equilibrium stage. totals are
  // mol/s per liquid component, each dissolving gas counted in its component; the stage splits
  // them into liquid and gas flows at temperature (K) and pressure (Pa), the pressure the
  // dissolving gases share. A model without it says so by has_flash(); the start then uses
  // absorption-factor sweeps alone.
  virtual bool has_flash() const { return false; }
  virtual void flash(std::size_t /*stage*/, double /*temperature*/, double /*pressure*/, std::span<const double> /*totals*/,
                     std::span<double> /*liquid*/, std::span<double> /*gas*/) {}
  // The temperatures (K) between which the model has an answer.
  virtual double minimum_temperature() const = 0;
  virtual double maximum_temperature() const = 0;
};

}  // namespace protonflow::scrubber
