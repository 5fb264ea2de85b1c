// The Debye–Hückel osmotic function σ(x), shared by the Davies and B-dot water activities.
#pragma once

#include <cmath>

namespace protonflow::thermo::detail {

// σ(x) = 3/x³ [1 + x − 1/(1+x) − 2 ln(1+x)] (Robinson & Stokes 1959, eq. 9.15): the factor by which
// an ion size reduces the limiting-law osmotic term. Series for small x, where the closed form cancels.
inline double debye_huckel_sigma(double x) {
  if (x < 1e-2) {
    // 3 Σ (−1)^k (k+1)/(k+3) x^k, truncated where the next term is below 1e-16
    return 1.0 - x * (1.5 - x * (1.8 - x * (2.0 - x * (15.0 / 7.0 - x * 2.25))));
  }
  return 3.0 / (x * x * x) * (1.0 + x - 1.0 / (1.0 + x) - 2.0 * std::log1p(x));
}

}  // namespace protonflow::thermo::detail
