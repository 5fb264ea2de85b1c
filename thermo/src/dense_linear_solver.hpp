// The Newton matrix of the equilibrium solver behind SUNDIALS' interfaces: a dense column-major
// matrix that the Jacobian function writes in full (so KINSOL's zeroing is left to it), and a
// direct linear solver that factors it in place by LU with partial pivoting (docs/performance.md).
#pragma once

#include <sundials/sundials_context.h>
#include <sundials/sundials_linearsolver.h>
#include <sundials/sundials_matrix.h>

namespace protonflow::thermo::detail {

// An n×n dense matrix, column-major; free it with SUNMatDestroy. Null on failure. SUNMatZero on it
// does nothing: the Jacobian function clears what it does not write.
SUNMatrix make_dense_jacobian(SUNContext context, sunindextype n);
// Its column-major entries, n·n of them, for the Jacobian function to write; the next linear-solver
// set-up factors them in place.
double* dense_jacobian_data(SUNMatrix matrix);
// Instead of writing a new Jacobian: the next set-up keeps the LU factors it holds.
void keep_factorization(SUNMatrix matrix);

// Creates the solver for a matrix of make_dense_jacobian; free it with SUNLinSolFree. Null on failure.
SUNLinearSolver make_dense_lu_solver(SUNContext context, sunindextype n);

}  // namespace protonflow::thermo::detail

#include <cstddef>
#include <vector>

namespace protonflow::thermo::detail {

// In-place LU with partial pivoting of an n×n column-major matrix; 0, or the 1-based column of a
// zero or non-finite pivot. solve_in_place then overwrites y with A⁻¹ y.
sunindextype factor_in_place(double* a, sunindextype n, sunindextype* pivot);
void solve_in_place(const double* lu, sunindextype n, const sunindextype* pivot, double* y);

// The Schur complement of the block [begin, end) of an n×n column-major matrix J (rows and columns
// alike): S = J_oo − J_oi J_ii⁻¹ J_io over the outer indices o = [0, begin) ∪ [end, n), in their
// order [golub-van-loan-2013, block LU]. Sized once; forming it allocates nothing.
class SchurComplement {
 public:
  SchurComplement(std::size_t n, std::size_t begin, std::size_t end);
  std::size_t outer_size() const noexcept { return outer_; }
  // Writes S (outer_size² entries, column-major); 0, or the failed pivot column of J_ii.
  sunindextype form(const double* j, double* s);
  // With S's LU (factor_in_place of the S formed last) and the J that formed it: y = J⁻¹ y, by
  // y_o = S⁻¹ (y_o − J_oi J_ii⁻¹ y_i), then y_i = J_ii⁻¹ y_i − (J_ii⁻¹ J_io) y_o.
  void solve(const double* j, const double* s_lu, const sunindextype* s_pivot, double* y);

 private:
  std::size_t full(std::size_t outer_index) const noexcept { return outer_index < begin_ ? outer_index : outer_index + inner_; }
  std::size_t n_, begin_, inner_, outer_;
  std::vector<double> inner_lu_;      // J_ii's LU, inner²
  std::vector<sunindextype> inner_pivot_;
  std::vector<double> inner_solved_;  // J_ii⁻¹ J_io, inner × outer, column-major
  std::vector<double> inner_rhs_, outer_rhs_;
};

// A linear solver for a matrix of make_dense_jacobian that solves by the Schur complement of the
// block [begin, end) instead of one LU; free it with SUNLinSolFree. Null on failure.
SUNLinearSolver make_schur_lu_solver(SUNContext context, sunindextype n, std::size_t begin, std::size_t end);

}  // namespace protonflow::thermo::detail
