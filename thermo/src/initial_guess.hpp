// A cold start for the equilibrium solver: the ideal-solution problem solved as a convex minimisation.
#pragma once

#include <span>
#include <vector>

namespace protonflow::thermo::detail {

// The ideal-solution problem the guess solves: ln m_i = ln K_i + Σ_b ν_ib x_b for present solutes.
struct GuessProblem {
  std::size_t solute_count = 0;
  std::size_t basis_count = 0;
  std::span<const double> stoichiometry;  // solute × basis, row-major
  std::span<const double> ln_k;           // per solute (0 for basis solutes)
  std::span<const char> swept;            // per basis solute: a variable of the guess (index < basis_count)
  std::span<const double> basis_total;    // mol per kg of water; index 0 is the proton total (may be < 0)
  std::span<const char> present;          // per solute: counts in the balances
};

// The balances Σ_i ν_ib m_i(x) = t_b are the gradient of the convex function
// G(x) = Σ_i m_i(x) − Σ_b t_b x_b, whose Hessian Σ_i ν_i ν_iᵀ m_i is positive semi-definite (the dual
// of the ideal Gibbs-energy minimisation; Smith & Missen 1982). Newton on G with an Armijo
// backtracking line search on G itself converges from any start where a minimum exists. x holds the
// start on entry (any finite values for swept species) and the minimiser on return: the first point
// where every balance's residual |Σ_i ν_ib m_i − t_b| is below tolerance · |t_b|, or where Newton's
// predicted decrease falls below G's rounding error.
void minimise_ideal_dual(const GuessProblem& problem, std::span<double> x, int iterations, double tolerance);

}  // namespace protonflow::thermo::detail
