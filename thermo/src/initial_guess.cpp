#include "initial_guess.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace protonflow::thermo::detail {

namespace {

// Keeps exp() finite: molalities between 1e-304 and e^40 cover every physical case.
constexpr double lowest_log = -700.0;
constexpr double highest_log = 40.0;
constexpr std::size_t not_a_variable = static_cast<std::size_t>(-1);

}  // namespace

// The variables (swept basis species with at least one present solute) and, per present solute, its
// non-zero coefficients on the variables and on the basis species that are not variables (which stay
// where they are, so their terms join ln K in a constant): the gradient Σ_i ν_i m_i and the Hessian
// Σ_i ν_i ν_iᵀ m_i are sums over these alone.
void prepare_ideal_dual(const GuessProblem& p, DualWorkspace& w) {
  // A swept basis species is a variable where some present solute is built from it.
  constexpr std::size_t unused = not_a_variable - 1;
  w.variable_index.assign(p.basis_count, not_a_variable);
  for (std::size_t i = 0; i < p.solute_count; ++i)
    if (p.present[i])
      for (std::size_t b = 0; b < p.basis_count; ++b)
        if (p.swept[b] && p.stoichiometry[i * p.basis_count + b] != 0.0) w.variable_index[b] = unused;
  w.variables.clear();
  for (std::size_t b = 0; b < p.basis_count; ++b) {
    if (w.variable_index[b] != unused) continue;
    w.variable_index[b] = w.variables.size();
    w.variables.push_back(b);
  }
  w.solutes.clear();
  w.entries.clear();
  w.first_entry.assign(1, 0);
  w.fixed_terms.clear();
  w.first_fixed_term.assign(1, 0);
  for (std::size_t i = 0; i < p.solute_count; ++i) {
    if (!p.present[i]) continue;
    for (std::size_t b = 0; b < p.basis_count; ++b) {
      const double nu = p.stoichiometry[i * p.basis_count + b];
      if (nu == 0.0) continue;
      if (w.variable_index[b] == not_a_variable)
        w.fixed_terms.push_back({b, nu});
      else
        w.entries.push_back({w.variable_index[b], nu});
    }
    w.solutes.push_back(i);
    w.first_entry.push_back(w.entries.size());
    w.first_fixed_term.push_back(w.fixed_terms.size());
  }
  const std::size_t k = w.variables.size(), solutes = w.solutes.size();
  w.products.clear();
  w.first_product.assign(1, 0);
  for (std::size_t j = 0; j < solutes; ++j) {
    for (std::size_t e = w.first_entry[j]; e < w.first_entry[j + 1]; ++e)
      for (std::size_t f = w.first_entry[j]; f < w.first_entry[j + 1]; ++f)
        if (w.entries[f].variable <= w.entries[e].variable)
          w.products.push_back({w.entries[e].variable * k + w.entries[f].variable, w.entries[e].coefficient * w.entries[f].coefficient});
    w.first_product.push_back(w.products.size());
  }
  // The same entries by variable: counted, then placed (first_use[r + 1] runs as the next free place).
  w.first_use.assign(k + 1, 0);
  for (const auto& entry : w.entries) ++w.first_use[entry.variable + 1];
  for (std::size_t r = 0; r < k; ++r) w.first_use[r + 1] += w.first_use[r];
  w.uses.resize(w.entries.size());
  for (std::size_t j = 0; j < solutes; ++j)
    for (std::size_t e = w.first_entry[j]; e < w.first_entry[j + 1]; ++e)
      w.uses[w.first_use[w.entries[e].variable]++] = {j, w.entries[e].coefficient};
  for (std::size_t r = k; r > 0; --r) w.first_use[r] = w.first_use[r - 1];  // back to the starts
  w.first_use[0] = 0;
  for (auto* v : {&w.value, &w.total, &w.gradient, &w.step, &w.trial_value}) v->resize(k);
  for (auto* v : {&w.offset, &w.exponent, &w.molality, &w.direction, &w.trial_exponent, &w.trial_molality}) v->resize(solutes);
  w.hessian.resize(k * k);
}

