// A smooth curve through tabulated values: the monotone piecewise-cubic Hermite interpolant of
// Fritsch & Carlson (1980) as Boost.Math implements it (pchip), with its continuous first
// derivative; beyond the table it continues along the tangent at the nearer end.
#pragma once

// Boost 1.74's pchip.hpp calls isnan unqualified: <math.h> puts it in the global namespace first.
#include <math.h>  // NOLINT(modernize-deprecated-headers)

#include <boost/math/interpolators/pchip.hpp>
#include <vector>

namespace protonflow::thermo::detail {

class SmoothTable {
 public:
  // x strictly increasing, at least four points.
  SmoothTable(std::vector<double> x, std::vector<double> y);
  double operator()(double x) const;
  double slope(double x) const;
  double first_x() const noexcept { return first_x_; }
  double last_x() const noexcept { return last_x_; }

 private:
  double first_x_, last_x_;
  boost::math::interpolators::pchip<std::vector<double>> curve_;
};

}  // namespace protonflow::thermo::detail
