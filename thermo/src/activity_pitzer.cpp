// The Pitzer ion-interaction model (Pitzer 1973, J. Phys. Chem. 77, 268; Pitzer 1991, Activity
// Coefficients in Electrolyte Solutions, ch. 3; mixing terms as in Harvie, Møller & Weare 1984).
//
// Everything derives from one excess Gibbs energy per kilogram of water,
//   g = G^ex/(w_w R T) = f(I) + Σ_pairs m_i m_j P_ij(I) + Σ_triples m_i m_j m_k T_ijk + Z Σ_ca m_c m_a C_ca,
// so that ln γ_k = ∂g/∂m_k, ∂ln γ_k/∂m_l = ∂²g/∂m_k∂m_l (symmetric) and
// ln a_w = −M_w (Σ m + Σ m_k ln γ_k − g): the osmotic coefficient and every activity come from the
// same expression and obey Gibbs–Duhem exactly. The pair functions P are 2B_ca (cation–anion),
// 2Φ_ij = 2(θ_ij + Eθ_ij(I)) (same sign), 2λ_nj or λ_nn (neutral); the triples are ψ and ζ.
#include "protonflow/thermo/activity_pitzer.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdlib>
#include <fmt/format.h>
#include <unordered_map>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/water_properties.hpp"

namespace protonflow::thermo {

namespace {

constexpr double debye_huckel_b = 1.2;  // b, kg^½ mol^-½, for every salt (Pitzer 1973)

// A function of I with its first two derivatives.
struct Curve {
  double value = 0.0, first = 0.0, second = 0.0;
};

// Pitzer's g(x) = 2[1 − (1 + x) e^−x]/x² and its first two derivatives in x; a series below
// x = 0.05, where the closed form loses digits to cancellation.
Curve pitzer_g(double x) {
  if (x < 0.05) {
    // g = Σ_{k≥2} 2(−1)^k (k−1)/k! x^(k−2)
    Curve c;
    double factorial = 2.0, power = 1.0;
    for (int k = 2; k < 12; ++k) {
      if (k > 2) factorial *= k;
      const double coefficient = 2.0 * ((k % 2) ? -1.0 : 1.0) * (k - 1) / factorial;
      const int p = k - 2;
      c.value += coefficient * power;
      if (p >= 1) c.first += coefficient * p * std::pow(x, p - 1);
      if (p >= 2) c.second += coefficient * p * (p - 1) * std::pow(x, p - 2);
      power *= x;
    }
    return c;
  }
  const double e = std::exp(-x);
  const double h = 1.0 - (1.0 + x) * e;  // h' = x e^−x, h'' = (1 − x) e^−x
  const double h1 = x * e, h2 = (1.0 - x) * e;
  const double x2 = x * x;
  return {2.0 * h / x2, 2.0 * h1 / x2 - 4.0 * h / (x2 * x), 2.0 * h2 / x2 - 8.0 * h1 / (x2 * x) + 12.0 * h / (x2 * x2)};
}

// g(α√I) as a function of I: d/dI = g'(x) x/(2I), d²/dI² = [g''(x) x² − g'(x) x]/(4I²).
Curve pitzer_g_of_ionic_strength(double alpha, double ionic_strength) {
  const double x = alpha * std::sqrt(ionic_strength);
  const Curve g = pitzer_g(x);
  return {g.value, g.first * x / (2.0 * ionic_strength),
          (g.second * x * x - g.first * x) / (4.0 * ionic_strength * ionic_strength)};
}

// Archer's (1992) h(x) = [6 − (6 + 6x + 3x² + x³) e^−x]/x⁴ of the C¹ term and its first two
// derivatives; h = Σ_k (−1)^k x^k / (k! (k + 4)) below x = 1, where the closed form cancels.
Curve archer_h(double x) {
  if (x < 1.0) {
    Curve c;
    double term = 1.0;  // (−1)^k x^k / k!
    for (int k = 0; k < 30; ++k) {
      c.value += term / (k + 4);
      if (k >= 1) c.first += term * k / (x * (k + 4));
      if (k >= 2) c.second += term * k * (k - 1) / (x * x * (k + 4));
      term *= -x / (k + 1);
    }
    return c;
  }
  // N = 6 − (6 + 6x + 3x² + x³) e^−x, N' = x³ e^−x, N'' = (3x² − x³) e^−x
  const double e = std::exp(-x);
  const double n0 = 6.0 - (6.0 + x * (6.0 + x * (3.0 + x))) * e;
  const double n1 = x * x * x * e, n2 = (3.0 - x) * x * x * e;
  const double x4 = x * x * x * x;
  return {n0 / x4, n1 / x4 - 4.0 * n0 / (x4 * x), n2 / x4 - 8.0 * n1 / (x4 * x) + 20.0 * n0 / (x4 * x * x)};
}

// h(ω√I) as a function of I, with the same chain rule as g(α√I).
Curve archer_h_of_ionic_strength(double omega, double ionic_strength) {
  const double x = omega * std::sqrt(ionic_strength);
  const Curve h = archer_h(x);
  return {h.value, h.first * x / (2.0 * ionic_strength),
          (h.second * x * x - h.first * x) / (4.0 * ionic_strength * ionic_strength)};
}

// J(x) of the unsymmetrical mixing terms, Pitzer (1975), J. Solution Chem. 4, 249, eq. 47:
// J = x / (4 + C1 x^−C2 exp(−C3 x^C4)), C1 = 4.581, C2 = 0.7237, C3 = 0.0120, C4 = 0.528 (from
// memory); with its first two derivatives in x.
Curve pitzer_j(double x) {
  if (x <= 0.0) return {};
  constexpr double c1 = 4.581, c2 = 0.7237, c3 = 0.0120, c4 = 0.528;
  const double u = c1 * std::pow(x, -c2) * std::exp(-c3 * std::pow(x, c4));
  const double a = -c2 / x - c3 * c4 * std::pow(x, c4 - 1.0);  // u'/u
  const double da = c2 / (x * x) - c3 * c4 * (c4 - 1.0) * std::pow(x, c4 - 2.0);
  const double u1 = u * a, u2 = u * (a * a + da);
  const double d = 4.0 + u;
  return {x / d, (d - x * u1) / (d * d), (-x * u2 * d - 2.0 * u1 * (d - x * u1)) / (d * d * d)};
}

// J(x_ij) as a function of I, x_ij = 6 z_i z_j A_φ √I: d/dI = J'(x) x/(2I), d²/dI² = [J''x² − J'x]/(4I²).
Curve pitzer_j_of_ionic_strength(int charge_product, double a_phi, double ionic_strength) {
  const double i = ionic_strength;
  const double x = 6.0 * charge_product * a_phi * std::sqrt(i);
  const Curve j = pitzer_j(x);
  return {j.value, j.first * x / (2.0 * i), (j.second * x * x - j.first * x) / (4.0 * i * i)};
}

// Eθ_ij(I) = (z_i z_j / 4I) [J(x_ij) − ½J(x_ii) − ½J(x_jj)] (Pitzer 1975), given the three J(I).
Curve e_theta(int zi, int zj, const Curve& j_ij, const Curve& j_ii, const Curve& j_jj, double ionic_strength) {
  const double i = ionic_strength;
  const Curve s{j_ij.value - 0.5 * (j_ii.value + j_jj.value), j_ij.first - 0.5 * (j_ii.first + j_jj.first),
                j_ij.second - 0.5 * (j_ii.second + j_jj.second)};
  const double k = zi * zj / 4.0;
  return {k * s.value / i, k * (s.first / i - s.value / (i * i)),
          k * (s.second / i - 2.0 * s.first / (i * i) + 2.0 * s.value / (i * i * i))};
}

// Charge products z_i z_j up to this have their J(x) computed once per evaluation.
constexpr int largest_memo_charge_product = 16;

enum class PairKind { cation_anion, same_sign, neutral };

struct PairTerm {
  std::size_t i, j;
  PairKind kind;
  // the parameters as functions of T, copied so that the model outlives the parameter set it was built from
  PitzerCoefficient beta0_t{}, beta1_t{}, beta2_t{}, c_phi_t{}, c1_t{};  // cation–anion pairs
  double alpha1 = 2.0, alpha2 = 0.0, alpha1_reciprocal_T = 0.0, omega = 2.5;
  double minimum_temperature = 0.0, maximum_temperature = 1e9;  // K, the fit's range: held at its edges
  std::size_t alpha1_index = 0, alpha2_index = 0;  // into Impl::alphas
  PitzerCoefficient constant_t{};  // θ or λ (zero for a pair with Eθ alone)
  // the same at the cached temperature; c = C⁰ = Cφ/(2√|z_c z_a|), c1 = C¹
  double beta0 = 0, beta1 = 0, beta2 = 0, c = 0, c1 = 0, constant = 0;
};

struct TripleTerm {
  std::size_t i, j, k;
  PitzerCoefficient coefficient;
  double value = 0;
};

}  // namespace

struct PitzerModel::Impl {
  SoluteProperties solutes;
  double maximum_ionic_strength = 6.0;
  // parameters evaluated at the cached temperature live in the terms
  mutable std::vector<PairTerm> pairs;
  mutable std::vector<TripleTerm> triples;
  std::vector<std::string> without_parameters;

