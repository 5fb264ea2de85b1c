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

// Newton on G moves a molality that starts far above its balance down by only about a factor e per
// step (the exponential dominates the step), e.g. hydrogencarbonate at 1e3 times the carbon total
// when carbonate starts at that total and H^+ at 1e-7. Two Gauss–Seidel sweeps over the variables
// other than H^+ first bring each balance's positive part Σ_i ν_ib⁺ m_i to within a factor e of t_b,
// raising no molality above e^10; a start already that close is left as it is. Only the start
// changes: the minimisation after it is the same.
void balance_start(const GuessProblem& p, std::span<double> x, const std::vector<std::size_t>& variables) {
  for (int sweep = 0; sweep < 2; ++sweep) {
    bool moved = false;
    for (std::size_t b : variables) {
      const double t = p.basis_total[b];
      if (b == 0 || !(t > 0.0)) continue;
      double held = 0.0;  // Σ_i ν_ib⁺ m_i
      double largest_coefficient = 0.0;
      double room = std::numeric_limits<double>::infinity();  // how far x_b may rise
      for (std::size_t i = 0; i < p.solute_count; ++i) {
        const double nu = p.stoichiometry[i * p.basis_count + b];
        if (!p.present[i] || nu <= 0.0) continue;
        const double exponent = exponent_of(p, x, i);
        held += nu * std::exp(std::clamp(exponent, lowest_log, highest_log));
        largest_coefficient = std::max(largest_coefficient, nu);
        room = std::min(room, (10.0 - exponent) / nu);
      }
      if (!(held > 0.0)) continue;
      const double excess = std::log(held / t);
      if (std::abs(excess) <= 1.0) continue;
      x[b] += std::min(-excess / largest_coefficient, std::max(room, 0.0));
      moved = true;
    }
    if (!moved) return;
  }
}

}  // namespace

void minimise_ideal_dual(const GuessProblem& p, std::span<double> x, int iterations, double tolerance) {
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
  balance_start(p, x, variables);
  // The non-zero coefficients of each present solute on the variables: the gradient Σ_i ν_i m_i
  // and the Hessian Σ_i ν_i ν_iᵀ m_i are sums over these alone.
  struct Entry {
    Eigen::Index variable;
    double coefficient;
  };
  std::vector<Entry> entries;
  std::vector<std::size_t> first_entry{0};  // entries of the j-th present solute: [first_entry[j], first_entry[j+1])
  for (std::size_t i = 0; i < p.solute_count; ++i) {
    if (!p.present[i]) continue;
    for (Eigen::Index r = 0; r < k; ++r) {
      const double nu = p.stoichiometry[i * p.basis_count + variables[static_cast<std::size_t>(r)]];
      if (nu != 0.0) entries.push_back({r, nu});
    }
    first_entry.push_back(entries.size());
  }
  // Each present solute's exponent is a constant (ln K and the basis species that are not variables,
  // which stay where they are) plus its entries: computed over those alone.
  std::vector<double> offset;
  for (std::size_t i = 0; i < p.solute_count; ++i) {
    if (!p.present[i]) continue;
    double constant = p.ln_k[i];
    for (std::size_t b = 0; b < p.basis_count; ++b) {
      const double nu = p.stoichiometry[i * p.basis_count + b];
      if (nu != 0.0 && std::find(variables.begin(), variables.end(), b) == variables.end()) constant += nu * x[b];
    }
    offset.push_back(constant);
  }
  const auto exponent_at = [&](std::span<const double> at, std::size_t j) {
    double exponent = offset[j];
    for (std::size_t e = first_entry[j]; e < first_entry[j + 1]; ++e)
      exponent += entries[e].coefficient * at[variables[static_cast<std::size_t>(entries[e].variable)]];
    return exponent;
  };
  // G(x) = Σ_i m_i − Σ_b t_b x_b over the variables; +∞ where a molality would leave the finite range,
  // so the line search never steps into the region where exp() is clamped and G no longer convex.
  const auto dual = [&](std::span<const double> at) {
    double value = 0.0;
    for (std::size_t j = 0; j < offset.size(); ++j) {
      const double exponent = exponent_at(at, j);
      if (exponent > highest_log) return std::numeric_limits<double>::infinity();
      value += std::exp(std::max(exponent, lowest_log));
    }
    for (std::size_t b : variables) value -= p.basis_total[b] * at[b];
    return value;
  };
  Eigen::VectorXd gradient(k), step(k);
  Eigen::MatrixXd hessian(k, k);
  std::vector<double> trial(x.begin(), x.end());
  for (int iteration = 0; iteration < iterations; ++iteration) {
    gradient.setZero();
    hessian.setZero();
    double size = 0.0;  // Σ |ν| m: the scale the gradient is measured against
    double magnitude = 0.0;  // Σ m + Σ |t x|: the scale of G's rounding error
    for (std::size_t j = 0; j < offset.size(); ++j) {
      const double m = std::exp(std::clamp(exponent_at(x, j), lowest_log, highest_log));
      magnitude += m;
      for (std::size_t e = first_entry[j]; e < first_entry[j + 1]; ++e) {
        const double nu_m = entries[e].coefficient * m;
        gradient[entries[e].variable] += nu_m;
        size += std::abs(nu_m);
        for (std::size_t f = first_entry[j]; f < first_entry[j + 1]; ++f)
          hessian(entries[e].variable, entries[f].variable) += nu_m * entries[f].coefficient;
      }
    }
    double largest = 0.0;
    for (Eigen::Index r = 0; r < k; ++r) {
      const std::size_t b = variables[static_cast<std::size_t>(r)];
      const double t = p.basis_total[b];
      magnitude += std::abs(t * x[b]);
      gradient[r] -= t;
      largest = std::max(largest, std::abs(gradient[r]) / std::max(std::abs(t), 1e-300));
    }
    if (largest < tolerance) return;  // close enough for a start: Newton on the full problem finishes
    // A tiny ridge keeps the factorisation defined where a variable's species have all but vanished.
    hessian.diagonal().array() += 1e-14 * std::max(size, 1e-300);
    step = hessian.ldlt().solve(-gradient);
    // At most a factor e^10 per step, by shortening the whole step so its direction stays a descent one.
    const double longest = step.cwiseAbs().maxCoeff();
    if (longest > 10.0) step *= 10.0 / longest;
    const double slope = gradient.dot(step);
    // Near the minimum the decrease Newton predicts falls below the rounding error of G and the
    // Armijo test can no longer tell a better point: the full step is then the answer.
    if (-slope <= 64.0 * std::numeric_limits<double>::epsilon() * magnitude) {
      for (Eigen::Index r = 0; r < k; ++r) {
        const std::size_t b = variables[static_cast<std::size_t>(r)];
        x[b] = std::clamp(x[b] + step[r], lowest_log, highest_log);
      }
      return;
    }
    // Armijo backtracking on G, which is convex: any descent direction admits a decreasing step.
    const double g0 = dual(x);
    double lambda = 1.0;
    bool moved = false;
    for (int halving = 0; halving < 40; ++halving, lambda *= 0.5) {
      std::copy(x.begin(), x.end(), trial.begin());
      for (Eigen::Index r = 0; r < k; ++r) {
        const std::size_t b = variables[static_cast<std::size_t>(r)];
        trial[b] = std::clamp(x[b] + lambda * step[r], lowest_log, highest_log);
      }
      if (dual(trial) <= g0 + 1e-4 * lambda * slope) {
        moved = true;
        break;
      }
    }
    if (!moved) return;
    std::copy(trial.begin(), trial.end(), x.begin());
  }
}

}  // namespace protonflow::thermo::detail
