#include "eigen_dense_linear_solver.hpp"

#include <Eigen/LU>
#include <cmath>
#include <new>
#include <nvector/nvector_serial.h>
#include <sunmatrix/sunmatrix_dense.h>

namespace protonflow::thermo::detail {

namespace {

struct EigenDense {
  explicit EigenDense(Eigen::Index n) : lu(n) {}
  Eigen::PartialPivLU<Eigen::MatrixXd> lu;  // sized once: compute() and solve() reuse its storage
  sunindextype last_flag = 0;
};

EigenDense& content(SUNLinearSolver solver) { return *static_cast<EigenDense*>(solver->content); }

using ColumnMajorMap = Eigen::Map<const Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::ColMajor>>;

SUNLinearSolver_Type get_type(SUNLinearSolver) { return SUNLINEARSOLVER_DIRECT; }
SUNLinearSolver_ID get_id(SUNLinearSolver) { return SUNLINEARSOLVER_CUSTOM; }
int initialize(SUNLinearSolver) { return SUNLS_SUCCESS; }

// Factor A = P L U. A SUNDenseMatrix stores its data column-major, as Eigen's default.
int setup(SUNLinearSolver solver, SUNMatrix a) {
  const auto n = static_cast<Eigen::Index>(SUNDenseMatrix_Rows(a));
  EigenDense& s = content(solver);
  s.lu.compute(ColumnMajorMap(SUNDenseMatrix_Data(a), n, n));
  // A zero or non-finite pivot is a failed factorisation; last_flag is its 1-based column, as
  // SUNDIALS' dense solver reports it.
  s.last_flag = 0;
  const auto diagonal = s.lu.matrixLU().diagonal();
  for (Eigen::Index k = 0; k < n; ++k) {
    if (diagonal[k] == 0.0 || !std::isfinite(diagonal[k])) {
      s.last_flag = static_cast<sunindextype>(k + 1);
      return SUNLS_LUFACT_FAIL;
    }
  }
  return SUNLS_SUCCESS;
}

int solve(SUNLinearSolver solver, SUNMatrix, N_Vector x, N_Vector b, realtype) {
  EigenDense& s = content(solver);
  const Eigen::Index n = s.lu.rows();
  Eigen::Map<Eigen::VectorXd> xs(N_VGetArrayPointer(x), n);
  const Eigen::Map<const Eigen::VectorXd> bs(N_VGetArrayPointer(b), n);
  xs = s.lu.permutationP() * bs;
  s.lu.matrixLU().template triangularView<Eigen::UnitLower>().solveInPlace(xs);
  s.lu.matrixLU().template triangularView<Eigen::Upper>().solveInPlace(xs);
  return SUNLS_SUCCESS;
}

sunindextype last_flag(SUNLinearSolver solver) { return content(solver).last_flag; }

int free_solver(SUNLinearSolver solver) {
  if (!solver) return SUNLS_SUCCESS;
  delete static_cast<EigenDense*>(solver->content);
  solver->content = nullptr;
  SUNLinSolFreeEmpty(solver);
  return SUNLS_SUCCESS;
}

}  // namespace

SUNLinearSolver make_eigen_dense_linear_solver(SUNContext context, sunindextype n) {
  SUNLinearSolver solver = SUNLinSolNewEmpty(context);
  if (!solver) return nullptr;
  solver->ops->gettype = get_type;
  solver->ops->getid = get_id;
  solver->ops->initialize = initialize;
  solver->ops->setup = setup;
  solver->ops->solve = solve;
  solver->ops->lastflag = last_flag;
  solver->ops->free = free_solver;
  solver->content = new (std::nothrow) EigenDense(static_cast<Eigen::Index>(n));
  if (!solver->content) {
    SUNLinSolFreeEmpty(solver);
    return nullptr;
  }
  return solver;
}

}  // namespace protonflow::thermo::detail