  // per-temperature cache and scratch: one model belongs to one solver, never shared between threads
  mutable double cached_temperature = -1.0;
  mutable double a_phi = 0.0;
  mutable std::vector<Curve> pair_curves;
  mutable std::vector<double> third_virial;  // C^T(I) of each cation–anion pair at the last evaluation
  // the α of every binary pair, each g(α√I) computed once per evaluation
  // (an α that varies with T has a slot of its own, set with the temperature)
  mutable std::vector<double> alphas;
  mutable std::vector<Curve> alpha_curves;
  // J(x) of each charge product, computed at most once per evaluation
  mutable std::array<Curve, largest_memo_charge_product + 1> j_curves{};
  mutable std::array<bool, largest_memo_charge_product + 1> j_known{};
  mutable std::vector<double> r;        // R_k = Σ_{pairs ∋ k} m_other P'
  mutable std::vector<double> d_q;      // ∂Q/∂m_k at constant I
  mutable std::vector<double> d_q1;     // ∂Q'/∂m_k at constant I (Q' = ∂Q/∂I, from the C¹ terms)
  mutable std::vector<double> gradient;  // ln γ

  void set_temperature(double temperature, double pressure) const {
    if (temperature == cached_temperature) return;
    // A_φ = A ln10 / 3, A the Debye–Hückel constant of the engine's water properties (Pitzer 1991, eq. 3.9).
    a_phi = debye_huckel_parameters(temperature, pressure).a * constants::ln10 / 3.0;
    for (PairTerm& p : pairs) {
      if (p.kind == PairKind::cation_anion) {
        const double t = std::clamp(temperature, p.minimum_temperature, p.maximum_temperature);
        p.beta0 = p.beta0_t.at(t);
        p.beta1 = p.beta1_t.at(t);
        p.beta2 = p.beta2_t.at(t);
        // C = Cφ / (2 √|z_c z_a|) (Pitzer 1991, eq. 3.63)
        p.c = p.c_phi_t.at(t) / (2.0 * std::sqrt(std::abs(static_cast<double>(solutes.charge[p.i] * solutes.charge[p.j]))));
        p.c1 = p.c1_t.at(t);
        if (p.alpha1_reciprocal_T != 0.0)
          alphas[p.alpha1_index] = p.alpha1 + p.alpha1_reciprocal_T * (1.0 / t - 1.0 / constants::reference_temperature);
      }
      p.constant = p.constant_t.at(temperature);
    }
    for (TripleTerm& t : triples) t.value = t.coefficient.at(temperature);
    cached_temperature = temperature;
  }

