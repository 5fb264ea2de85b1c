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

// y −= a x over len entries; y never overlaps x (two different columns).
void subtract_multiple(double* __restrict y, const double* __restrict x, double a, sunindextype len) {
  for (sunindextype i = 0; i < len; ++i) y[i] -= a * x[i];
}

// The same for two columns at once: each entry of x is loaded once for both.
void subtract_multiples(double* __restrict y1, double* __restrict y2, const double* __restrict x, double a1, double a2,
                        sunindextype len) {
  for (sunindextype i = 0; i < len; ++i) {
    const double xi = x[i];
    y1[i] -= a1 * xi;
    y2[i] -= a2 * xi;
  }
}

// LU with partial pivoting, in place: A = P L U with L unit lower, both stored in A; pivot[k] is
// the row swapped with row k at step k [golub-van-loan-2013, §3.4], column-major.
// Hand-written because at 10–40 unknowns Eigen's blocked LU spends more on blocking than on
// arithmetic (docs/performance.md); the trailing update goes two columns at a time, which at these
// sizes saves a fifth of the instructions of one column at a time.
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
    if (p != k) {
      double* row_k = a + k;
      double* row_p = a + p;
      for (sunindextype j = 0; j < n * n; j += n) std::swap(row_k[j], row_p[j]);
    }
    const double inverse = 1.0 / column_k[k];
    const sunindextype below = n - k - 1;  // entries below the diagonal
    double* l_k = column_k + k + 1;        // column k of L
    for (sunindextype i = 0; i < below; ++i) l_k[i] *= inverse;
    double* column_j = column_k + n;
    double* const end = a + n * n;
    // The Newton matrix is partly sparse (mass and charge balances): skip columns with a zero in row k.
    for (; column_j + n < end; column_j += 2 * n) {
      const double a1 = column_j[k], a2 = column_j[n + k];
      if (a1 != 0.0 && a2 != 0.0) {
        subtract_multiples(column_j + k + 1, column_j + n + k + 1, l_k, a1, a2, below);
      } else if (a1 != 0.0) {
        subtract_multiple(column_j + k + 1, l_k, a1, below);
      } else if (a2 != 0.0) {
        subtract_multiple(column_j + n + k + 1, l_k, a2, below);
      }
    }
    if (column_j < end && column_j[k] != 0.0) subtract_multiple(column_j + k + 1, l_k, column_j[k], below);
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
  for (sunindextype k = 0; k + 1 < n; ++k)
    if (y[k] != 0.0) subtract_multiple(y + k + 1, a + k * n + k + 1, y[k], n - k - 1);
  for (sunindextype k = n; k-- > 0;) {
    const double* column_k = a + k * n;
    y[k] /= column_k[k];
    if (y[k] != 0.0) subtract_multiple(y, column_k, y[k], k);
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
