// The ideal-solution model and the factory that picks a model by kind.
#include <algorithm>

#include "protonflow/thermo/activity_model.hpp"
#include "protonflow/thermo/activity_pitzer.hpp"
#include "protonflow/thermo/constants.hpp"

namespace protonflow::thermo {

namespace {

// Ideal solution: γ = 1; a_w from Gibbs–Duhem with γ = 1, ln a_w = −M_w Σm.
class IdealModel final : public ActivityModel {
 public:
  explicit IdealModel(SoluteProperties solutes) : solutes_(std::move(solutes)) {}
  std::string_view name() const noexcept override { return "ideal"; }
  // γ = 1 is within 10 % only below about 0.001 mol/kg for 1:1 salts (Debye–Hückel limiting law; common practice).
  double maximum_ionic_strength() const noexcept override { return 1e-3; }
  void evaluate(double, double, std::span<const double> m, ActivityEvaluation& out) const override {
    double ionic_strength = 0.0;
    double total = 0.0;
    for (std::size_t i = 0; i < m.size(); ++i) {
      ionic_strength += 0.5 * solutes_.charge[i] * solutes_.charge[i] * m[i];
      total += m[i];
      out.ln_gamma[i] = 0.0;
      out.d_ln_water_activity_d_molality[i] = -constants::water_molar_mass;
    }
    std::fill(out.d_ln_gamma_d_molality.begin(), out.d_ln_gamma_d_molality.end(), 0.0);
    out.ionic_strength = ionic_strength;
    out.ln_water_activity = -constants::water_molar_mass * total;
  }

 private:
  SoluteProperties solutes_;
};

}  // namespace

std::unique_ptr<ActivityModel> make_ideal_model(SoluteProperties solutes) {
  return std::make_unique<IdealModel>(std::move(solutes));
}

std::unique_ptr<ActivityModel> make_activity_model(ActivityModelKind kind, SoluteProperties solutes) {
  switch (kind) {
    case ActivityModelKind::ideal: return make_ideal_model(std::move(solutes));
    case ActivityModelKind::davies: return make_davies_model(std::move(solutes));
    case ActivityModelKind::b_dot: return make_b_dot_model(std::move(solutes));
    case ActivityModelKind::pitzer: return make_pitzer_model(std::move(solutes));
  }
  return make_davies_model(std::move(solutes));
}

}  // namespace protonflow::thermo
