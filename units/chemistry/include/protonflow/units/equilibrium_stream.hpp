// One stream of a unit, taken as its component totals at chemical and phase equilibrium, with the
// enthalpy of that state: a feed at its own T and P, or a product at a set T or a set enthalpy
// (docs/units.md, "Equations"; the enthalpy model: docs/energy.md).
//
// Flows are mol/s, so one second of flow is equilibrated as mol and its enthalpy in J is the power
// in W: speciation is intensive and the enthalpy scales linearly with the amounts.
#pragma once

#include <protonflow/thermo/pitzer_enthalpy.hpp>

#include <limits>
#include <memory>

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace protonflow::units {

class EquilibriumStream {
 public:
  // The system must outlive the stream and stay where it is: the stream's solver points at it.
  EquilibriumStream(std::string_view unit_type, const thermo::ChemicalSystem& system);

  // Totals start at zero; add() adds an inlet's flows of every phase, component by component
  // (summed over rows in row order, then onto what is there).
  void clear();
  void add(const unit::InletState& inlet);
  std::span<const double> totals() const noexcept { return totals_; }
  bool empty() const noexcept;  // every total zero

  // The equilibrium of the totals at temperature (K) and pressure (Pa), and its enthalpy. A thermo
  // error becomes a UnitError (thermo_failure.hpp) saying "WHAT: ..."; out_of_range_status is
  // the status for a temperature outside the species data's range.
  void equilibrate(double temperature, double pressure, const std::string& what, pfu_status out_of_range_status);

  // The equilibrium of the totals at pressure (Pa) whose enthalpy is target (J, so W per second of
  // flow), found on T by thermo::solve_at_enthalpy and polished by secant steps to the round-off of
  // H where H is smooth in T. A target out of the data's range or beyond where the liquor boils
  // away is a UnitError with out_of_range_status; a temperature whose enthalpy misses the target
  // by more than 1e-6 K times the stream's heat capacity is PFU_NOT_CONVERGED.
  void equilibrate_at_enthalpy(double target, double pressure, const std::string& what, pfu_status out_of_range_status);

  // The last equilibrium and its enthalpy (J).
  const thermo::Speciation& state() const noexcept { return state_; }
  double enthalpy() const noexcept { return enthalpy_; }

 private:
  double mismatch_at(double temperature, double pressure, double target);

  std::string unit_type_;
  const thermo::ChemicalSystem* system_;
  thermo::EquilibriumSolver solver_;  // warm-starts from this stream's previous answer
  // Heats of dilution of the activity model, where it has them (Pitzer); null otherwise.
  std::unique_ptr<thermo::ExcessEnthalpyModel> excess_;
  std::vector<double> totals_;        // mol/s per component, all phases
  thermo::Speciation state_;
  double enthalpy_ = 0.0;             // J
  // J/K per mol of totals at the last state found from an enthalpy: sizes the next search's step.
  double heat_capacity_per_amount_ = std::numeric_limits<double>::quiet_NaN();
};

}  // namespace protonflow::units
