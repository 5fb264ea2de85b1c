#include "initial_guess.hpp"

#include <Eigen/Cholesky>
#include <algorithm>
#include <cmath>
#include <limits>

namespace protonflow::thermo::detail {

namespace {

// Keeps exp() finite: molalities between 1e-304 and e^40 cover every physical case.
constexpr double lowest_log = -700.0;
constexpr double highest_log = 40.0;

// Indices of the guess's variables: swept basis species with at least one present solute.
std::vector<std::size_t> variables_of(const GuessProblem& p) {
  std::vector<std::size_t> variables;
  for (std::size_t b = 0; b < p.basis_count; ++b) {
    if (!p.swept[b]) continue;
    bool used = false;
    for (std::size_t i = 0; i < p.solute_count && !used; ++i)
      used = p.present[i] && p.stoichiometry[i * p.basis_count + b] != 0.0;
    if (used) variables.push_back(b);
  }
  return variables;
}

double exponent_of(const GuessProblem& p, std::span<const double> x, std::size_t i) {
  double exponent = p.ln_k[i];
  for (std::size_t b = 0; b < p.basis_count; ++b) {
    const double nu = p.stoichiometry[i * p.basis_count + b];
    if (nu != 0.0) exponent += nu * x[b];
  }
  return exponent;
}

double molality_of(const GuessProblem& p, std::span<const double> x, std::size_t i) {
  return std::exp(std::clamp(exponent_of(p, x, i), lowest_log, highest_log));
}

// G(x) = Σ_i m_i − Σ_b t_b x_b over the variables; +∞ where a molality would leave the finite range,
// so the line search never steps into the region where exp() is clamped and G no longer convex.
double dual(const GuessProblem& p, std::span<const double> x, const std::vector<std::size_t>& variables) {
  double value = 0.0;
  for (std::size_t i = 0; i < p.solute_count; ++i) {
    if (!p.present[i]) continue;
    const double exponent = exponent_of(p, x, i);
    if (exponent > highest_log) return std::numeric_limits<double>::infinity();
    value += std::exp(std::max(exponent, lowest_log));
  }
  for (std::size_t b : variables) value -= p.basis_total[b] * x[b];
  return value;
}

}  // namespace

void minimise_ideal_dual(const GuessProblem& p, std::span<double> x, int iterations) {
  const std::vector<std::size_t> variables = variables_of(p);
  const auto k = static_cast<Eigen::Index>(variables.size());
  if (k == 0) return;
  for (std::size_t b : variables)
    if (!std::isfinite(x[b])) x[b] = std::log(1e-7);
  // Start where every molality is at most e^10: lower the variables other than H^+ together until
  // the most concentrated solute comes down there (no solute has a negative coefficient on them).
  double shift = 0.0;
  for (std::size_t i = 0; i < p.solute_count; ++i) {
    if (!p.present[i]) continue;
    double weight = 0.0;
    for (std::size_t b : variables)
      if (b != 0) weight += std::max(0.0, p.stoichiometry[i * p.basis_count + b]);
    const double excess = exponent_of(p, x, i) - 10.0;
    if (excess > 0.0 && weight > 0.0) shift = std::max(shift, excess / weight);
  }
  for (std::size_t b : variables)
    if (b != 0) x[b] -= shift;
  Eigen::VectorXd gradient(k), step(k);
  Eigen::MatrixXd hessian(k, k);
  std::vector<double> trial(x.begin(), x.end());
  for (int iteration = 0; iteration < iterations; ++iteration) {
    gradient.setZero();
    hessian.setZero();
    double size = 0.0;  // Σ |ν| m: the scale the gradient is measured against
    for (std::size_t i = 0; i < p.solute_count; ++i) {
      if (!p.present[i]) continue;
      const double m = molality_of(p, x, i);
      for (Eigen::Index r = 0; r < k; ++r) {
        const double nu_r = p.stoichiometry[i * p.basis_count + variables[static_cast<std::size_t>(r)]];
        if (nu_r == 0.0) continue;
        gradient[r] += nu_r * m;
        size += std::abs(nu_r) * m;
        for (Eigen::Index c = 0; c < k; ++c)
          hessian(r, c) += nu_r * p.stoichiometry[i * p.basis_count + variables[static_cast<std::size_t>(c)]] * m;
      }
    }
    double largest = 0.0;
    for (Eigen::Index r = 0; r < k; ++r) {
      const double t = p.basis_total[variables[static_cast<std::size_t>(r)]];
      gradient[r] -= t;
      largest = std::max(largest, std::abs(gradient[r]) / std::max(std::abs(t), 1e-300));
    }
    if (largest < 1e-8) return;  // close enough for a start: Newton on the full problem finishes
    // A tiny ridge keeps the factorisation defined where a variable's species have all but vanished.
    hessian.diagonal().array() += 1e-14 * std::max(size, 1e-300);
    step = hessian.ldlt().solve(-gradient);
    // At most a factor e^10 per step, by shortening the whole step so its direction stays a descent one.
    const double longest = step.cwiseAbs().maxCoeff();
    if (longest > 10.0) step *= 10.0 / longest;
    // Armijo backtracking on G, which is convex: any descent direction admits a decreasing step.
    const double g0 = dual(p, x, variables);
    const double slope = gradient.dot(step);
    double lambda = 1.0;
    bool moved = false;
    for (int halving = 0; halving < 40; ++halving, lambda *= 0.5) {
      std::copy(x.begin(), x.end(), trial.begin());
      for (Eigen::Index r = 0; r < k; ++r) {
        const std::size_t b = variables[static_cast<std::size_t>(r)];
        trial[b] = std::clamp(x[b] + lambda * step[r], lowest_log, highest_log);
      }
      if (dual(p, trial, variables) <= g0 + 1e-4 * lambda * slope) {
        moved = true;
        break;
      }
    }
    if (!moved) return;
    std::copy(trial.begin(), trial.end(), x.begin());
  }
}

}  // namespace protonflow::thermo::detail