namespace {

double exponent_at(const DualWorkspace& w, const double* value, std::size_t j) {
  double exponent = w.offset[j];
  for (std::size_t e = w.first_entry[j]; e < w.first_entry[j + 1]; ++e)
    exponent += w.entries[e].coefficient * value[w.entries[e].variable];
  return exponent;
}

// Newton on G moves a molality that starts far above its balance down by only about a factor e per
// step (the exponential dominates the step), e.g. hydrogencarbonate at 1e3 times the carbon total
// when carbonate starts at that total and H^+ at 1e-7. Two Gauss–Seidel sweeps over the variables
// other than H^+ first bring each balance's positive part Σ_i ν_ib⁺ m_i to within a factor e of t_b,
// raising no molality above e^10; a start already that close is left as it is. Only the start
// changes: the minimisation after it is the same. The exponents and molalities at the start are kept
// current: a move of x_b updates those of the solutes built from b alone.
void balance_start(DualWorkspace& w) {
  const std::size_t k = w.variables.size();
  for (int sweep = 0; sweep < 2; ++sweep) {
    bool moved = false;
    for (std::size_t r = 0; r < k; ++r) {
      const double t = w.total[r];
      if (w.variables[r] == 0 || !(t > 0.0)) continue;
      double held = 0.0;  // Σ_i ν_ib⁺ m_i
      double largest_coefficient = 0.0;
      double room = std::numeric_limits<double>::infinity();  // how far x_b may rise
      for (std::size_t use = w.first_use[r]; use < w.first_use[r + 1]; ++use) {
        const double nu = w.uses[use].coefficient;
        if (nu <= 0.0) continue;
        const std::size_t j = w.uses[use].solute;
        held += nu * w.molality[j];
        largest_coefficient = std::max(largest_coefficient, nu);
        room = std::min(room, (10.0 - w.exponent[j]) / nu);
      }
      if (!(held > 0.0)) continue;
      const double excess = std::log(held / t);
      if (std::abs(excess) <= 1.0) continue;
      const double move = std::min(-excess / largest_coefficient, std::max(room, 0.0));
      w.value[r] += move;
      for (std::size_t use = w.first_use[r]; use < w.first_use[r + 1]; ++use) {
        const std::size_t j = w.uses[use].solute;
        w.exponent[j] += w.uses[use].coefficient * move;
        w.molality[j] = std::exp(std::clamp(w.exponent[j], lowest_log, highest_log));
      }
      moved = true;
    }
    if (!moved) return;
  }
}

// Solves H p = −g for the symmetric positive (semi-)definite Hessian by Cholesky, H = L Lᵀ, in place
// on H's lower triangle [golub-van-loan-2013, §4.2]. A pivot that rounding leaves at or below zero
// (a variable whose species have all but vanished) is taken as the ridge instead: that direction is
// then one of almost no curvature, and the step's length limit bounds the move along it.
void newton_step(DualWorkspace& w, double ridge) {
  const std::size_t k = w.variables.size();
  double* h = w.hessian.data();
  for (std::size_t r = 0; r < k; ++r) {  // row r of L from the rows above it
    double* row = h + r * k;
    for (std::size_t c = 0; c < r; ++c) {
      const double* above = h + c * k;
      double value = row[c];
      for (std::size_t s = 0; s < c; ++s) value -= row[s] * above[s];
      row[c] = value / above[c];
    }
    double pivot = row[r];
    for (std::size_t s = 0; s < r; ++s) pivot -= row[s] * row[s];
    row[r] = std::sqrt(pivot > 0.0 ? pivot : ridge);
  }
  double* p = w.step.data();
  for (std::size_t r = 0; r < k; ++r) {  // L y = −g
    const double* row = h + r * k;
    double value = -w.gradient[r];
    for (std::size_t s = 0; s < r; ++s) value -= row[s] * p[s];
    p[r] = value / row[r];
  }
  for (std::size_t r = k; r-- > 0;) {  // Lᵀ p = y
    double value = p[r];
    for (std::size_t s = r + 1; s < k; ++s) value -= h[s * k + r] * p[s];
    p[r] = value / h[r * k + r];
  }
}

}  // namespace