  Curve j_curve(int charge_product, double ionic_strength) const {
    if (charge_product > largest_memo_charge_product) return pitzer_j_of_ionic_strength(charge_product, a_phi, ionic_strength);
    if (!j_known[charge_product]) {
      j_curves[charge_product] = pitzer_j_of_ionic_strength(charge_product, a_phi, ionic_strength);
      j_known[charge_product] = true;
    }
    return j_curves[charge_product];
  }

  // P(I) of one pair with its derivatives in I.
  Curve pair_curve(const PairTerm& p, double ionic_strength) const {
    switch (p.kind) {
      case PairKind::cation_anion: {
        // P = 2B, B = β⁰ + β¹ g(α₁√I) + β² g(α₂√I)
        Curve b{p.beta0, 0.0, 0.0};
        if (p.beta1 != 0.0) {
          const Curve& g = alpha_curves[p.alpha1_index];
          b.value += p.beta1 * g.value, b.first += p.beta1 * g.first, b.second += p.beta1 * g.second;
        }
        if (p.beta2 != 0.0) {
          const Curve& g = alpha_curves[p.alpha2_index];
          b.value += p.beta2 * g.value, b.first += p.beta2 * g.first, b.second += p.beta2 * g.second;
        }
        return {2.0 * b.value, 2.0 * b.first, 2.0 * b.second};
      }
      case PairKind::same_sign: {
        Curve e{};
        const int zi = solutes.charge[p.i], zj = solutes.charge[p.j];
        if (zi != zj)
          e = e_theta(zi, zj, j_curve(zi * zj, ionic_strength), j_curve(zi * zi, ionic_strength),
                      j_curve(zj * zj, ionic_strength), ionic_strength);
        return {2.0 * (p.constant + e.value), 2.0 * e.first, 2.0 * e.second};
      }
      case PairKind::neutral: return {(p.i == p.j ? 1.0 : 2.0) * p.constant, 0.0, 0.0};
    }
    return {};
  }

