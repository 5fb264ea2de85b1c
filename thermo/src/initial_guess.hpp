// A cold start for the equilibrium solver: ideal-solution sweeps over the basis species.
#pragma once

#include <span>
#include <vector>

namespace protonflow::thermo::detail {

// The ideal-solution problem the guess solves: ln m_i = ln K_i + Σ_b ν_ib x_b for active solutes.
struct GuessProblem {
  std::size_t solute_count = 0;
  std::size_t basis_count = 0;
  std::span<const double> stoichiometry;  // solute × basis, row-major
  std::span<const double> ln_k;           // per solute (0 for basis solutes)
  std::span<const char> swept;            // per basis solute: solve its balance (index < basis_count)
  std::span<const double> basis_total;    // mol per kg of water; index 0 is the proton total (may be < 0)
  std::span<const char> present;          // per solute: counts in the balances
};

// Gauss–Seidel sweeps: each basis species' own balance (the proton balance for H+) is solved in
// its ln molality with the others held, by TOMS 748 (Boost.Math). Every balance is monotone in its
// own variable (d/dx_b Σ ν_ib m_i = Σ ν_ib² m_i > 0), so each 1-D root is bracketed and unique.
// x holds the current guess on entry (any finite values) and the improved guess on return.
void sweep_basis_balances(const GuessProblem& problem, std::span<double> x, int sweeps);

}  // namespace protonflow::thermo::detail