void minimise_ideal_dual(const GuessProblem& p, std::span<double> x, int iterations, double tolerance, DualWorkspace& w) {
  const std::size_t k = w.variables.size(), solutes = w.solutes.size();
  if (k == 0) return;
  for (std::size_t r = 0; r < k; ++r) {
    w.value[r] = std::isfinite(x[w.variables[r]]) ? x[w.variables[r]] : std::log(1e-7);
    w.total[r] = p.basis_total[w.variables[r]];
  }
  for (std::size_t j = 0; j < solutes; ++j) {
    double constant = p.ln_k[w.solutes[j]];
    for (std::size_t f = w.first_fixed_term[j]; f < w.first_fixed_term[j + 1]; ++f)
      constant += w.fixed_terms[f].coefficient * x[w.fixed_terms[f].basis];
    w.offset[j] = constant;
    w.exponent[j] = exponent_at(w, w.value.data(), j);
  }
  // Start where every molality is at most e^10: lower the variables other than H^+ together until
  // the most concentrated solute comes down there (no solute has a negative coefficient on them).
  double shift = 0.0;
  for (std::size_t j = 0; j < solutes; ++j) {
    double weight = 0.0;
    for (std::size_t e = w.first_entry[j]; e < w.first_entry[j + 1]; ++e)
      if (w.variables[w.entries[e].variable] != 0) weight += std::max(0.0, w.entries[e].coefficient);
    const double excess = w.exponent[j] - 10.0;
    if (excess > 0.0 && weight > 0.0) shift = std::max(shift, excess / weight);
  }
  if (shift > 0.0) {
    for (std::size_t r = 0; r < k; ++r)
      if (w.variables[r] != 0) w.value[r] -= shift;
    for (std::size_t j = 0; j < solutes; ++j) w.exponent[j] = exponent_at(w, w.value.data(), j);
  }
  for (std::size_t j = 0; j < solutes; ++j) w.molality[j] = std::exp(std::clamp(w.exponent[j], lowest_log, highest_log));
  balance_start(w);

  // G(x) = Σ_i m_i − Σ_b t_b x_b over the variables; +∞ where a molality would leave the finite range,
  // so the line search never steps into the region where exp() is clamped and G no longer convex.
  // The molalities at a point are kept: those of an accepted trial serve the next iteration.
  const auto dual_of = [&](const double* value, const double* exponent, const double* molality) {
    double sum = 0.0;
    for (std::size_t j = 0; j < solutes; ++j) {
      if (exponent[j] > highest_log) return std::numeric_limits<double>::infinity();
      sum += molality[j];
    }
    for (std::size_t r = 0; r < k; ++r) sum -= w.total[r] * value[r];
    return sum;
  };
  const auto finish = [&] {
    for (std::size_t r = 0; r < k; ++r) x[w.variables[r]] = w.value[r];
  };
  double g0 = dual_of(w.value.data(), w.exponent.data(), w.molality.data());
  for (int iteration = 0; iteration < iterations; ++iteration) {
    std::fill(w.gradient.begin(), w.gradient.end(), 0.0);
    double size = 0.0;       // Σ |ν| m: the scale the gradient is measured against
    double magnitude = 0.0;  // Σ m + Σ |t x|: the scale of G's rounding error
    for (std::size_t j = 0; j < solutes; ++j) {
      const double m = w.molality[j];
      magnitude += m;
      for (std::size_t e = w.first_entry[j]; e < w.first_entry[j + 1]; ++e) {
        const double nu_m = w.entries[e].coefficient * m;
        w.gradient[w.entries[e].variable] += nu_m;
        size += std::abs(nu_m);
      }
    }
    double largest = 0.0;
    for (std::size_t r = 0; r < k; ++r) {
      const double t = w.total[r];
      magnitude += std::abs(t * w.value[r]);
      w.gradient[r] -= t;
      largest = std::max(largest, std::abs(w.gradient[r]) / std::max(std::abs(t), 1e-300));
    }
    if (largest < tolerance) break;  // close enough for a start: Newton on the full problem finishes
    std::fill(w.hessian.begin(), w.hessian.end(), 0.0);
    for (std::size_t j = 0; j < solutes; ++j)
      for (std::size_t q = w.first_product[j]; q < w.first_product[j + 1]; ++q)
        w.hessian[w.products[q].index] += w.products[q].coefficient * w.molality[j];
    // A tiny ridge keeps the factorisation defined where a variable's species have all but vanished.
    const double ridge = 1e-14 * std::max(size, 1e-300);
    for (std::size_t r = 0; r < k; ++r) w.hessian[r * k + r] += ridge;
    newton_step(w, ridge);
    // At most a factor e^10 per step, by shortening the whole step so its direction stays a descent one.
    double longest = 0.0, slope = 0.0;
    for (std::size_t r = 0; r < k; ++r) longest = std::max(longest, std::abs(w.step[r]));
    if (longest > 10.0)
      for (double& s : w.step) s *= 10.0 / longest;
    for (std::size_t r = 0; r < k; ++r) slope += w.gradient[r] * w.step[r];
    // Near the minimum the decrease Newton predicts falls below the rounding error of G and the
    // Armijo test can no longer tell a better point: the full step is then the answer.
    if (-slope <= 64.0 * std::numeric_limits<double>::epsilon() * magnitude) {
      for (std::size_t r = 0; r < k; ++r) w.value[r] = std::clamp(w.value[r] + w.step[r], lowest_log, highest_log);
      break;
    }
    // Armijo backtracking on G, which is convex: any descent direction admits a decreasing step.
    // Along the step each exponent moves linearly, by λ Σ_b ν_ib p_b, unless a variable is clamped.
    for (std::size_t j = 0; j < solutes; ++j) {
      double change = 0.0;
      for (std::size_t e = w.first_entry[j]; e < w.first_entry[j + 1]; ++e)
        change += w.entries[e].coefficient * w.step[w.entries[e].variable];
      w.direction[j] = change;
    }
    double lambda = 1.0, trial_dual = 0.0;
    bool moved = false;
    for (int halving = 0; halving < 40; ++halving, lambda *= 0.5) {
      bool clamped = false;
      for (std::size_t r = 0; r < k; ++r) {
        const double unclamped = w.value[r] + lambda * w.step[r];
        w.trial_value[r] = std::clamp(unclamped, lowest_log, highest_log);
        clamped = clamped || w.trial_value[r] != unclamped;
      }
      for (std::size_t j = 0; j < solutes; ++j)
        w.trial_exponent[j] = clamped ? exponent_at(w, w.trial_value.data(), j) : w.exponent[j] + lambda * w.direction[j];
      for (std::size_t j = 0; j < solutes; ++j)
        w.trial_molality[j] = std::exp(std::clamp(w.trial_exponent[j], lowest_log, highest_log));
      trial_dual = dual_of(w.trial_value.data(), w.trial_exponent.data(), w.trial_molality.data());
      if (trial_dual <= g0 + 1e-4 * lambda * slope) {
        moved = true;
        break;
      }
    }
    if (!moved) break;
    w.value.swap(w.trial_value);
    w.exponent.swap(w.trial_exponent);
    w.molality.swap(w.trial_molality);
    g0 = trial_dual;
  }
  finish();
}

