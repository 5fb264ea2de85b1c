#include "smooth_table.hpp"

#include <stdexcept>

namespace protonflow::thermo::detail {

namespace {

boost::math::interpolators::pchip<std::vector<double>> checked_curve(std::vector<double> x, std::vector<double> y) {
  if (x.size() != y.size() || x.size() < 4)
    throw std::invalid_argument("a smooth table needs four or more (x, y) pairs");
  for (std::size_t i = 1; i < x.size(); ++i)
    if (!(x[i] > x[i - 1])) throw std::invalid_argument("a smooth table needs strictly increasing x");
  return {std::move(x), std::move(y)};
}

}  // namespace

SmoothTable::SmoothTable(std::vector<double> x, std::vector<double> y)
    : first_x_(x.empty() ? 0.0 : x.front()),
      last_x_(x.empty() ? 0.0 : x.back()),
      curve_(checked_curve(std::move(x), std::move(y))) {}

double SmoothTable::operator()(double x) const {
  if (x < first_x_) return curve_(first_x_) + curve_.prime(first_x_) * (x - first_x_);
  if (x > last_x_) return curve_(last_x_) + curve_.prime(last_x_) * (x - last_x_);
  return curve_(x);
}

double SmoothTable::slope(double x) const {
  if (x < first_x_) return curve_.prime(first_x_);
  if (x > last_x_) return curve_.prime(last_x_);
  return curve_.prime(x);
}

}  // namespace protonflow::thermo::detail
