#include <catch2/catch.hpp>

#include <boost/math/quadrature/exp_sinh.hpp>

#include <array>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "protonflow/thermo/activity_model.hpp"
#include "protonflow/thermo/activity_pitzer.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"
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

// The same mixture with names, for the Pitzer model.
SoluteProperties named_mixture() {
  SoluteProperties p = mixture(false);
  p.name = {"H^+", "Na^+", "Ca^2+", "Cl^-", "SO4^2-", "CO2(aq)"};
  return p;
}

// A parameter set exercising every kind of term, ζ and λ_nn included (values arbitrary in size).
PitzerParameters every_term() {
  PitzerParameters p;
  p.binary.push_back({"Na^+", "Cl^-", {0.08, 1e-3, 0}, {0.27, 1e-3, 0}, {}, {0.0013, -1e-4, 0}});
  p.binary.push_back({"Ca^2+", "SO4^2-", {0.2, 0, 0}, {3.2, 0, 0}, {-54, 0, 0}, {}, 1.4, 12.0});
  // Archer's C¹ term and an α₁ that varies with T, as Clegg, Rard & Pitzer (1994) give for H^+–SO4^2-
  p.binary.push_back({"H^+", "SO4^2-", {0.03, 0, 0}, {0.31, 2e-3, 0}, {}, {0.044, 0, 0}, 2.0, 0.0, {-0.32, 1e-3, 0}, 2.5,
                      -1842.843});
  p.theta.push_back({"Na^+", "Ca^2+", {0.07, 0, 0}});
  p.psi.push_back({"Na^+", "Ca^2+", "Cl^-", {-0.007, 0, 0}});
  p.lambda.push_back({"CO2(aq)", "Na^+", {0.1, 0, 0}});
  p.lambda.push_back({"CO2(aq)", "CO2(aq)", {0.05, 0, 0}});
  p.zeta.push_back({"CO2(aq)", "Na^+", "Cl^-", {-0.02, 0, 0}});
  return p;
}