  // Fills gradient (ln γ) and, if hessian is not null, the n×n Hessian; returns g.
  double evaluate_g(std::span<const double> m, double* hessian, double* ionic_strength_out) const {
    const std::size_t n = m.size();
    double ionic_strength = 0.0, z_sum = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
      const double z = solutes.charge[k];
      ionic_strength += 0.5 * z * z * m[k];
      z_sum += std::abs(z) * m[k];
    }
    if (ionic_strength_out) *ionic_strength_out = ionic_strength;
    // Below 1e-30 mol/kg every I-dependent term is multiplied by molalities that vanish faster.
    const double i = std::max(ionic_strength, 1e-30);
    const double root = std::sqrt(i);
    // f = −A_φ (4I/b) ln(1 + b√I), f' = −A_φ[(4/b) ln(1+b√I) + 2√I/(1+b√I)],
    // f'' = −A_φ[2/(√I(1+b√I)) + 1/(√I(1+b√I)²)]
    constexpr double b = debye_huckel_b;
    const double log_term = std::log1p(b * root);
    const double f = -a_phi * 4.0 * ionic_strength / b * log_term;
    const double f1 = -a_phi * (4.0 / b * log_term + 2.0 * root / (1.0 + b * root));
    const double f2 = -a_phi * (2.0 / (root * (1.0 + b * root)) + 1.0 / (root * (1.0 + b * root) * (1.0 + b * root)));

