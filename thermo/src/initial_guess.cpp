#include "initial_guess.hpp"

#include <algorithm>
#include <boost/math/tools/roots.hpp>
#include <cmath>

namespace protonflow::thermo::detail {

namespace {

// Keeps exp() finite: molalities between 1e-304 and e^40 cover every physical case.
constexpr double lowest_log = -700.0;
constexpr double highest_log = 40.0;

double balance(const GuessProblem& p, std::span<const double> x, std::size_t b, double xb) {
  double sum = -p.basis_total[b];
  for (std::size_t i = 0; i < p.solute_count; ++i) {
    if (!p.present[i]) continue;
    const double nu = p.stoichiometry[i * p.basis_count + b];
    if (nu == 0.0) continue;
    double exponent = p.ln_k[i];
    for (std::size_t c = 0; c < p.basis_count; ++c) {
      const double nu_c = p.stoichiometry[i * p.basis_count + c];
      if (nu_c != 0.0) exponent += nu_c * (c == b ? xb : x[c]);
    }
    sum += nu * std::exp(std::clamp(exponent, lowest_log, highest_log));
  }
  return sum;
}

}  // namespace

void sweep_basis_balances(const GuessProblem& p, std::span<double> x, int sweeps) {
  for (int sweep = 0; sweep < sweeps; ++sweep) {
    double largest_change = 0.0;
    for (std::size_t b = 0; b < p.basis_count; ++b) {
      if (!p.swept[b]) continue;
      if (!std::isfinite(x[b])) x[b] = std::log(1e-7);  // a start the caller could not make finite
      const auto f = [&](double xb) { return balance(p, x, b, xb); };
      // Bracket by stepping outwards from the current value; f rises with xb.
      double low = x[b] - 1.0, high = x[b] + 1.0;
      double f_low = f(low), f_high = f(high);
      for (double step = 2.0; f_low > 0.0 && low > lowest_log; step *= 2.0) f_low = f(low = std::max(lowest_log, low - step));
      for (double step = 2.0; f_high < 0.0 && high < highest_log; step *= 2.0) f_high = f(high = std::min(highest_log, high + step));
      // No sign change inside the finite range, or a balance that is not finite: leave it to Newton.
      if (!(f_low <= 0.0) || !(f_high >= 0.0)) continue;
      std::uintmax_t iterations = 100;
      const auto [a, c] = boost::math::tools::toms748_solve(f, low, high, f_low, f_high,
                                                            boost::math::tools::eps_tolerance<double>(30), iterations);
      const double root = 0.5 * (a + c);
      largest_change = std::max(largest_change, std::abs(root - x[b]));
      x[b] = root;
    }
    if (largest_change < 1e-3) break;
  }
}

}  // namespace protonflow::thermo::detail
