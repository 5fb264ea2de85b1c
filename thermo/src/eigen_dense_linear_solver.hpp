// A SUNDIALS direct linear solver backed by Eigen's partial-pivoting LU, for KINSOL's dense
// Jacobian. SUNDIALS' own dense solver is generic scalar code; Eigen's blocked, vectorised LU is
// several times faster on the 10–40 unknowns of a speciation (docs/performance.md).
#pragma once

#include <sundials/sundials_context.h>
#include <sundials/sundials_linearsolver.h>

namespace protonflow::thermo::detail {

// Creates the solver for n×n dense matrices; free it with SUNLinSolFree. Null on failure.
SUNLinearSolver make_eigen_dense_linear_solver(SUNContext context, sunindextype n);

}  // namespace protonflow::thermo::detail
