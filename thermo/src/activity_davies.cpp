// Davies (1962), Ion Association, Butterworths: log10 γ = −A z² (√I/(1+√I) − 0.3 I).
#include <cmath>

#include "debye_huckel_sigma.hpp"
#include "protonflow/thermo/activity_model.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/water_properties.hpp"

namespace protonflow::thermo {

namespace {

class DaviesModel final : public ActivityModel {
 public:
  explicit DaviesModel(SoluteProperties solutes) : solutes_(std::move(solutes)) {}

  std::string_view name() const noexcept override { return "davies"; }
  // Davies (1962) proposed the form for I up to about 0.5 mol/kg (common practice, e.g. Stumm & Morgan 1996).
  double maximum_ionic_strength() const noexcept override { return 0.5; }

  void evaluate(double temperature, double pressure, std::span<const double> m, ActivityEvaluation& out) const override {
    const std::size_t n = m.size();
    const double a = ln10_a(temperature, pressure);
    double ionic_strength = 0.0;
    double total = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
      ionic_strength += 0.5 * solutes_.charge[i] * solutes_.charge[i] * m[i];
      total += m[i];
    }
    const double root = std::sqrt(ionic_strength);
    // ln γ_i = z_i² f(I), f = −A' (√I/(1+√I) − 0.3 I), A' = A ln 10
    const double f = -a * (root / (1.0 + root) - 0.3 * ionic_strength);
    const double df = -a * (0.5 / (root * (1.0 + root) * (1.0 + root)) - 0.3);
    // Gibbs–Duhem along constant composition ratios: Σm(φ−1) = −(2/3) A' I^{3/2} σ(√I) + 0.3 A' I²
    const double osmotic_excess = -2.0 / 3.0 * a * ionic_strength * root * detail::debye_huckel_sigma(root) +
                                  0.3 * a * ionic_strength * ionic_strength;
    const double d_osmotic_excess = 2.0 * ionic_strength * df;  // dΣm(φ−1)/dI = 2 I f'(I)
    constexpr double mw = constants::water_molar_mass;
    out.ionic_strength = ionic_strength;
    out.ln_water_activity = -mw * (total + osmotic_excess);
    for (std::size_t i = 0; i < n; ++i) {
      const double zi2 = solutes_.charge[i] * solutes_.charge[i];
      out.ln_gamma[i] = zi2 * f;
      out.d_ln_water_activity_d_molality[i] = -mw * (1.0 + d_osmotic_excess * 0.5 * zi2);
      double* row = &out.d_ln_gamma_d_molality[i * n];
      for (std::size_t k = 0; k < n; ++k) row[k] = zi2 * df * 0.5 * solutes_.charge[k] * solutes_.charge[k];
    }
  }

 private:
  double ln10_a(double temperature, double pressure) const {
    // A depends on T only through water; recomputing it costs more than a solve's other work.
    if (temperature != cached_temperature_) {
      cached_a_ = constants::ln10 * debye_huckel_parameters(temperature, pressure).a;
      cached_temperature_ = temperature;
    }
    return cached_a_;
  }

  SoluteProperties solutes_;
  mutable double cached_temperature_ = -1.0;  // per-instance cache: one model belongs to one solver
  mutable double cached_a_ = 0.0;
};

}  // namespace

std::unique_ptr<ActivityModel> make_davies_model(SoluteProperties solutes) {
  return std::make_unique<DaviesModel>(std::move(solutes));
}

}  // namespace protonflow::thermo
