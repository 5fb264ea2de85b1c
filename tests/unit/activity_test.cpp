#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "protonflow/thermo/activity_model.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/water_properties.hpp"

using namespace protonflow::thermo;

namespace {

// A mixed electrolyte: H^+, Na^+, Ca^2+, Cl^-, SO4^2-, a neutral species.
SoluteProperties mixture(bool equal_sizes) {
  SoluteProperties p;
  p.charge = {1, 1, 2, -1, -2, 0};
  p.ion_size_angstrom = equal_sizes ? std::vector<double>{4, 4, 4, 4, 4, 0} : std::vector<double>{9, 4, 6, 3, 4, 0};
  return p;
}
const std::vector<double> molality{0.01, 0.2, 0.05, 0.25, 0.03, 0.02};

void check_derivatives(const ActivityModel& model) {
  const std::size_t n = molality.size();
  ActivityEvaluation at(n), plus(n), minus(n);
  model.evaluate(298.15, 1e5, molality, at);
  for (std::size_t k = 0; k < n; ++k) {
    auto up = molality, down = molality;
    const double h = 1e-5 * molality[k];
    up[k] += h;
    down[k] -= h;
    model.evaluate(298.15, 1e5, up, plus);
    model.evaluate(298.15, 1e5, down, minus);
    for (std::size_t i = 0; i < n; ++i) {
      INFO(model.name() << ": d ln gamma_" << i << " / d m_" << k);
      const double numeric = (plus.ln_gamma[i] - minus.ln_gamma[i]) / (2 * h);
      CHECK(at.d_ln_gamma_d_molality[i * n + k] == Approx(numeric).epsilon(1e-6).margin(1e-10));
    }
    const double numeric_water = (plus.ln_water_activity - minus.ln_water_activity) / (2 * h);
    INFO(model.name() << ": d ln a_w / d m_" << k);
    CHECK(at.d_ln_water_activity_d_molality[k] == Approx(numeric_water).epsilon(1e-6));
  }
}

// Gibbs–Duhem: (1/M_w) ∂ln a_w/∂m_k + Σ_i m_i ∂ln(m_i γ_i)/∂m_k = 0 for every k.
void check_gibbs_duhem(const ActivityModel& model) {
  const std::size_t n = molality.size();
  ActivityEvaluation at(n);
  model.evaluate(298.15, 1e5, molality, at);
  for (std::size_t k = 0; k < n; ++k) {
    double sum = at.d_ln_water_activity_d_molality[k] / constants::water_molar_mass + 1.0;
    for (std::size_t i = 0; i < n; ++i) sum += molality[i] * at.d_ln_gamma_d_molality[i * n + k];
    INFO(model.name() << ": Gibbs-Duhem, direction " << k);
    CHECK(sum == Approx(0.0).margin(1e-12));
  }
}

}  // namespace

TEST_CASE("analytic activity derivatives match finite differences") {
  check_derivatives(*make_davies_model(mixture(false)));
  check_derivatives(*make_b_dot_model(mixture(false)));
  check_derivatives(*make_ideal_model(mixture(false)));
}

TEST_CASE("water activity obeys Gibbs-Duhem where the model has an excess Gibbs energy") {
  // Davies and the ideal model derive from an excess Gibbs energy, so Gibbs–Duhem holds in every
  // direction of composition.
  check_gibbs_duhem(*make_davies_model(mixture(false)));
  check_gibbs_duhem(*make_ideal_model(mixture(false)));
}

TEST_CASE("B-dot water activity obeys Gibbs-Duhem along the solution's own composition ratios") {
  // B-dot with per-ion sizes and an uncharged ḃ I term has no excess Gibbs energy; its a_w is
  // integrated along the ray m = λ m° (docs/activity.md), where Gibbs–Duhem must hold:
  // (1/M_w) Σ_k m_k ∂ln a_w/∂m_k + Σ_k m_k + Σ_i Σ_k m_i m_k ∂ln γ_i/∂m_k = 0.
  const auto model = make_b_dot_model(mixture(false));
  const std::size_t n = molality.size();
  ActivityEvaluation at(n);
  model->evaluate(298.15, 1e5, molality, at);
  double sum = 0.0;
  for (std::size_t k = 0; k < n; ++k) {
    sum += molality[k] * (at.d_ln_water_activity_d_molality[k] / constants::water_molar_mass + 1.0);
    for (std::size_t i = 0; i < n; ++i) sum += molality[i] * molality[k] * at.d_ln_gamma_d_molality[i * n + k];
  }
  CHECK(sum == Approx(0.0).margin(1e-12));
}

TEST_CASE("every model tends to the Debye-Hückel limiting law") {
  SoluteProperties p;
  p.charge = {1, -1};
  p.ion_size_angstrom = {4, 4};
  const std::vector<double> dilute{1e-7, 1e-7};
  const double a = debye_huckel_parameters(298.15, 1e5).a;
  for (const auto& model : {make_davies_model(p), make_b_dot_model(p)}) {
    ActivityEvaluation out(2);
    model->evaluate(298.15, 1e5, dilute, out);
    // log10 γ = −A z² √I (Debye & Hückel 1923); the limiting osmotic coefficient φ = 1 − (ln 10) A √I / 3.
    CHECK(out.ln_gamma[0] / constants::ln10 == Approx(-a * std::sqrt(1e-7)).epsilon(1e-3));
    const double phi = -out.ln_water_activity / (constants::water_molar_mass * 2e-7);
    CHECK(1.0 - phi == Approx(constants::ln10 * a * std::sqrt(1e-7) / 3.0).epsilon(1e-2));
  }
}

TEST_CASE("Debye-Hückel A and B at 25 °C") {
  // Robinson & Stokes 1959, Electrolyte Solutions, appendix 7.1 (from memory): A = 0.5091 kg^½ mol^-½,
  // B = 0.3286 Å⁻¹ kg^½ mol^-½ at 25 °C; the permittivity used there differs a little from IAPWS R8-97.
  const auto p = debye_huckel_parameters(298.15, 101325.0);
  CHECK(p.a == Approx(0.5091).epsilon(2e-3));
  CHECK(p.b == Approx(0.3286).epsilon(2e-3));
  // A rises with temperature: 0.4918 at 0 °C and 0.5998 at 100 °C (same table, from memory).
  CHECK(debye_huckel_parameters(273.15, 101325.0).a == Approx(0.4918).epsilon(3e-3));
  CHECK(debye_huckel_parameters(373.15, 101325.0).a == Approx(0.5998).epsilon(5e-3));
}
