// The analytic Jacobian against central finite differences of the residual: a check for tests.
// In the reduced form both are the reduced form's: F_reduced, with the secondary solutes solved
// inside it, and its Schur-complement Jacobian.
#include <cmath>
#include <memory>

#include "dense_linear_solver.hpp"
#include "equilibrium_solver_impl.hpp"

namespace protonflow::thermo {

double EquilibriumSolver::Impl::jacobian_finite_difference_error(double offset) {
  if (!has_previous) throw ThermoError(ErrorKind::bad_input, "the Jacobian check needs a previous solve");
  const bool reduced = options.form == NewtonForm::reduced;
  const std::size_t length = reduced ? reduced_size : size;
  const auto unknown = [&](std::size_t j) { return reduced ? full_index(j) : j; };
  // Off the solution: every ln unknown of a present solute and ln W moved by a different fraction
  // of `offset`, so no term of the residual vanishes by accident; phase amounts stay. In the
  // reduced form the secondary solutes follow from the basis.
  std::vector<double> x(length), f_plus(length), f_minus(length);
  for (std::size_t j = 0; j < length; ++j) {
    const std::size_t k = unknown(j);
    x[j] = previous_u[k];
    if (k == n || (k < n && active[k])) x[j] += offset * std::sin(1.0 + static_cast<double>(k));
  }
  if (reduced) std::copy(previous_u.begin(), previous_u.end(), full_x.begin());
  const auto evaluate = [&](const double* at, double* f) {
    if (!reduced) {
      residual(at, f);
    } else if (!reduced_residual(at, f)) {
      throw ConvergenceError("the Jacobian check's secondary solve did not converge", {}, 0);
    }
  };
  const std::unique_ptr<std::remove_pointer_t<SUNMatrix>, void (*)(SUNMatrix)> analytic(
      detail::make_dense_jacobian(context, static_cast<sunindextype>(length)), SUNMatDestroy);
  reuse_factorization = false;
  if (reduced) {
    evaluate(x.data(), f_plus.data());
    if (!reduced_jacobian(x.data(), detail::dense_jacobian_data(analytic.get())))
      throw ConvergenceError("the Jacobian check's Schur complement failed", {}, 0);
  } else {
    jacobian(x.data(), analytic.get());
  }
  factorization_current = false;  // the solver's own matrix was not factored at x
  const double* a = detail::dense_jacobian_data(analytic.get());
  std::vector<double> row_scale(length, 0.0);
  for (std::size_t j = 0; j < length; ++j)
    for (std::size_t i = 0; i < length; ++i) row_scale[i] = std::max(row_scale[i], std::abs(a[j * length + i]));

  double worst = 0.0;
  for (std::size_t j = 0; j < length; ++j) {
    const double step = 1e-6 * std::max(1.0, std::abs(x[j]));  // central differences: error ~ step²
    const double original = x[j];
    x[j] = original + step;
    evaluate(x.data(), f_plus.data());
    x[j] = original - step;
    evaluate(x.data(), f_minus.data());
    x[j] = original;
    for (std::size_t i = 0; i < length; ++i) {
      const double numeric = (f_plus[i] - f_minus[i]) / (2.0 * step);
      worst = std::max(worst, std::abs(numeric - a[j * length + i]) / std::max(row_scale[i], 1e-300));
    }
  }
  evaluation_valid = false;  // the next solve evaluates γ afresh
  return worst;
}

}  // namespace protonflow::thermo