    std::fill(gradient.begin(), gradient.end(), 0.0);
    std::fill(r.begin(), r.end(), 0.0);
    std::fill(d_q.begin(), d_q.end(), 0.0);
    std::fill(d_q1.begin(), d_q1.end(), 0.0);
    // Q(I) = Σ_ca m_c m_a C^T_ca(I), C^T = C⁰ + 4C¹ h(ω√I) (Archer 1992); q1, q2 its I-derivatives
    double g = f, s1 = 0.0, s2 = 0.0, q = 0.0, q1 = 0.0, q2 = 0.0;
    for (std::size_t a = 0; a < alphas.size(); ++a) alpha_curves[a] = pitzer_g_of_ionic_strength(alphas[a], i);
    j_known.fill(false);
    for (std::size_t p = 0; p < pairs.size(); ++p) {
      const PairTerm& term = pairs[p];
      const Curve c = pair_curve(term, i);
      pair_curves[p] = c;
      const double mi = m[term.i], mj = m[term.j];
      g += mi * mj * c.value;
      s1 += mi * mj * c.first;
      s2 += mi * mj * c.second;
      if (term.i == term.j) {
        gradient[term.i] += 2.0 * mi * c.value;
        r[term.i] += 2.0 * mi * c.first;
      } else {
        gradient[term.i] += mj * c.value;
        gradient[term.j] += mi * c.value;
        r[term.i] += mj * c.first;
        r[term.j] += mi * c.first;
      }
      if (term.kind == PairKind::cation_anion && (term.c != 0.0 || term.c1 != 0.0)) {
        Curve c{term.c, 0.0, 0.0};
        if (term.c1 != 0.0) {
          const Curve h = archer_h_of_ionic_strength(term.omega, i);
          c.value += 4.0 * term.c1 * h.value, c.first = 4.0 * term.c1 * h.first, c.second = 4.0 * term.c1 * h.second;
        }
        third_virial[p] = c.value;
        q += mi * mj * c.value, q1 += mi * mj * c.first, q2 += mi * mj * c.second;
        d_q[term.i] += mj * c.value;
        d_q[term.j] += mi * c.value;
        d_q1[term.i] += mj * c.first;
        d_q1[term.j] += mi * c.first;
      } else {
        third_virial[p] = 0.0;
      }
    }
    for (const TripleTerm& t : triples) {
      g += m[t.i] * m[t.j] * m[t.k] * t.value;
      gradient[t.i] += m[t.j] * m[t.k] * t.value;
      gradient[t.j] += m[t.i] * m[t.k] * t.value;
      gradient[t.k] += m[t.i] * m[t.j] * t.value;
    }
    g += z_sum * q;
    for (std::size_t k = 0; k < n; ++k) {
      const double z = solutes.charge[k];
      gradient[k] += 0.5 * z * z * (f1 + s1 + z_sum * q1) + std::abs(z) * q + z_sum * d_q[k];
    }
    if (!hessian) return g;

    // ∂²g/∂m_k∂m_l = ¼z_k²z_l²(f'' + S2 + Z Q'') + ½z_k² R_l + ½z_l² R_k + (direct pair and triple terms)
    //               + |z_k| dQ/dm_l + |z_l| dQ/dm_k + Z (½z_l² ∂Q'/∂m_k + ½z_k² ∂Q'/∂m_l + ∂²Q/∂m_k∂m_l),
    // with dQ/dm = ∂Q/∂m + ½z² Q' the total derivative through I
    for (std::size_t k = 0; k < n; ++k) {
      const double half_zk2 = 0.5 * solutes.charge[k] * solutes.charge[k];
      const double abs_zk = std::abs(solutes.charge[k]);
      double* row = hessian + k * n;
      for (std::size_t l = 0; l < n; ++l) {
        const double half_zl2 = 0.5 * solutes.charge[l] * solutes.charge[l];
        const double abs_zl = std::abs(solutes.charge[l]);
        row[l] = half_zk2 * half_zl2 * (f2 + s2 + z_sum * q2) + half_zk2 * r[l] + half_zl2 * r[k] +
                 abs_zk * (d_q[l] + half_zl2 * q1) + abs_zl * (d_q[k] + half_zk2 * q1) +
                 z_sum * (half_zl2 * d_q1[k] + half_zk2 * d_q1[l]);
      }
    }
    for (std::size_t p = 0; p < pairs.size(); ++p) {
      const PairTerm& term = pairs[p];
      const double value = pair_curves[p].value;
      if (term.i == term.j) {
        hessian[term.i * n + term.i] += 2.0 * value;
      } else {
        double cross = value;
        if (term.kind == PairKind::cation_anion) cross += z_sum * third_virial[p];
        hessian[term.i * n + term.j] += cross;
        hessian[term.j * n + term.i] += cross;
      }
    }
    for (const TripleTerm& t : triples) {
      const auto add = [&](std::size_t a, std::size_t b2, double v) {
        hessian[a * n + b2] += v;
        hessian[b2 * n + a] += v;
      };
      add(t.i, t.j, m[t.k] * t.value);
      add(t.i, t.k, m[t.j] * t.value);
      add(t.j, t.k, m[t.i] * t.value);
    }
    return g;
  }
};

