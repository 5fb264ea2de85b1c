// The column's unknowns, residual and Jacobian (docs/units.md, "scrubber", "Equations" and
// "Jacobian"). Private to the column solver: column_solver.cpp drives it with KINSOL,
// column_start.cpp gives it its first profile.
//
// Unknowns, block j for stage j (top first): ln l_jc for every liquid component that can be
// present, ln v_jk for every gas that can be present, T_j; the logarithms measured from the
// largest flow allowed (so they stay negative) and T from the data's lowest temperature (so it
// stays positive): KINSOL's sign constraints then keep every step where stages have an answer. Residuals, block j, in the same order:
//   balance of c:     ln(in) − ln(out),  in = l_(j−1)c + v_(j+1)k(c),  out = l_jc + v_jk(c)
//   gas k dissolving: ln v_jk − ln(V_j [(1 − E_k) y_(j+1)k + E_k p*_jk / P])        (Murphree)
//   gas k inert:      ln v_jk − ln v_(j+1)k
//   energy:           (H_L,j−1 + H_V,j+1 − H_L,j − H_V,j) / (F c_scale)
// Block j depends only on blocks j−1, j and j+1: the Jacobian is block-tridiagonal.
#pragma once

#include <sundials/sundials_matrix.h>

#include <cstddef>
#include <string>
#include <vector>

#include "column_solver.hpp"
#include "stage_model.hpp"

namespace protonflow::scrubber::detail {

class ColumnEquations {
 public:
  ColumnEquations(StageModel& model, const ColumnSpecification& specification, const ColumnFeeds& feeds);

  std::size_t stages() const noexcept { return stages_; }
  std::size_t block() const noexcept { return block_; }
  std::size_t size() const noexcept { return stages_ * block_; }
  // KINSOL's constraint for each unknown: −2 (< 0) for a flow, 2 (> 0) for a temperature.
  void constraints(double* c) const;
  // Position of the temperature in a block, and whether an unknown is a temperature.
  std::size_t temperature_slot() const noexcept { return block_ - 1; }

  // Whether a profile can start Newton: as many stages, a positive flow for every unknown, every
  // temperature inside the stage model's range.
  bool can_start_from(const ColumnProfile& profile) const;
  // A profile as unknowns and back (flows of absent components and gases are zero).
  void pack(const ColumnProfile& profile, double* x) const;
  ColumnProfile unpack(const double* x) const;

  // F(x), every stage evaluated afresh (the stage model's states are then those at x). Throws what
  // the stage model throws. Within one Newton step F is one function of x: a point asked again
  // gets the F it got first (see residual() in column_equations.cpp).
  void residual(const double* x, double* f);
  // The banded Jacobian at x by difference quotients that follow the block structure: an
  // unknown of stage j moves only blocks j−1, j and j+1, and only stage j's equilibrium, so each
  // column costs one stage evaluation (none for a gas flow) instead of a whole column's.
  void jacobian(const double* x, SUNMatrix band);

  // The first profile: a cheap pass of this many sweeps (column_start.cpp).
  ColumnProfile start_profile(int sweeps);
  // The same sweeps from a profile of this column at other feeds whose unknowns differ (a
  // component new to the feeds): its flows where it has them, the cold start's where not.
  ColumnProfile start_profile_from(const ColumnProfile& previous, int sweeps);

  // Name of equation `slot` of a block, for error reports.
  std::string equation_name(std::size_t slot) const;

 private:
  void read_stage(const double* x, std::size_t stage);  // x's block into l_, v_, T_
  void initial_profile();  // the cold start's first profile into l_, v_, T_
  ColumnProfile sweep(int sweeps);  // the start's sweeps from l_, v_, T_
  void evaluate_stage(std::size_t stage, StageEquilibrium& out);
  void residual_block(std::size_t stage, const StageEquilibrium& above, const StageEquilibrium& here, double* f) const;
  double gas_enthalpy_flow(const double* gas, double temperature) const;
  const StageEquilibrium& above(std::size_t stage) const { return stage == 0 ? feed_liquid_ : equilibrium_[stage - 1]; }

  StageModel& model_;
  std::size_t stages_;
  std::size_t liquid_count_;
  std::size_t gas_count_;
  double pressure_;
  std::vector<double> efficiency_;
  ColumnFeeds feeds_;
  std::vector<std::size_t> liquid_unknowns_;  // components that are unknowns, in block order
  std::vector<std::size_t> gas_unknowns_;     // gases that are unknowns, after them
  std::vector<std::size_t> component_gas_;    // per component: the gas that dissolves as it, or no_component
  std::size_t block_;
  double flow_scale_;    // mol/s, both feeds together
  double energy_scale_;  // W per unit energy residual
  double log_flow_limit_;     // ln of the largest flow allowed, mol/s
  double temperature_floor_;  // K, the stage model's lowest temperature
  // Working profile (all components and gases, zero where absent), and each stage's equilibrium.
  std::vector<double> l_, v_, t_;
  std::vector<StageEquilibrium> equilibrium_;
  StageEquilibrium feed_liquid_;  // the liquor feed at its own temperature
  StageEquilibrium trial_;
  std::vector<double> f_base_, f_trial_;
  std::vector<double> x_evaluated_, moved_;  // the point of the last residual; the Jacobian's moved unknowns
  bool evaluated_ = false;                   // f_base_ and equilibrium_ hold F(x_evaluated_)
  // The points asked for since the last Jacobian and the F each got, each point's unknowns then its F.
  std::vector<double> remembered_;
};

}  // namespace protonflow::scrubber::detail
