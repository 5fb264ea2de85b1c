// Extended Debye–Hückel with ion size and the B-dot term (Helgeson 1969, Am. J. Sci. 267, 729):
// log10 γ_i = −A z_i² √I / (1 + B å_i √I) + ḃ I for charged species; γ = 1 for neutral ones.
#include <cmath>

#include "debye_huckel_sigma.hpp"
#include "protonflow/thermo/activity_model.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/water_properties.hpp"

namespace protonflow::thermo {

namespace {

// ḃ = 0.041 kg/mol at 25 °C for NaCl-dominated solutions (Helgeson 1969, from memory). Held
// constant over 0–100 °C here; docs/activity.md states the error this brings.
constexpr double b_dot = 0.041;

class BDotModel final : public ActivityModel {
 public:
  explicit BDotModel(SoluteProperties solutes) : solutes_(std::move(solutes)) {}

  std::string_view name() const noexcept override { return "b-dot"; }
  // About 1 mol/kg in solutions other than NaCl (common practice; Helgeson 1969 fitted NaCl further).
  double maximum_ionic_strength() const noexcept override { return 1.0; }

  void evaluate(double temperature, double pressure, std::span<const double> m, ActivityEvaluation& out) const override {
    const std::size_t n = m.size();
    update_parameters(temperature, pressure);
    const double a = constants::ln10 * parameters_.a;  // ln basis
    const double bdot = constants::ln10 * b_dot;
    double ionic_strength = 0.0;
    double total = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
      ionic_strength += 0.5 * solutes_.charge[i] * solutes_.charge[i] * m[i];
      total += m[i];
    }
    const double root = std::sqrt(ionic_strength);
    // Gibbs–Duhem at constant composition ratios: Σm(φ−1) = Σ_i m_i h_i(I) with
    // h_i = −A' z_i² √I σ(B å_i √I)/3 + ḃ' I/2 (charged species); dh_i/dI = g_i' − h_i/I.
    double osmotic_excess = 0.0;
    double weighted_dh = 0.0;  // Σ_i m_i dh_i/dI
    for (std::size_t i = 0; i < n; ++i) {
      const int z = solutes_.charge[i];
      if (z == 0) {
        out.ln_gamma[i] = 0.0;
        derivative_[i] = 0.0;
        h_[i] = 0.0;
        continue;
      }
      const double x = parameters_.b * solutes_.ion_size_angstrom[i] * root;
      const double z2 = static_cast<double>(z * z);
      out.ln_gamma[i] = -a * z2 * root / (1.0 + x) + bdot * ionic_strength;
      derivative_[i] = -a * z2 * 0.5 / (root * (1.0 + x) * (1.0 + x)) + bdot;
      h_[i] = -a * z2 * root * detail::debye_huckel_sigma(x) / 3.0 + 0.5 * bdot * ionic_strength;
      osmotic_excess += m[i] * h_[i];
      weighted_dh += m[i] * (derivative_[i] - h_[i] / ionic_strength);
    }
    constexpr double mw = constants::water_molar_mass;
    out.ionic_strength = ionic_strength;
    out.ln_water_activity = -mw * (total + osmotic_excess);
    for (std::size_t i = 0; i < n; ++i) {
      const double half_z2_i = 0.5 * solutes_.charge[i] * solutes_.charge[i];
      out.d_ln_water_activity_d_molality[i] = -mw * (1.0 + h_[i] + weighted_dh * half_z2_i);
      double* row = &out.d_ln_gamma_d_molality[i * n];
      for (std::size_t k = 0; k < n; ++k) row[k] = derivative_[i] * 0.5 * solutes_.charge[k] * solutes_.charge[k];
    }
  }

 private:
  void update_parameters(double temperature, double pressure) const {
    if (temperature == cached_temperature_) return;
    parameters_ = debye_huckel_parameters(temperature, pressure);
    cached_temperature_ = temperature;
    derivative_.assign(solutes_.charge.size(), 0.0);
    h_.assign(solutes_.charge.size(), 0.0);
  }

  SoluteProperties solutes_;
  // Per-instance scratch and cache: one model belongs to one solver, never shared between threads.
  mutable double cached_temperature_ = -1.0;
  mutable DebyeHuckelParameters parameters_{};
  mutable std::vector<double> derivative_;  // d ln γ_i / dI
  mutable std::vector<double> h_;
};

}  // namespace

std::unique_ptr<ActivityModel> make_b_dot_model(SoluteProperties solutes) {
  return std::make_unique<BDotModel>(std::move(solutes));
}

}  // namespace protonflow::thermo
