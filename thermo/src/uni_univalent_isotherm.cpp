#include "uni_univalent_isotherm.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "protonflow/thermo/constants.hpp"

namespace protonflow::thermo::detail {

namespace {

constexpr int integral_steps = 4000;

std::vector<double> square_roots(const std::vector<double>& molality) {
  std::vector<double> s{0.0};
  for (const double m : molality) s.push_back(std::sqrt(m));
  return s;
}

std::vector<double> logarithms(const std::vector<double>& gamma) {
  std::vector<double> l{0.0};  // γ± → 1 at infinite dilution
  for (const double g : gamma) l.push_back(std::log(g));
  return l;
}

}  // namespace

UniUnivalentIsotherm::UniUnivalentIsotherm(double largest_molality, const std::vector<double>& molality,
                                           const std::vector<double>& mean_activity_coefficient)
    : UniUnivalentIsotherm(largest_molality, molality, mean_activity_coefficient,
                           Continuation{std::numeric_limits<double>::quiet_NaN(), 0.0}) {}

UniUnivalentIsotherm::UniUnivalentIsotherm(double largest_molality, const std::vector<double>& molality,
                                           const std::vector<double>& mean_activity_coefficient, Continuation beyond)
    : last_molality_(molality.back()),
      last_ln_gamma_(std::log(mean_activity_coefficient.back())),
      last_slope_(0.0),
      beyond_(beyond),
      ln_gamma_(square_roots(molality), logarithms(mean_activity_coefficient)) {
  const double s_last = std::sqrt(last_molality_);
  last_slope_ = ln_gamma_.slope(s_last) / (2.0 * s_last);
  if (std::isnan(beyond_.final_slope)) beyond_ = {last_slope_, 0.0};  // straight on along the table's slope
  if (beyond_.bend < 0.0) throw std::invalid_argument("the bend of an isotherm's continuation must not be negative");
  // ∫₀^m ln γ± dm = ∫₀^√m ln γ±(s²) 2 s ds, by Simpson's rule on each step of a fine grid of s = √m.
  const double s_end = std::sqrt(std::max(largest_molality, last_molality_));
  grid_.resize(integral_steps + 1);
  integral_.resize(integral_steps + 1);
  grid_[0] = 0.0;
  integral_[0] = 0.0;
  for (int k = 1; k <= integral_steps; ++k) {
    grid_[k] = s_end * k / integral_steps;
    integral_[k] = integral_[k - 1] + segment_integral(grid_[k - 1], grid_[k]);
  }
}

double UniUnivalentIsotherm::ln_mean_activity_coefficient(double molality) const {
  if (molality > last_molality_) {
    const double d = molality - last_molality_, c = beyond_.final_slope, b = beyond_.bend;
    const double bent = b > 0.0 ? (last_slope_ - c) * b * -std::expm1(-d / b) : 0.0;
    return last_ln_gamma_ + c * d + bent;
  }
  return ln_gamma_(std::sqrt(molality));
}

double UniUnivalentIsotherm::segment_integral(double from, double to) const {
  const auto integrand = [this](double s) { return ln_mean_activity_coefficient(s * s) * 2.0 * s; };
  return (to - from) / 6.0 * (integrand(from) + 4.0 * integrand(0.5 * (from + to)) + integrand(to));
}

double UniUnivalentIsotherm::integral_ln_gamma(double molality) const {
  const double s = std::sqrt(molality);
  if (s > grid_.back()) throw std::domain_error("molality beyond the tabulated isotherm");
  const auto upper = std::upper_bound(grid_.begin(), grid_.end(), s);
  const std::size_t k = static_cast<std::size_t>(upper - grid_.begin()) - 1;
  return integral_[k] + segment_integral(grid_[k], s);
}

double UniUnivalentIsotherm::molality_of(double x) const { return x / ((1.0 - x) * constants::water_molar_mass); }

double UniUnivalentIsotherm::ln_water_activity(double x) const {
  const double m = molality_of(x);
  const double m_phi = m + m * ln_mean_activity_coefficient(m) - integral_ln_gamma(m);
  return -2.0 * constants::water_molar_mass * m_phi;
}

double UniUnivalentIsotherm::ln_solute_activity(double x) const {
  if (x == 0.0) return -std::numeric_limits<double>::infinity();
  const double m = molality_of(x);
  return 2.0 * (std::log(m) + ln_mean_activity_coefficient(m));
}

}  // namespace protonflow::thermo::detail