void check_derivatives(const ActivityModel& model, const std::vector<double>& molality = ::molality) {
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
void check_gibbs_duhem(const ActivityModel& model, const std::vector<double>& molality = ::molality) {
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
  check_derivatives(*make_pitzer_model(named_mixture()));
  check_derivatives(*make_pitzer_model(named_mixture(), every_term()));
  // a brine near the model's limit, I ≈ 6 mol/kg
  const std::vector<double> brine{0.3, 2.5, 0.8, 4.0, 0.4, 0.05};
  check_derivatives(*make_pitzer_model(named_mixture()), brine);
  check_derivatives(*make_pitzer_model(named_mixture(), every_term()), brine);
}

TEST_CASE("water activity obeys Gibbs-Duhem where the model has an excess Gibbs energy") {
  // Davies and the ideal model derive from an excess Gibbs energy, so Gibbs–Duhem holds in every
  // direction of composition.
  check_gibbs_duhem(*make_davies_model(mixture(false)));
  check_gibbs_duhem(*make_ideal_model(mixture(false)));
  check_gibbs_duhem(*make_pitzer_model(named_mixture()));
  check_gibbs_duhem(*make_pitzer_model(named_mixture(), every_term()), {0.3, 2.5, 0.8, 4.0, 0.4, 0.05});
}

TEST_CASE("Pitzer water activity is the osmotic coefficient of the same excess Gibbs energy") {
  // Σ m (φ − 1) = Σ m_k ln γ_k − G^ex/(w_w R T) (Pitzer 1991, ch. 3): checked against a finite
  // difference of G^ex in the mass of water, −∂G^ex/∂n_w = −M_w ∂(w g)/∂w at fixed amounts.
  const PitzerModel model(named_mixture(), every_term());
  const std::vector<double> m{0.3, 2.5, 0.8, 4.0, 0.4, 0.05};
  ActivityEvaluation at(m.size());
  model.evaluate(298.15, 1e5, m, at);
  const auto total_g = [&](double w) {
    std::vector<double> scaled(m.size());
    for (std::size_t k = 0; k < m.size(); ++k) scaled[k] = m[k] / w;
    return w * model.excess_gibbs_energy(298.15, 1e5, scaled);
  };
  const double h = 1e-5;
  const double d_g_d_w = (total_g(1.0 + h) - total_g(1.0 - h)) / (2 * h);
  double total = 0.0;
  for (double x : m) total += x;
  // ln a_w = ln a_w(ideal) + M_w ∂(w g)/∂w
  CHECK(at.ln_water_activity == Approx(-constants::water_molar_mass * total + constants::water_molar_mass * d_g_d_w).epsilon(1e-7));
}

TEST_CASE("Pitzer relative partial molal enthalpies are the derivatives of the relative enthalpy") {
  // L̄_i = ∂L/∂n_i at constant water (per kg: ∂(L/w)/∂m_i), checked by central differences of the
  // model's own L; and Euler: Σ m_i L̄_i + L̄_w / M_w = L/w.
  const PitzerModel model(named_mixture(), every_term());
  const std::vector<double> m{0.3, 2.5, 0.8, 4.0, 0.4, 0.05};
  std::vector<double> partial(m.size());
  const double water = model.relative_partial_enthalpies(310.0, 1e5, m, partial);
  double euler = water / constants::water_molar_mass;
  for (std::size_t k = 0; k < m.size(); ++k) {
    auto up = m, down = m;
    const double h = 1e-4 * m[k];
    up[k] += h;
    down[k] -= h;
    const double numeric = (model.relative_enthalpy(310.0, 1e5, up) - model.relative_enthalpy(310.0, 1e5, down)) / (2 * h);
    INFO("solute " << k);
    CHECK(partial[k] == Approx(numeric).epsilon(1e-5).margin(1e-6));
    euler += m[k] * partial[k];
  }
  CHECK(euler == Approx(model.relative_enthalpy(310.0, 1e5, m)).epsilon(1e-10));
}

TEST_CASE("Pitzer C1 term: the osmotic coefficient takes Archer's form C0 + C1 exp(-omega sqrt I)") {
  // Archer (1992): with C^T = C⁰ + 4C¹ h(ω√I) in the excess Gibbs energy, the osmotic coefficient of
  // a 1:1 salt gains 2m² (C⁰ + C¹ e^−ω√I) (Pitzer 1991, eq. 3.60 with Z = 2m): checked at low and
  // high I (the series and the closed form of h), against the same model without the term.
  SoluteProperties p;
  p.charge = {1, -1};
  p.ion_size_angstrom = {9, 4};
  p.name = {"H^+", "HSO4^-"};
  PitzerParameters bare, with_c;
  bare.binary.push_back({"H^+", "HSO4^-", {0.2, 0, 0}, {0.4, 0, 0}, {}, {}});
  with_c.binary.push_back({"H^+", "HSO4^-", {0.2, 0, 0}, {0.4, 0, 0}, {}, {-0.006, 0, 0}, 2.0, 0.0, {-0.41, 0, 0}, 2.5});
  const PitzerModel without(p, bare), with(p, with_c);
  for (const double m : {1e-3, 0.05, 0.3, 2.0, 6.0}) {
    ActivityEvaluation a(2), b(2);
    const std::vector<double> molality{m, m};
    with.evaluate(298.15, 1e5, molality, a);
    without.evaluate(298.15, 1e5, molality, b);
    const auto phi = [&](const ActivityEvaluation& e) { return -e.ln_water_activity / (constants::water_molar_mass * 2 * m); };
    const double c_phi = -0.006 / 2 + -0.41 * std::exp(-2.5 * std::sqrt(m));  // C⁰ = Cφ/2 for 1:1
    INFO("m = " << m);
    CHECK(phi(a) - phi(b) == Approx(2 * m * m * c_phi).epsilon(1e-8));
  }
}

TEST_CASE("Pitzer parameters are held at the edge of their fitted temperature range") {
  // Beyond maximum_temperature a pair's parameters keep their values there: a model whose β⁰(T) has
  // a slope but stops at 310 K equals, at 350 K, a model holding β⁰(310 K) as a constant.
  SoluteProperties p;
  p.charge = {1, -1};
  p.ion_size_angstrom = {9, 4};
  p.name = {"H^+", "HSO4^-"};
  PitzerParameters sloped, held;
  sloped.binary.push_back({"H^+", "HSO4^-", {0.2, 5e-3, 1e-4}, {0.4, 0, 0}, {}, {}, 2.0, 0.0, {-0.4, 2e-3, 0}, 2.5, -1000.0});
  sloped.binary.back().maximum_temperature = 310.0;
  const double dt = 310.0 - 298.15;
  held.binary.push_back({"H^+", "HSO4^-", {0.2 + 5e-3 * dt + 0.5e-4 * dt * dt, 0, 0}, {0.4, 0, 0}, {}, {}, 2.0 - 1000.0 * (1 / 310.0 - 1 / 298.15),
                         0.0, {-0.4 + 2e-3 * dt, 0, 0}, 2.5});
  const PitzerModel a(p, sloped), b(p, held);
  const std::vector<double> m{2.0, 2.0};
  CHECK(a.excess_gibbs_energy(350.0, 1e5, m) == Approx(b.excess_gibbs_energy(350.0, 1e5, m)).epsilon(1e-12));
  CHECK(a.excess_gibbs_energy(305.0, 1e5, m) != Approx(b.excess_gibbs_energy(305.0, 1e5, m)).epsilon(1e-6));
}

TEST_CASE("Pitzer parameters as Møller's (1988) function of temperature, carried from the 25 °C value") {
  // P(T) = P(298.15 K) + F(T) − F(298.15 K), F = a1 + a2 T + a3/T + a4 ln T + a5/(T − 263) + a6 T² + a7/(680 − T)
  // + a8/(T − 227): F typed again here from Møller's eq. 13 with terms that exercise every one of its eight.
  const std::array<double, 8> a{0.5, -1e-3, 20.0, 0.01, -0.3, 2e-6, 1.5, 0.7};
  const auto f = [&a](double t) {
    return a[0] + a[1] * t + a[2] / t + a[3] * std::log(t) + a[4] / (t - 263.0) + a[5] * t * t + a[6] / (680.0 - t) +
           a[7] / (t - 227.0);
  };
  const auto directory = std::filesystem::temp_directory_path() / "protonflow-pitzer-function";
  std::filesystem::create_directories(directory);
  const auto file = directory / "function.yaml";
  std::ofstream(file) << "binary:\n  - species: [Na^+, SO4^2-]\n    minimum_temperature: {value: 273.15, source: x}\n"
                         "    maximum_temperature: {value: 523.15, source: x}\n    beta0: {value: 0.02, source: x}\n"
                         "    beta0_function: {terms: [0.5, -1e-3, 20.0, 0.01, -0.3, 2e-6, 1.5, 0.7], source: x}\n"
                         "    c0: {value: 0.001, source: x}\n"
                         "    c0_function: {terms: [0.5, -1e-3, 20.0, 0.01, -0.3, 2e-6, 1.5, 0.7], source: x}\n";
  const PitzerParameters p = load_pitzer_parameters(file);
  std::filesystem::remove_all(directory);
  REQUIRE(p.binary.size() == 1);
  const PitzerCoefficient& beta0 = p.binary[0].beta0;
  CHECK(beta0.at(298.15) == Approx(0.02).epsilon(1e-14));
  for (const double t : {273.15, 320.0, 373.15, 473.15}) CHECK(beta0.at(t) == Approx(0.02 + f(t) - f(298.15)).epsilon(1e-12));
  // c0 is Cφ / (2√2) for a 1:2 salt: the whole function scales with it (Pitzer 1991, eq. 3.63).
  CHECK(p.binary[0].c_phi.at(350.0) == Approx(2.0 * std::sqrt(2.0) * (0.001 + f(350.0) - f(298.15))).epsilon(1e-12));
  // The bundled Na2SO4 β⁰ moves as Møller's own function does: 0.0186933 at 298.15 K to 0.1057523 at 373.15 K,
  // evaluated apart from the engine from the file's coefficients (a difference of 0.0870590).
  for (const PitzerBinary& b : bundled_pitzer_parameters().binary)
    if (b.cation == "Na^+" && b.anion == "SO4^2-") CHECK(b.beta0.at(373.15) - b.beta0.at(298.15) == Approx(0.0870590).epsilon(1e-6));
}

TEST_CASE("Pitzer model names the species it has no parameters for") {
  SoluteProperties p;
  p.charge = {1, -1, 1, 0};
  p.ion_size_angstrom = {4, 3, 4, 0};
  p.name = {"Na^+", "Cl^-", "Cs^+", "N2(aq)"};
  const PitzerModel model(p, bundled_pitzer_parameters());
  CHECK(model.species_without_parameters() == std::vector<std::string>{"Cs^+", "N2(aq)"});
  // Cs^+ keeps the Debye–Hückel term alone: with no Cs–Cl parameters ln γ(Cs^+) = f^γ + Cφ terms of others.
  ActivityEvaluation out(4);
  model.evaluate(298.15, 1e5, std::vector<double>{1e-3, 1e-3, 1e-9, 1e-9}, out);
  CHECK(out.ln_gamma[3] == Approx(0.0).margin(1e-12));
  SoluteProperties unnamed = mixture(false);
  CHECK_THROWS_AS(PitzerModel(unnamed, bundled_pitzer_parameters()), ThermoError);
}

TEST_CASE("Pitzer 1975 J(x) approximation against its defining integral") {
  // J(x) = (1/x) ∫₀^∞ [1 + q + q²/2 − e^q] y² dy, q = −(x/y) e^−y (Pitzer 1975, J. Solution Chem. 4,
  // 249, eq. 43), by Boost's exp-sinh quadrature; Pitzer gives his eq. 47 as good to about 1 %.
  boost::math::quadrature::exp_sinh<double> integrator;
  for (const double x : {0.5, 1.0, 2.0, 5.0, 10.0, 50.0, 100.0}) {
    const auto integrand = [x](double y) {
      const double q = -(x / y) * std::exp(-y);
      // [1 + q + q²/2 − e^q] y²: the series −q³/6 (1 + q/4) where q is small; elsewhere term by term
      // with q y = −x e^−y, so that nothing overflows as y → 0
      if (std::abs(q) < 1e-3) return -(q * q * q / 6.0) * (1.0 + q / 4.0) * y * y;
      return y * y * (1.0 - std::exp(q)) - x * y * std::exp(-y) + 0.5 * x * x * std::exp(-2.0 * y);
    };
    const double exact = integrator.integrate(integrand) / x;
    INFO("x = " << x);
    CHECK(pitzer_1975_j(x)[0] == Approx(exact).epsilon(0.012));
    // derivatives of the approximation by central differences
    const double h = 1e-4 * x;
    CHECK(pitzer_1975_j(x)[1] == Approx((pitzer_1975_j(x + h)[0] - pitzer_1975_j(x - h)[0]) / (2 * h)).epsilon(1e-6));
    CHECK(pitzer_1975_j(x)[2] == Approx((pitzer_1975_j(x + h)[1] - pitzer_1975_j(x - h)[1]) / (2 * h)).epsilon(1e-5));
  }
  CHECK(pitzer_1975_j(0.0)[0] == 0.0);
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

TEST_CASE("the Pitzer parameter file: bundled set read, bad entries refused with file, line and column") {
  const PitzerParameters& bundled = bundled_pitzer_parameters();
  CHECK(bundled.binary.size() >= 30);
  CHECK(bundled.maximum_ionic_strength == 6.0);
  // The HSO4^- constant fitted with the sulfuric-acid parameters: K2 = 0.010500 at 25 °C, log10 K2 = −1.97882
  // (Clegg, Rard & Pitzer 1994, eq. 21), held as the formation constant of HSO4^- in the five-term form.
  // The sodium sulfates' solubility products fitted with the parameter set follow (docs/activity.md).
  REQUIRE(bundled.equilibrium_constants.size() == 3);
  CHECK(bundled.equilibrium_constants[0].species == "HSO4^-");
  CHECK(log_k(bundled.equilibrium_constants[0].log_k, 298.15, 101325.0) == Approx(1.97882).margin(1e-4));
  CHECK(bundled.equilibrium_constants[1].species == "mirabilite");
  CHECK(log_k(bundled.equilibrium_constants[1].log_k, 298.15, 101325.0) == Approx(1.2130).margin(1e-5));
  CHECK(bundled.equilibrium_constants[2].species == "thenardite");
  CHECK(log_k(bundled.equilibrium_constants[2].log_k, 298.15, 101325.0) == Approx(0.2726).margin(1e-5));
  const auto directory = std::filesystem::temp_directory_path() / "protonflow-pitzer-parameters";
  std::filesystem::create_directories(directory);
  const auto refused = [&](const std::string& name, const std::string& text, int line, int column, const std::string& what) {
    const auto file = directory / (name + ".yaml");
    std::ofstream(file) << text;
    try {
      load_pitzer_parameters(file);
      FAIL("accepted " << name);
    } catch (const DataError& e) {
      INFO(e.what());
      CHECK(e.line() == line);
      CHECK(e.column() == column);
      CHECK_THAT(e.what(), Catch::Contains(what));
    }
  };
  refused("old-notation", "binary:\n  - species: [Na+, Cl^-]\n    beta0: {value: 0.0765, source: x}\n", 2, 15, "write 'Na^+'");
  refused("no-source", "binary:\n  - species: [Na^+, Cl^-]\n    beta0: {value: 0.0765}\n", 3, 12, "'value' and 'source'");
  refused("anion-first", "binary:\n  - species: [Cl^-, Na^+]\n    beta0: {value: 0.0765, source: x}\n", 2, 14, "a cation then an anion");
  refused("unknown-key", "binary:\n  - species: [Na^+, Cl^-]\n    beta3: {value: 1, source: x}\n", 3, 5, "unknown key 'beta3'");
  refused("twice", "theta:\n  - {species: [Na^+, K^+], theta: {value: 1, source: x}}\n  - {species: [K^+, Na^+], theta: {value: 1, source: x}}\n",
          3, 5, "theta of K^+ Na^+ is listed twice");
  refused("lambda-ion-first", "lambda:\n  - {species: [Na^+, CO2(aq)], lambda: {value: 1, source: x}}\n", 2, 15, "a neutral species first");
  refused("psi-signs", "psi:\n  - {species: [Na^+, Cl^-, K^+], psi: {value: 1, source: x}}\n", 2, 15, "two different ions of one sign");
  refused("c0-and-c_phi",
          "binary:\n  - species: [H^+, HSO4^-]\n    beta0: {value: 0.2, source: x}\n    c_phi: {value: 0.01, source: x}\n"
          "    c0: {value: 0.005, source: x}\n",
          5, 9, "either c_phi or c0");
  refused("function-and-derivative",
          "binary:\n  - species: [Na^+, SO4^2-]\n    minimum_temperature: {value: 273.15, source: x}\n"
          "    maximum_temperature: {value: 523.15, source: x}\n    beta0: {value: 0.02, source: x}\n"
          "    beta0_dT: {value: 0.002, source: x}\n    beta0_function: {terms: [1, 0, 0, 0, 0, 0, 0, 0], source: x}\n",
          7, 21, "either derivatives or a function");
  refused("function-seven-terms",
          "binary:\n  - species: [Na^+, SO4^2-]\n    beta0: {value: 0.02, source: x}\n"
          "    beta0_function: {terms: [1, 0, 0, 0, 0, 0, 0], source: x}\n",
          4, 29, "a list of eight numbers");
  refused("function-near-a-pole",
          "binary:\n  - species: [Na^+, SO4^2-]\n    beta0: {value: 0.02, source: x}\n"
          "    beta0_function: {terms: [1, 0, 0, 0, 0, 0, 0, 0.7], source: x}\n",
          2, 5, "the poles of Møller's eq. 13");
  refused("function-below-its-263-K-pole",
          "binary:\n  - species: [Na^+, SO4^2-]\n    minimum_temperature: {value: 250, source: x}\n"
          "    maximum_temperature: {value: 523.15, source: x}\n    beta0: {value: 0.02, source: x}\n"
          "    beta0_function: {terms: [1, 0, 0, 0, -0.5, 0, 0, 0], source: x}\n",
          2, 5, "above 263 K");
  refused("constant-without-reaction", "equilibrium_constants:\n  - species: HSO4^-\n    five_term_log10_K: {constant: 2, source: x}\n",
          2, 5, "needs 'reaction'");
  refused("constant-without-source",
          "equilibrium_constants:\n  - species: HSO4^-\n    reaction: {H^+: 1, SO4^2-: 1}\n    five_term_log10_K: {constant: 2}\n", 2, 5,
          "with its 'source'");
  std::filesystem::remove_all(directory);
}
