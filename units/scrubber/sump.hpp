// The scrubber's sump: a stirred tank under the column. The column's spent liquor, the make-up
// liquor, reagent and fresh water meet in it; the pump draws the recirculation over the column and
// the bleed from it, both of the sump's liquor (docs/units.md, "scrubber", "Sump").
//
//   n_sump = n_bottoms + n_make-up + s n_reagent + w n_water          (component totals, mol/s)
//   m(n_sump) = R + B                                                 (recirculation plus bleed, kg/s)
//   H(n_sump at T_sump) = H_bottoms + H_make-up + s H_reagent + w H_water   (adiabatic)
//
// with the reagent dosed as delivered (s = 1) or to hold a pH setpoint (s from the titration of
// the rest by the reagent at constant outflow: each kg of reagent displaces a kg of fresh water),
// and w, the fresh water, whatever holds the liquor balance. All amounts are on the column's
// liquid components; the sump's liquor, like the column's, holds no solids.
#pragma once

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>
#include <protonflow/units/titration.hpp>

#include <limits>
#include <optional>
#include <span>
#include <stdexcept>
#include <vector>

namespace protonflow::scrubber {

// A liquid into the sump: totals (mol/s per column liquid component) at a temperature (K).
struct SumpInflow {
  std::span<const double> totals;
  double temperature = 298.15;
};

enum class SumpDose {
  as_delivered,  // the reagent inlet as it comes (or none)
  setpoint,      // the reagent flow that holds the sump's pH at the setpoint
  most,          // every kg of fresh water replaced by reagent: the most the flows allow
};

struct SumpMix {
  std::vector<double> totals;   // mol/s per column liquid component, the sump's whole outflow
  double temperature = 0.0;     // K
  double reagent_scale = 0.0;   // the reagent dosed, as a multiple of the reagent inlet's flow
  double reagent_flow = 0.0;    // kg/s
  double fresh_water = 0.0;     // kg/s
  double enthalpy = 0.0;        // W, of the sump's outflow
  bool setpoint_passed = false; // SumpDose::setpoint: the sump is past the setpoint with no reagent, none is dosed
  thermo::Speciation state;     // the sump's liquor at its temperature
  thermo::Speciation make_up_state;  // the make-up as it enters (empty without make-up)
  thermo::Speciation reagent_state;  // the reagent inlet as it enters, at its own flow (empty without)
};

// The pH setpoint is above the most the reagent can give at these flows (with every kg of fresh
// water replaced by reagent): the pH reached there.
class SumpSetpointUnreachable : public std::runtime_error {
 public:
  SumpSetpointUnreachable(const std::string& message, double highest_ph)
      : std::runtime_error(message), highest_ph_(highest_ph) {}
  double highest_ph() const noexcept { return highest_ph_; }

 private:
  double highest_ph_;
};

class Sump {
 public:
  // The column's liquid system (H2O one of its components); it must outlive the sump and stay put.
  explicit Sump(const thermo::ChemicalSystem& liquid_system);

  // The sump's outflow of outflow_mass kg/s from these inflows at pressure (Pa). The setpoint is
  // used with SumpDose::setpoint only; temperature_guess (K) starts the search on the sump's
  // temperature. Throws unit::UnitError when the inflows exceed the outflow (the fresh water would
  // be negative), SumpSetpointUnreachable when the reagent cannot reach the setpoint, thermo errors
  // from the equilibria. A sump past the setpoint with no reagent gets none (setpoint_passed).
  const SumpMix& mix(SumpInflow bottoms, SumpInflow make_up, SumpInflow reagent, double fresh_water_temperature,
                     double outflow_mass, double pressure, SumpDose dose, double setpoint, double temperature_guess);


 private:
  // One inflow's equilibrium and enthalpy, by its own solver so that each starts from its own last
  // state, and kept while the inflow is unchanged (the make-up, the reagent and the fresh water are
  // through the column-and-sump passes of a solve).
  struct InflowEnthalpy {
    explicit InflowEnthalpy(const thermo::ChemicalSystem& system) : solver(system) {}
    thermo::EquilibriumSolver solver;
    std::vector<double> totals;  // of the state kept; empty: none
    double temperature = 0.0;
    double pressure = 0.0;
    double enthalpy = 0.0;       // W
    thermo::Speciation state;    // empty for an inflow of nothing
  };
  // The enthalpy (W) of totals at their equilibrium at T, P, kept in inflow.
  double enthalpy_of(InflowEnthalpy& inflow, std::span<const double> totals, double temperature, double pressure);
  double temperature_at(double enthalpy, double pressure, double guess);

  const thermo::ChemicalSystem* system_;
  std::size_t water_index_;           // index of H2O among the components
  units::Titration titration_;        // the dose search at constant outflow
  thermo::EquilibriumSolver solver_;  // the sump's liquor
  InflowEnthalpy water_;              // a kg/s of fresh water
  InflowEnthalpy bottoms_;            // the column's spent liquor
  InflowEnthalpy make_up_;
  InflowEnthalpy reagent_;
  double heat_capacity_per_mass_ = std::numeric_limits<double>::quiet_NaN();  // J/(K kg) of the liquor, last found
  std::vector<double> feed_;          // bottoms + make-up + the fresh water without reagent
  std::vector<double> water_flow_;    // that fresh water alone
  SumpMix mix_;
  double last_ratio_ = 0.0;           // hint for the next dose search
  double last_slope_ = 0.0;           // d(pH)/d(ratio) at the last dose, where known (0: not known)
};

}  // namespace protonflow::scrubber