PitzerModel::PitzerModel(SoluteProperties solutes, const PitzerParameters& parameters) : impl_(std::make_unique<Impl>()) {
  Impl& d = *impl_;
  const std::size_t n = solutes.charge.size();
  if (solutes.name.size() != n)
    throw ThermoError(ErrorKind::bad_input, "the Pitzer model needs the name of every solute (SoluteProperties::name)");
  d.maximum_ionic_strength = parameters.maximum_ionic_strength;
  std::unordered_map<std::string, std::size_t> index;
  for (std::size_t k = 0; k < n; ++k) index.emplace(solutes.name[k], k);
  const auto find = [&](const std::string& name) -> std::ptrdiff_t {
    const auto it = index.find(name);
    return it == index.end() ? -1 : static_cast<std::ptrdiff_t>(it->second);
  };
  std::vector<bool> covered(n, false);
  std::vector<bool> shared_alpha;  // per slot of d.alphas: false for a temperature-dependent α
  for (const PitzerBinary& b : parameters.binary) {
    const auto c = find(b.cation), a = find(b.anion);
    if (c < 0 || a < 0) continue;
    PairTerm term{static_cast<std::size_t>(c), static_cast<std::size_t>(a), PairKind::cation_anion};
    term.beta0_t = b.beta0, term.beta1_t = b.beta1, term.beta2_t = b.beta2, term.c_phi_t = b.c_phi, term.c1_t = b.c1;
    term.alpha1 = b.alpha1, term.alpha2 = b.alpha2, term.alpha1_reciprocal_T = b.alpha1_reciprocal_T, term.omega = b.omega;
    term.minimum_temperature = b.minimum_temperature, term.maximum_temperature = b.maximum_temperature;
    // constant α's are shared between pairs; one that varies with T gets its own slot
    const auto slot = [&](double alpha, bool own) {
      if (!own)
        for (std::size_t a = 0; a < d.alphas.size(); ++a)
          if (shared_alpha[a] && d.alphas[a] == alpha) return a;
      d.alphas.push_back(alpha);
      shared_alpha.push_back(!own);
      return d.alphas.size() - 1;
    };
    term.alpha1_index = slot(b.alpha1, b.alpha1_reciprocal_T != 0.0);
    term.alpha2_index = slot(b.alpha2, false);
    d.pairs.push_back(term);
    covered[static_cast<std::size_t>(c)] = covered[static_cast<std::size_t>(a)] = true;
  }
  // Every pair of ions of the same sign: θ where published, Eθ wherever the charges differ.
  for (std::size_t i = 0; i < n; ++i)
    for (std::size_t j = i + 1; j < n; ++j) {
      const int zi = solutes.charge[i], zj = solutes.charge[j];
      if (zi == 0 || zj == 0 || (zi > 0) != (zj > 0)) continue;
      const PitzerCoefficient* theta = nullptr;
      const std::string& ni = solutes.name[i];
      const std::string& nj = solutes.name[j];
      for (const PitzerPair& t : parameters.theta)
        if ((t.first == ni && t.second == nj) || (t.first == nj && t.second == ni)) theta = &t.value;
      if (!theta && zi == zj) continue;
      PairTerm term{i, j, PairKind::same_sign};
      if (theta) term.constant_t = *theta;
      d.pairs.push_back(term);
    }
  for (const PitzerPair& l : parameters.lambda) {
    const auto a = find(l.first), b = find(l.second);
    if (a < 0 || b < 0) continue;
    PairTerm term{static_cast<std::size_t>(std::min(a, b)), static_cast<std::size_t>(std::max(a, b)), PairKind::neutral};
    term.constant_t = l.value;
    d.pairs.push_back(term);
    covered[static_cast<std::size_t>(a)] = true;
  }
  for (const auto* list : {&parameters.psi, &parameters.zeta})
    for (const PitzerTriple& t : *list) {
      const auto a = find(t.first), b = find(t.second), c = find(t.third);
      if (a < 0 || b < 0 || c < 0) continue;
      d.triples.push_back({static_cast<std::size_t>(a), static_cast<std::size_t>(b), static_cast<std::size_t>(c), t.value});
    }
  for (std::size_t k = 0; k < n; ++k)
    if (!covered[k]) d.without_parameters.push_back(solutes.name[k]);
  d.pair_curves.resize(d.pairs.size());
  d.third_virial.resize(d.pairs.size());
  d.alpha_curves.resize(d.alphas.size());
  d.r.resize(n);
  d.d_q.resize(n);
  d.d_q1.resize(n);
  d.gradient.resize(n);
  d.solutes = std::move(solutes);
}

