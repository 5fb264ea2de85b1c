// Combinations of slate components for a basis change: least squares on the components' basis
// compositions over every small support, kept where the snapped coefficients reproduce the change
// exactly (docs/units.md, "The unit chemistry library").
#include <protonflow/units/component_combinations.hpp>

#include <Eigen/Dense>

#include <algorithm>
#include <cmath>

namespace protonflow::units {

namespace {

// Snaps a coefficient found by least squares onto a simple fraction (denominator up to 12), the
// form every stoichiometric coefficient of the data has.
double snap(double x) {
  for (int d = 1; d <= 12; ++d) {
    const double scaled = x * d;
    if (std::abs(scaled - std::round(scaled)) < 1e-9 * d) return std::round(scaled) / d;
  }
  return x;
}

}  // namespace

std::vector<std::vector<double>> component_combinations(const thermo::ChemicalSystem& system, std::span<const double> target,
                                                        std::size_t most_components, CombinationSigns signs) {
  const std::size_t rows = target.size();
  const std::size_t nc = system.components().size();
  Eigen::MatrixXd a(rows, nc);
  for (std::size_t c = 0; c < nc; ++c) {
    for (std::size_t b = 0; b + 1 < rows; ++b) a(static_cast<Eigen::Index>(b), static_cast<Eigen::Index>(c)) = system.composition(c)[b];
    a(static_cast<Eigen::Index>(rows - 1), static_cast<Eigen::Index>(c)) = system.water_in(c);
  }
  Eigen::VectorXd v(rows);
  for (std::size_t r = 0; r < rows; ++r) v(static_cast<Eigen::Index>(r)) = target[r];
  const double scale = 1.0 + v.lpNorm<Eigen::Infinity>();

  std::vector<std::vector<double>> found;
  std::vector<std::vector<std::size_t>> supports;
  const auto try_support = [&](const std::vector<std::size_t>& s) {
    for (const auto& known : supports) {
      if (std::ranges::includes(s, known)) return;  // a smaller combination already covers it
    }
    Eigen::MatrixXd sub(rows, s.size());
    for (std::size_t j = 0; j < s.size(); ++j) sub.col(static_cast<Eigen::Index>(j)) = a.col(static_cast<Eigen::Index>(s[j]));
    const Eigen::VectorXd x = sub.colPivHouseholderQr().solve(v);
    std::vector<double> full(nc, 0.0);
    Eigen::VectorXd snapped(static_cast<Eigen::Index>(s.size()));
    for (std::size_t j = 0; j < s.size(); ++j) {
      const double coefficient = snap(x(static_cast<Eigen::Index>(j)));
      if (coefficient == 0.0 || !std::isfinite(coefficient)) return;  // a smaller support serves
      if (signs == CombinationSigns::non_negative && coefficient < 0.0) return;
      full[s[j]] = coefficient;
      snapped(static_cast<Eigen::Index>(j)) = coefficient;
    }
    if ((sub * snapped - v).lpNorm<Eigen::Infinity>() > 1e-12 * scale) return;
    found.push_back(std::move(full));
    supports.push_back(s);
  };
  // Supports of size k in lexicographic order of slate indices.
  for (std::size_t k = 1; k <= std::min(most_components, nc); ++k) {
    std::vector<std::size_t> s(k);
    for (std::size_t j = 0; j < k; ++j) s[j] = j;
    while (true) {
      try_support(s);
      std::size_t j = k;
      while (j > 0 && s[j - 1] == nc - k + (j - 1)) --j;
      if (j == 0) break;
      ++s[j - 1];
      for (std::size_t i = j; i < k; ++i) s[i] = s[i - 1] + 1;
    }
  }
  return found;
}

}  // namespace protonflow::units