void solve_small_system(std::size_t size, std::span<double> a, std::span<double> b, std::span<double> solution,
                        std::vector<std::size_t>& column_order) {
  column_order.resize(size);
  for (std::size_t c = 0; c < size; ++c) column_order[c] = c;
  const auto at = [&](std::size_t r, std::size_t c) -> double& { return a[r * size + c]; };
  std::size_t rank = size;
  double first_pivot = 0.0;
  for (std::size_t c = 0; c < size; ++c) {
    std::size_t pivot_row = c, pivot_column = c;
    double best = 0.0;
    for (std::size_t r = c; r < size; ++r)
      for (std::size_t q = c; q < size; ++q)
        if (std::abs(at(r, q)) > best) {
          best = std::abs(at(r, q));
          pivot_row = r;
          pivot_column = q;
        }
    if (c == 0) first_pivot = best;
    // A pivot below rounding of the largest: the rest of the matrix is zero to working precision.
    if (!(best > static_cast<double>(size) * std::numeric_limits<double>::epsilon() * first_pivot)) {
      rank = c;
      break;
    }
    for (std::size_t q = 0; q < size; ++q) std::swap(at(c, q), at(pivot_row, q));
    std::swap(b[c], b[pivot_row]);
    for (std::size_t r = 0; r < size; ++r) std::swap(at(r, c), at(r, pivot_column));
    std::swap(column_order[c], column_order[pivot_column]);
    for (std::size_t r = c + 1; r < size; ++r) {
      const double factor = at(r, c) / at(c, c);
      if (factor == 0.0) continue;
      for (std::size_t q = c + 1; q < size; ++q) at(r, q) -= factor * at(c, q);
      b[r] -= factor * b[c];
    }
  }
  // Back-substitution over the pivots found; the unknowns without one are zero. b holds the result.
  for (std::size_t c = size; c-- > 0;) {
    if (c >= rank) {
      b[c] = 0.0;
      continue;
    }
    double value = b[c];
    for (std::size_t q = c + 1; q < rank; ++q) value -= at(c, q) * b[q];
    b[c] = value / at(c, c);
  }
  for (std::size_t c = 0; c < size; ++c) solution[column_order[c]] = b[c];
}

}  // namespace protonflow::thermo::detail
