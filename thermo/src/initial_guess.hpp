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

// The minimisation's work arrays, kept by the solver and reused by every pass and every solve: after
// the first solve of a system nothing is allocated (capacity is only ever added).
struct DualWorkspace {
  struct Entry {
    std::size_t variable;  // index into `variables`
    double coefficient;
  };
  std::vector<std::size_t> variables;       // the basis species that are variables of the guess
  std::vector<std::size_t> variable_index;  // per basis species: its index in `variables`, or none
  std::vector<double> value, total;    // per variable: x_b and t_b
  struct FixedTerm {
    std::size_t basis;
    double coefficient;
  };
  std::vector<std::size_t> solutes;    // the present solutes, in order: solute j of the arrays below
  std::vector<Entry> entries;          // the non-zero coefficients of each present solute on the variables
  std::vector<std::size_t> first_entry;  // entries of the j-th present solute: [first_entry[j], first_entry[j+1])
  std::vector<FixedTerm> fixed_terms;    // and on the basis species that are not variables
  std::vector<std::size_t> first_fixed_term;
  // Per present solute, its products ν_ir ν_is on the Hessian's lower triangle (index r·k + s),
  // [first_product[j], first_product[j+1]); per variable, the present solutes built from it and their
  // coefficients, [first_use[r], first_use[r+1]) (the start's sweeps).
  struct Product {
    std::size_t index;
    double coefficient;
  };
  struct Use {
    std::size_t solute;
    double coefficient;
  };
  std::vector<Product> products;
  std::vector<std::size_t> first_product;
  std::vector<Use> uses;
  std::vector<std::size_t> first_use;
  // Per present solute: the constant part of its exponent (ln K and the basis species that are not
  // variables), its exponent and molality at the current point, and the exponent's change along the
  // Newton step (Σ_b ν_ib p_b).
  std::vector<double> offset, exponent, molality, direction;
  std::vector<double> trial_value, trial_exponent, trial_molality;  // the line search's trial point
  std::vector<double> gradient, step, hessian;  // hessian: k × k row-major, its lower triangle used
};

// A phase of fixed activity (an open gas, a solid taken as present) swapped into the guess's basis in
// place of one basis species, its pivot.
struct FixedPhase {
  std::span<const double> stoichiometry;  // the phase's formation from the basis species
  std::size_t pivot, unknown;
  double constant, scale;  // ln activity − ln K; amount = scale · u[unknown] is held out of solution
};

// Every work array of a cold start: one per solver, reused by each pass.
struct GuessWorkspace {
  DualWorkspace dual;
  std::vector<FixedPhase> fixed, swapped;
  std::vector<double> row, swapped_row;  // phase × basis, row-major: stoichiometry in the swapped basis
  std::vector<char> pivot_taken;
  std::vector<double> balance, missing;  // the amounts held in the swapped phases: balance · held = missing
  std::vector<double> held;
  std::vector<std::size_t> column_order;
};

// Solves the square system a · solution = b (a: size × size, row-major; both overwritten) by Gaussian
// elimination with complete pivoting [golub-van-loan-2013, §3.4]. Where a is singular to working
// precision the unknowns of the missing pivots are set to zero. column_order is scratch.
void solve_small_system(std::size_t size, std::span<double> a, std::span<double> b, std::span<double> solution,
                        std::vector<std::size_t>& column_order);

// Builds the workspace's structure for a problem: which basis species are variables and the non-zero
// coefficients of each present solute. Once for a given stoichiometry, `swept` and `present`;
// minimise_ideal_dual may then be called for any ln K and totals (the passes of one cold start).
void prepare_ideal_dual(const GuessProblem& problem, DualWorkspace& work);

// The balances Σ_i ν_ib m_i(x) = t_b are the gradient of the convex function
// G(x) = Σ_i m_i(x) − Σ_b t_b x_b, whose Hessian Σ_i ν_i ν_iᵀ m_i is positive semi-definite (the dual
// of the ideal Gibbs-energy minimisation; Smith & Missen 1982). Newton on G with an Armijo
// backtracking line search on G itself converges from any start where a minimum exists. x holds the
// start on entry (any finite values for swept species) and the minimiser on return: the first point
// where every balance's residual |Σ_i ν_ib m_i − t_b| is below tolerance · |t_b|, or where Newton's
// predicted decrease falls below G's rounding error. `work` holds the structure prepare_ideal_dual
// built for this problem's stoichiometry.
void minimise_ideal_dual(const GuessProblem& problem, std::span<double> x, int iterations, double tolerance,
                         DualWorkspace& work);

}  // namespace protonflow::thermo::detail
