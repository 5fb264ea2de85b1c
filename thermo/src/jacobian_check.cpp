// The analytic Jacobian against central finite differences of the residual: a check for tests.
#include <cmath>
#include <memory>

#include "dense_linear_solver.hpp"
#include "equilibrium_solver_impl.hpp"

namespace protonflow::thermo {

double EquilibriumSolver::Impl::jacobian_finite_difference_error(double offset) {
  if (!has_previous) throw ThermoError(ErrorKind::bad_input, "the Jacobian check needs a previous solve");
  // Off the solution: every ln unknown of a present solute and ln W moved by a different fraction
  // of `offset`, so no term of the residual vanishes by accident; phase amounts stay.
  std::vector<double> x(previous_u), f_plus(size), f_minus(size);
  for (std::size_t k = 0; k <= n; ++k)
    if (k == n || active[k]) x[k] += offset * std::sin(1.0 + static_cast<double>(k));
  const std::unique_ptr<std::remove_pointer_t<SUNMatrix>, void (*)(SUNMatrix)> analytic(
      detail::make_dense_jacobian(context, static_cast<sunindextype>(size)), SUNMatDestroy);
  reuse_factorization = false;
  jacobian(x.data(), analytic.get());
  factorization_current = false;  // the solver's own matrix was not factored at x
  const double* a = detail::dense_jacobian_data(analytic.get());
  std::vector<double> row_scale(size, 0.0);
  for (std::size_t j = 0; j < size; ++j)
    for (std::size_t i = 0; i < size; ++i) row_scale[i] = std::max(row_scale[i], std::abs(a[j * size + i]));

  double worst = 0.0;
  for (std::size_t j = 0; j < size; ++j) {
    const double step = 1e-6 * std::max(1.0, std::abs(x[j]));  // central differences: error ~ step²
    const double original = x[j];
    x[j] = original + step;
    residual(x.data(), f_plus.data());
    x[j] = original - step;
    residual(x.data(), f_minus.data());
    x[j] = original;
    for (std::size_t i = 0; i < size; ++i) {
      const double numeric = (f_plus[i] - f_minus[i]) / (2.0 * step);
      worst = std::max(worst, std::abs(numeric - a[j * size + i]) / std::max(row_scale[i], 1e-300));
    }
  }
  evaluation_valid = false;  // the next solve evaluates γ afresh
  return worst;
}

}  // namespace protonflow::thermo
