// Enthalpy of an equilibrium state, and the temperature of a state of given enthalpy (the adiabatic
// problem every unit needs). Model and its limits: docs/energy.md.
#pragma once

#include <limits>
#include <span>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"

namespace protonflow::thermo {

// The hook for a concentrated-solution model (the acid mixer's): the enthalpy a state has beyond
// the dilute-solution sum of standard-state species enthalpies, J.
class ExcessEnthalpyModel {
 public:
  virtual ~ExcessEnthalpyModel() = default;
  virtual double excess_enthalpy(const ChemicalSystem& system, const Speciation& state) const = 0;
};

// H of the whole state, J, on the NBS convention (elements in their reference states have H = 0 at
// 298.15 K): liquid water, every solute, every precipitated solid and the gas phase, each at the
// state's temperature. Throws ThermoError(bad_data) naming a present species with no enthalpy data.
double state_enthalpy(const ChemicalSystem& system, const Speciation& state, const ExcessEnthalpyModel* excess = nullptr);

// Where the search for a temperature starts: a temperature near the answer (K; NaN for none) and,
// where known, the heat capacity of the state (J/K; NaN for none), which sizes the first step.
struct TemperatureEstimate {
  double temperature = std::numeric_limits<double>::quiet_NaN();
  double heat_capacity = std::numeric_limits<double>::quiet_NaN();
};

// Finds the temperature at which the equilibrium state of these amounts has the given enthalpy (J)
// at pressure (Pa), solving speciation at every trial temperature (TOMS 748 on T, each solve warm
// started). With an estimate the root is bracketed from there, the step growing until H − target
// changes sign; without one, or where that search meets the end of the data's range or a state that
// does not solve, the bracket is the whole range. Either way T is bracketed to 1e-9 K. Throws
// ThermoError(out_of_range) when the enthalpy lies outside the data's temperature range,
// ConvergenceError when a speciation fails. Returns the heat capacity of the state (J/K) as the
// slope of H across the first bracket, for the estimate of a next search nearby (NaN where the
// estimate hit the target exactly).
double solve_at_enthalpy(EquilibriumSolver& solver, double enthalpy, double pressure, std::span<const double> amounts,
                       std::span<const double> open_gas_pressures, Speciation& out,
                       const ExcessEnthalpyModel* excess = nullptr, TemperatureEstimate estimate = {});

}  // namespace protonflow::thermo
