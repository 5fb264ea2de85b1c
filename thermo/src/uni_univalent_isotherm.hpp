// The 298.15 K isotherm of a 1:1 electrolyte (HCl, HNO3, NaOH with water) from its mean activity
// coefficients, for the concentrated-binary models (private to thermo/src).
#pragma once

#include <vector>

#include "smooth_table.hpp"

namespace protonflow::thermo::detail {

// A 1:1 electrolyte's 298.15 K isotherm from its mean activity coefficients: ln γ± against molality
// (a smooth table through published values, extrapolated linearly beyond its last point), with
// the osmotic coefficient from the Gibbs–Duhem equation, m φ = m + m ln γ± − ∫₀^m ln γ± dm, so that
// water activity and solute activity are thermodynamically consistent by construction.
class UniUnivalentIsotherm {
 public:
  // Published γ± at the given molalities (increasing, the first small enough for the Debye–Hückel
  // limit to hold); the isotherm is tabulated up to largest_molality.
  UniUnivalentIsotherm(double largest_molality, const std::vector<double>& molality,
                       const std::vector<double>& mean_activity_coefficient);
  // How ln γ± continues beyond the last tabulated point, d = m − m_last: it leaves with the table's
  // own slope s and bends smoothly towards a final slope c over a molality scale b,
  //   ln γ± = ln γ±(m_last) + c d + (s − c) b (1 − exp(−d/b)),
  // so ln γ± and its slope stay continuous (a kink in ln γ± would be one in ∂ln a_w/∂m).
  struct Continuation {
    double final_slope;  // c, per mol/kg
    double bend;         // b, mol/kg
  };
  UniUnivalentIsotherm(double largest_molality, const std::vector<double>& molality,
                       const std::vector<double>& mean_activity_coefficient, Continuation beyond);
  double ln_mean_activity_coefficient(double molality) const;
  double ln_water_activity(double x) const;
  // ln(m² γ±²), the solute activity on the molality scale; −inf at x = 0.
  double ln_solute_activity(double x) const;

 private:
  double molality_of(double x) const;
  double integral_ln_gamma(double molality) const;
  double segment_integral(double from, double to) const;
  double last_molality_, last_ln_gamma_, last_slope_;
  Continuation beyond_;
  SmoothTable ln_gamma_;                 // against √m, so that the Debye–Hückel √m start is smooth
  std::vector<double> grid_, integral_;  // ∫₀^m ln γ± dm on a fine grid of m
};

}  // namespace protonflow::thermo::detail
