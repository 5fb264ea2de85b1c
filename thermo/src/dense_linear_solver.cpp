#include "dense_linear_solver.hpp"

#include <cmath>
#include <new>
#include <nvector/nvector_serial.h>
#include <utility>
#include <vector>

namespace protonflow::thermo::detail {

namespace {

struct DenseJacobian {
  explicit DenseJacobian(sunindextype size) : n(size), data(static_cast<std::size_t>(size * size)) {}
  sunindextype n;
  std::vector<double> data;  // column-major: the Jacobian, or after set-up its LU factors
  bool keep = false;         // the next set-up keeps the factors in data
};

DenseJacobian& jacobian(SUNMatrix matrix) { return *static_cast<DenseJacobian*>(matrix->content); }

SUNMatrix_ID matrix_id(SUNMatrix) { return SUNMATRIX_CUSTOM; }
int leave_as_is(SUNMatrix) { return 0; }  // the Jacobian function writes every entry
void destroy_matrix(SUNMatrix matrix) {
  if (!matrix) return;
  delete static_cast<DenseJacobian*>(matrix->content);
  matrix->content = nullptr;
  SUNMatFreeEmpty(matrix);
}

// LU with partial pivoting, in place: A = P L U with L unit lower, both stored in A; pivot[k] is
// the row swapped with row k at step k [golub-van-loan-2013, §3.4], column-major.
// Hand-written because at 10–40 unknowns Eigen's blocked LU spends more on blocking than on
// arithmetic (docs/performance.md).
struct DenseLU {
  explicit DenseLU(sunindextype size) : n(size), pivot(static_cast<std::size_t>(size)) {}
  sunindextype n;
  std::vector<sunindextype> pivot;
  const double* lu = nullptr;  // the factored matrix
  sunindextype last_flag = 0;
};

DenseLU& lu(SUNLinearSolver solver) { return *static_cast<DenseLU*>(solver->content); }

SUNLinearSolver_Type get_type(SUNLinearSolver) { return SUNLINEARSOLVER_DIRECT; }
SUNLinearSolver_ID get_id(SUNLinearSolver) { return SUNLINEARSOLVER_CUSTOM; }
int initialize(SUNLinearSolver) { return SUNLS_SUCCESS; }

int setup(SUNLinearSolver solver, SUNMatrix matrix) {
  DenseLU& s = lu(solver);
  DenseJacobian& j = jacobian(matrix);
  if (j.keep) {
    j.keep = false;
    return s.last_flag == 0 ? SUNLS_SUCCESS : SUNLS_LUFACT_FAIL;
  }
  const sunindextype n = s.n;
  double* a = j.data.data();
  s.lu = a;
  s.last_flag = 0;
  for (sunindextype k = 0; k < n; ++k) {
    double* column_k = a + k * n;
    sunindextype p = k;
    double largest = std::abs(column_k[k]);
    for (sunindextype i = k + 1; i < n; ++i)
      if (std::abs(column_k[i]) > largest) {
        largest = std::abs(column_k[i]);
        p = i;
      }
    s.pivot[static_cast<std::size_t>(k)] = p;
    // A zero or non-finite pivot is a failed factorisation; last_flag is its 1-based column, as
    // SUNDIALS' dense solver reports it.
    if (largest == 0.0 || !std::isfinite(largest)) {
      s.last_flag = k + 1;
      return SUNLS_LUFACT_FAIL;
    }
    if (p != k)
      for (sunindextype j = 0; j < n; ++j) std::swap(a[j * n + k], a[j * n + p]);
    const double inverse = 1.0 / column_k[k];
    for (sunindextype i = k + 1; i < n; ++i) column_k[i] *= inverse;
    for (sunindextype j = k + 1; j < n; ++j) {
      double* column_j = a + j * n;
      const double factor = column_j[k];
      if (factor == 0.0) continue;
      for (sunindextype i = k + 1; i < n; ++i) column_j[i] -= factor * column_k[i];
    }
  }
  return SUNLS_SUCCESS;
}

// x = U⁻¹ L⁻¹ P b.
int solve(SUNLinearSolver solver, SUNMatrix, N_Vector x, N_Vector b, realtype) {
  const DenseLU& s = lu(solver);
  const sunindextype n = s.n;
  const double* a = s.lu;
  double* y = N_VGetArrayPointer(x);
  const double* rhs = N_VGetArrayPointer(b);
  if (y != rhs)
    for (sunindextype i = 0; i < n; ++i) y[i] = rhs[i];
  // The row swaps were applied to whole rows, L's columns included: permute b first, then solve.
  for (sunindextype k = 0; k < n; ++k) {
    const sunindextype p = s.pivot[static_cast<std::size_t>(k)];
    if (p != k) std::swap(y[k], y[p]);
  }
  for (sunindextype k = 0; k < n; ++k) {
    const double yk = y[k];
    if (yk == 0.0) continue;
    const double* column_k = a + k * n;
    for (sunindextype i = k + 1; i < n; ++i) y[i] -= yk * column_k[i];
  }
  for (sunindextype k = n; k-- > 0;) {
    const double* column_k = a + k * n;
    y[k] /= column_k[k];
    const double yk = y[k];
    for (sunindextype i = 0; i < k; ++i) y[i] -= yk * column_k[i];
  }
  return SUNLS_SUCCESS;
}

sunindextype last_flag(SUNLinearSolver solver) { return lu(solver).last_flag; }

int free_solver(SUNLinearSolver solver) {
  if (!solver) return SUNLS_SUCCESS;
  delete static_cast<DenseLU*>(solver->content);
  solver->content = nullptr;
  SUNLinSolFreeEmpty(solver);
  return SUNLS_SUCCESS;
}

}  // namespace

SUNMatrix make_dense_jacobian(SUNContext context, sunindextype n) {
  SUNMatrix matrix = SUNMatNewEmpty(context);
  if (!matrix) return nullptr;
  matrix->ops->getid = matrix_id;
  matrix->ops->zero = leave_as_is;
  matrix->ops->destroy = destroy_matrix;
  matrix->content = new (std::nothrow) DenseJacobian(n);
  if (!matrix->content) {
    SUNMatFreeEmpty(matrix);
    return nullptr;
  }
  return matrix;
}

double* dense_jacobian_data(SUNMatrix matrix) { return jacobian(matrix).data.data(); }

void keep_factorization(SUNMatrix matrix) { jacobian(matrix).keep = true; }

SUNLinearSolver make_dense_lu_solver(SUNContext context, sunindextype n) {
  SUNLinearSolver solver = SUNLinSolNewEmpty(context);
  if (!solver) return nullptr;
  solver->ops->gettype = get_type;
  solver->ops->getid = get_id;
  solver->ops->initialize = initialize;
  solver->ops->setup = setup;
  solver->ops->solve = solve;
  solver->ops->lastflag = last_flag;
  solver->ops->free = free_solver;
  solver->content = new (std::nothrow) DenseLU(n);
  if (!solver->content) {
    SUNLinSolFreeEmpty(solver);
    return nullptr;
  }
  return solver;
}

}  // namespace protonflow::thermo::detail
