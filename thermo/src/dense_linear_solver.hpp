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