PitzerModel::~PitzerModel() = default;

double PitzerModel::maximum_ionic_strength() const noexcept { return impl_->maximum_ionic_strength; }

const std::vector<std::string>& PitzerModel::species_without_parameters() const noexcept {
  return impl_->without_parameters;
}

void PitzerModel::evaluate(double temperature, double pressure, std::span<const double> m, ActivityEvaluation& out) const {
  const Impl& d = *impl_;
  const std::size_t n = m.size();
  d.set_temperature(temperature, pressure);
  const double g = d.evaluate_g(m, out.d_ln_gamma_d_molality.data(), &out.ionic_strength);
  // ln a_w = −M_w (Σm + Σ m_k ln γ_k − g); ∂ln a_w/∂m_l = −M_w (1 + Σ_k m_k ∂ln γ_k/∂m_l)
  constexpr double mw = constants::water_molar_mass;
  double total = 0.0, weighted = 0.0;
  for (std::size_t k = 0; k < n; ++k) {
    out.ln_gamma[k] = d.gradient[k];
    total += m[k];
    weighted += m[k] * d.gradient[k];
  }
  out.ln_water_activity = -mw * (total + weighted - g);
  for (std::size_t l = 0; l < n; ++l) {
    double sum = 0.0;
    for (std::size_t k = 0; k < n; ++k) sum += m[k] * out.d_ln_gamma_d_molality[k * n + l];
    out.d_ln_water_activity_d_molality[l] = -mw * (1.0 + sum);
  }
}

double PitzerModel::excess_gibbs_energy(double temperature, double pressure, std::span<const double> m) const {
  impl_->set_temperature(temperature, pressure);
  return impl_->evaluate_g(m, nullptr, nullptr);
}

double PitzerModel::relative_enthalpy(double temperature, double pressure, std::span<const double> m) const {
  // L/w_w = −R T² ∂g/∂T at constant m. The parameters are polynomials in T and A_φ comes from the
  // water properties, so a central difference over ±0.05 K is exact to about 1e-7 relative.
  constexpr double step = 0.05;
  const double up = excess_gibbs_energy(temperature + step, pressure, m);
  const double down = excess_gibbs_energy(temperature - step, pressure, m);
  return -constants::gas_constant * temperature * temperature * (up - down) / (2.0 * step);
}

double PitzerModel::relative_partial_enthalpies(double temperature, double pressure, std::span<const double> m,
                                                std::span<double> solutes) const {
  // Central differences over ±0.05 K of ln γ_i = ∂g/∂m_i and of g (as relative_enthalpy).
  constexpr double step = 0.05;
  const Impl& d = *impl_;
  const std::size_t n = m.size();
  d.set_temperature(temperature + step, pressure);
  const double g_up = d.evaluate_g(m, nullptr, nullptr);
  for (std::size_t k = 0; k < n; ++k) solutes[k] = d.gradient[k];
  d.set_temperature(temperature - step, pressure);
  const double g_down = d.evaluate_g(m, nullptr, nullptr);
  const double factor = -constants::gas_constant * temperature * temperature / (2.0 * step);
  double weighted = 0.0;  // Σ m_k ∂ln γ_k/∂T × 2 step
  for (std::size_t k = 0; k < n; ++k) {
    const double difference = solutes[k] - d.gradient[k];
    weighted += m[k] * difference;
    solutes[k] = factor * difference;
  }
  // ln a_w = −M_w (Σm + Σ m_k ln γ_k − g)
  return factor * -constants::water_molar_mass * (weighted - (g_up - g_down));
}

std::array<double, 3> pitzer_1975_j(double x) {
  const Curve j = pitzer_j(x);
  return {j.value, j.first, j.second};
}

std::unique_ptr<ActivityModel> make_pitzer_model(SoluteProperties solutes, const PitzerParameters& parameters) {
  return std::make_unique<PitzerModel>(std::move(solutes), parameters);
}

}  // namespace protonflow::thermo
