#include "dense_linear_solver.hpp"

#include <algorithm>
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

}  // namespace

// LU with partial pivoting, in place: A = P L U with L unit lower, both stored in A; pivot[k] is
// the row swapped with row k at step k [golub-van-loan-2013, §3.4], column-major.
// Hand-written because at 10–40 unknowns Eigen's blocked LU spends more on blocking than on
// arithmetic (docs/performance.md); the trailing update goes two columns at a time, which at these
// sizes saves a fifth of the instructions of one column at a time.
sunindextype factor_in_place(double* a, sunindextype n, sunindextype* pivot) {
  for (sunindextype k = 0; k < n; ++k) {
    double* column_k = a + k * n;
    sunindextype p = k;
    double largest = std::abs(column_k[k]);
    for (sunindextype i = k + 1; i < n; ++i)
      if (std::abs(column_k[i]) > largest) {
        largest = std::abs(column_k[i]);
        p = i;
      }
    pivot[k] = p;
    // A zero or non-finite pivot is a failed factorisation, reported as its 1-based column, as
    // SUNDIALS' dense solver reports it.
    if (largest == 0.0 || !std::isfinite(largest)) return k + 1;
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
  return 0;
}

void solve_in_place(const double* a, sunindextype n, const sunindextype* pivot, double* y) {
  // The row swaps were applied to whole rows, L's columns included: permute b first, then solve.
  for (sunindextype k = 0; k < n; ++k) {
    const sunindextype p = pivot[k];
    if (p != k) std::swap(y[k], y[p]);
  }
  for (sunindextype k = 0; k + 1 < n; ++k)
    if (y[k] != 0.0) subtract_multiple(y + k + 1, a + k * n + k + 1, y[k], n - k - 1);
  for (sunindextype k = n; k-- > 0;) {
    const double* column_k = a + k * n;
    y[k] /= column_k[k];
    if (y[k] != 0.0) subtract_multiple(y, column_k, y[k], k);
  }
}

namespace {

// The LU of the Newton matrix behind SUNDIALS' linear-solver interface.
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
  s.lu = j.data.data();
  s.last_flag = factor_in_place(j.data.data(), s.n, s.pivot.data());
  return s.last_flag == 0 ? SUNLS_SUCCESS : SUNLS_LUFACT_FAIL;
}

// x = U⁻¹ L⁻¹ P b.
int solve(SUNLinearSolver solver, SUNMatrix, N_Vector x, N_Vector b, realtype) {
  const DenseLU& s = lu(solver);
  double* y = N_VGetArrayPointer(x);
  const double* rhs = N_VGetArrayPointer(b);
  if (y != rhs)
    for (sunindextype i = 0; i < s.n; ++i) y[i] = rhs[i];
  solve_in_place(s.lu, s.n, s.pivot.data(), y);
  return SUNLS_SUCCESS;
}

// The last factorisation's flag and the release of a solver's content, for either content type.
template <class Content>
sunindextype last_flag_of(SUNLinearSolver solver) {
  return static_cast<const Content*>(solver->content)->last_flag;
}

template <class Content>
int free_with_content(SUNLinearSolver solver) {
  if (!solver) return SUNLS_SUCCESS;
  delete static_cast<Content*>(solver->content);
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
  solver->ops->lastflag = last_flag_of<DenseLU>;
  solver->ops->free = free_with_content<DenseLU>;
  solver->content = new (std::nothrow) DenseLU(n);
  if (!solver->content) {
    SUNLinSolFreeEmpty(solver);
    return nullptr;
  }
  return solver;
}

}  // namespace protonflow::thermo::detail

namespace protonflow::thermo::detail {

SchurComplement::SchurComplement(std::size_t n, std::size_t begin, std::size_t end)
    : n_(n),
      begin_(begin),
      inner_(end - begin),
      outer_(n - (end - begin)),
      inner_lu_(inner_ * inner_),
      inner_pivot_(inner_),
      inner_solved_(inner_ * outer_),
      inner_rhs_(inner_),
      outer_rhs_(outer_) {}

sunindextype SchurComplement::form(const double* j, double* s) {
  const auto ni = static_cast<sunindextype>(inner_);
  for (std::size_t c = 0; c < inner_; ++c)
    std::copy(j + (begin_ + c) * n_ + begin_, j + (begin_ + c) * n_ + begin_ + inner_, inner_lu_.begin() + static_cast<std::ptrdiff_t>(c * inner_));
  if (const sunindextype failed = factor_in_place(inner_lu_.data(), ni, inner_pivot_.data()); failed != 0) return failed;
  for (std::size_t oc = 0; oc < outer_; ++oc) {
    const double* column = j + full(oc) * n_;
    double* solved = inner_solved_.data() + oc * inner_;
    std::copy(column + begin_, column + begin_ + inner_, solved);
    solve_in_place(inner_lu_.data(), ni, inner_pivot_.data(), solved);
    double* s_column = s + oc * outer_;
    for (std::size_t orow = 0; orow < outer_; ++orow) s_column[orow] = column[full(orow)];
    for (std::size_t c = 0; c < inner_; ++c) {
      const double w = solved[c];
      if (w == 0.0) continue;
      const double* j_oi = j + (begin_ + c) * n_;  // column begin_ + c of J, at the outer rows
      for (std::size_t orow = 0; orow < outer_; ++orow) s_column[orow] -= j_oi[full(orow)] * w;
    }
  }
  return 0;
}

void SchurComplement::solve(const double* j, const double* s_lu, const sunindextype* s_pivot, double* y) {
  std::copy(y + begin_, y + begin_ + inner_, inner_rhs_.begin());
  solve_in_place(inner_lu_.data(), static_cast<sunindextype>(inner_), inner_pivot_.data(), inner_rhs_.data());
  for (std::size_t orow = 0; orow < outer_; ++orow) {
    double value = y[full(orow)];
    for (std::size_t c = 0; c < inner_; ++c) value -= j[(begin_ + c) * n_ + full(orow)] * inner_rhs_[c];
    outer_rhs_[orow] = value;
  }
  solve_in_place(s_lu, static_cast<sunindextype>(outer_), s_pivot, outer_rhs_.data());
  for (std::size_t c = 0; c < inner_; ++c) {
    double value = inner_rhs_[c];
    for (std::size_t oc = 0; oc < outer_; ++oc) value -= inner_solved_[oc * inner_ + c] * outer_rhs_[oc];
    y[begin_ + c] = value;
  }
  for (std::size_t orow = 0; orow < outer_; ++orow) y[full(orow)] = outer_rhs_[orow];
}

}  // namespace protonflow::thermo::detail

namespace protonflow::thermo::detail {

namespace {

// The same Newton step by block elimination of [begin, end): the Jacobian stays as written, the
// solver holds J_ii's LU and the LU of its Schur complement.
struct SchurLU {
  SchurLU(sunindextype n, std::size_t begin, std::size_t end)
      : schur(static_cast<std::size_t>(n), begin, end),
        s(schur.outer_size() * schur.outer_size()),
        pivot(schur.outer_size()) {}
  SchurComplement schur;
  std::vector<double> s;
  std::vector<sunindextype> pivot;
  const double* j = nullptr;
  sunindextype last_flag = 0;
};

SchurLU& schur_lu(SUNLinearSolver solver) { return *static_cast<SchurLU*>(solver->content); }

int schur_setup(SUNLinearSolver solver, SUNMatrix matrix) {
  SchurLU& s = schur_lu(solver);
  DenseJacobian& j = jacobian(matrix);
  if (j.keep) {
    j.keep = false;
    return s.last_flag == 0 ? SUNLS_SUCCESS : SUNLS_LUFACT_FAIL;
  }
  s.j = j.data.data();
  s.last_flag = s.schur.form(s.j, s.s.data());
  if (s.last_flag == 0) s.last_flag = factor_in_place(s.s.data(), static_cast<sunindextype>(s.schur.outer_size()), s.pivot.data());
  return s.last_flag == 0 ? SUNLS_SUCCESS : SUNLS_LUFACT_FAIL;
}

int schur_solve(SUNLinearSolver solver, SUNMatrix, N_Vector x, N_Vector b, realtype) {
  SchurLU& s = schur_lu(solver);
  double* y = N_VGetArrayPointer(x);
  const double* rhs = N_VGetArrayPointer(b);
  const auto n = static_cast<std::size_t>(N_VGetLength(x));
  if (y != rhs) std::copy(rhs, rhs + n, y);
  s.schur.solve(s.j, s.s.data(), s.pivot.data(), y);
  return SUNLS_SUCCESS;
}

}  // namespace

SUNLinearSolver make_schur_lu_solver(SUNContext context, sunindextype n, std::size_t begin, std::size_t end) {
  SUNLinearSolver solver = SUNLinSolNewEmpty(context);
  if (!solver) return nullptr;
  solver->ops->gettype = get_type;
  solver->ops->getid = get_id;
  solver->ops->initialize = initialize;
  solver->ops->setup = schur_setup;
  solver->ops->solve = schur_solve;
  solver->ops->lastflag = last_flag_of<SchurLU>;
  solver->ops->free = free_with_content<SchurLU>;
  solver->content = new (std::nothrow) SchurLU(n, begin, end);
  if (!solver->content) {
    SUNLinSolFreeEmpty(solver);
    return nullptr;
  }
  return solver;
}

}  // namespace protonflow::thermo::detail
