// The relative heat capacity of the Pitzer model, J = ∂L/∂T at constant molalities: what the engine's
// L(T) carries (docs/energy.md) against Pitzer's (1991, ch. 3) closed form for a single salt,
//   J_φ = ν|z_M z_X| (A_J / 2b) ln(1 + b√I) − 2 ν_M ν_X R [T² (m B'' + m² ν_M z_M C'') + 2T (m B' + m² ν_M z_M C')],
// with B = β⁰ + β¹ g(α√I), C = Cφ/(2√|z_M z_X|), primes the temperature derivatives of the parameter
// file, and A_J = ∂A_H/∂T, A_H = 4 R T² ∂A_φ/∂T from the engine's water properties.
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "protonflow/thermo/activity_pitzer.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/water_properties.hpp"

namespace {

using namespace protonflow::thermo;

double a_phi(double temperature) {
  return debye_huckel_parameters(temperature, constants::standard_atmosphere).a * constants::ln10 / 3.0;
}

// A_J = ∂/∂T (4 R T² ∂A_φ/∂T), by central differences of the engine's A_φ.
double a_j(double temperature) {
  const double h = 0.5;
  const auto a_h = [](double t) {
    const double d = 0.05;
    return 4.0 * constants::gas_constant * t * t * (a_phi(t + d) - a_phi(t - d)) / (2.0 * d);
  };
  return (a_h(temperature + h) - a_h(temperature - h)) / (2.0 * h);
}

const PitzerBinary& binary(const std::string& cation, const std::string& anion) {
  for (const PitzerBinary& b : bundled_pitzer_parameters().binary)
    if (b.cation == cation && b.anion == anion) return b;
  FAIL("no " << cation << "–" << anion << " pair in the parameter file");
  throw;  // unreachable: FAIL throws
}

// First and second temperature derivatives at 298.15 K of a parameter as the file gives it (Taylor form or
// Møller's function), by central differences: exact for the Taylor form's polynomials.
double slope(const PitzerCoefficient& c) { return (c.at(298.15 + 0.01) - c.at(298.15 - 0.01)) / 0.02; }
double curvature(const PitzerCoefficient& c) {
  return (c.at(298.15 + 0.1) - 2.0 * c.at(298.15) + c.at(298.15 - 0.1)) / 0.01;
}

// J_φ by Pitzer's closed form, for a 1:1 salt at 298.15 K.
double closed_form_j_phi(const PitzerBinary& b, double m, bool with_curvature = true) {
  constexpr double t = 298.15, bb = 1.2;
  const double r = constants::gas_constant;
  const double x = b.alpha1 * std::sqrt(m);
  const double g = 2.0 * (1.0 - (1.0 + x) * std::exp(-x)) / (x * x);
  const double b1 = slope(b.beta0) + slope(b.beta1) * g;
  const double b2 = with_curvature ? curvature(b.beta0) + curvature(b.beta1) * g : 0.0;
  const double c1 = slope(b.c_phi) / 2.0, c2 = with_curvature ? curvature(b.c_phi) / 2.0 : 0.0;
  return 2.0 * a_j(t) / (2.0 * bb) * std::log1p(bb * std::sqrt(m)) -
         2.0 * r * (t * t * (m * b2 + m * m * c2) + 2.0 * t * (m * b1 + m * m * c1));
}

// J_φ of the engine: ∂L_φ/∂T by a central difference of the model's own relative enthalpy.
double engine_j_phi(const char* cation, const char* anion, double m) {
  SoluteProperties p;
  p.charge = {1, -1};
  p.ion_size_angstrom = {4, 3};
  p.name = {cation, anion};
  const PitzerModel model(p, bundled_pitzer_parameters());
  const std::vector<double> molality{m, m};
  const double h = 0.5;
  return (model.relative_enthalpy(298.15 + h, constants::standard_atmosphere, molality) -
          model.relative_enthalpy(298.15 - h, constants::standard_atmosphere, molality)) /
         (2.0 * h) / m;
}

TEST_CASE("Pitzer relative heat capacity: the engine's ∂L/∂T is Pitzer's closed form with the file's derivatives") {
  for (const auto& [cation, anion] : {std::pair{"Na^+", "Cl^-"}, std::pair{"H^+", "Cl^-"}, std::pair{"H^+", "NO3^-"}})
    for (const double m : {0.1, 1.0, 3.0, 6.0}) {
      INFO(cation << anion << " at " << m << " mol/kg");
      CHECK(engine_j_phi(cation, anion, m) == Approx(closed_form_j_phi(binary(cation, anion), m)).epsilon(1e-4).margin(1e-3));
    }
}

TEST_CASE("NaCl carries the curvature of its temperature functions into the relative heat capacity") {
  // Møller's (1988) NaCl functions bend: ∂²β⁰/∂T² = −1.81e-5, ∂²β¹/∂T² = −1.45e-5, ∂²Cφ/∂T² = 2.21e-6 K⁻² at
  // 298.15 K (evaluated apart from the engine from the file's terms). Without the bend J_φ would be the
  // first-derivative part alone; with it, J_φ rises by −R T² (2m B'' + m² Cφ''), about 32 J/(K mol) at 1 mol/kg.
  const PitzerBinary& nacl = binary("Na^+", "Cl^-");
  CHECK(curvature(nacl.beta0) == Approx(-1.814e-5).epsilon(0.01));
  CHECK(curvature(nacl.beta1) == Approx(-1.451e-5).epsilon(0.01));
  CHECK(curvature(nacl.c_phi) == Approx(2.212e-6).epsilon(0.01));
  const double with = closed_form_j_phi(nacl, 1.0), without = closed_form_j_phi(nacl, 1.0, false);
  CHECK(engine_j_phi("Na^+", "Cl^-", 1.0) == Approx(with).epsilon(1e-4));
  CHECK(with - without > 25.0);  // the bend is a quarter of J_φ at 1 mol/kg, not a rounding
}

// L_φ of a salt M_νM X_νX at 298.15 K by Pitzer's closed form (docs/energy.md), the temperature derivatives
// of β⁰, β¹ and Cφ taken from the file's functions of T by central differences.
double closed_form_l_phi(const PitzerBinary& b, int z_m, int z_x, int nu_m, int nu_x, double m) {
  constexpr double t = 298.15, bb = 1.2, d = 0.01;
  const double r = constants::gas_constant;
  const double a_h = 4.0 * r * t * t * (a_phi(t + 0.05) - a_phi(t - 0.05)) / 0.1;
  const auto slope = [](const PitzerCoefficient& c) { return (c.at(t + d) - c.at(t - d)) / (2.0 * d); };
  const double ionic_strength = 0.5 * m * (nu_m * z_m * z_m + nu_x * z_x * z_x);
  const double x = b.alpha1 * std::sqrt(ionic_strength);
  const double g = 2.0 * (1.0 - (1.0 + x) * std::exp(-x)) / (x * x);
  const double b_l = slope(b.beta0) + slope(b.beta1) * g;
  const double c_l = slope(b.c_phi) / (2.0 * std::sqrt(static_cast<double>(z_m * -z_x)));
  return (nu_m + nu_x) * z_m * -z_x * a_h / (2.0 * bb) * std::log1p(bb * std::sqrt(ionic_strength)) -
         2.0 * nu_m * nu_x * r * t * t * (m * b_l + m * m * nu_m * z_m * c_l);
}

TEST_CASE("2:1 and 1:2 salts: the engine's L_φ from Møller's functions is Pitzer's closed form") {
  struct Salt {
    const char* cation;
    const char* anion;
    int z_m, z_x, nu_m, nu_x;
  };
  for (const Salt& salt : {Salt{"Ca^2+", "Cl^-", 2, -1, 1, 2}, Salt{"Mg^2+", "Cl^-", 2, -1, 1, 2},
                           Salt{"Na^+", "SO4^2-", 1, -2, 2, 1}, Salt{"K^+", "SO4^2-", 1, -2, 2, 1}}) {
    const PitzerBinary& b = binary(salt.cation, salt.anion);
    REQUIRE(b.beta0.has_function);
    SoluteProperties p;
    p.charge = {salt.z_m, salt.z_x};
    p.ion_size_angstrom = {6, 4};
    p.name = {salt.cation, salt.anion};
    const PitzerModel model(p, bundled_pitzer_parameters());
    for (const double m : {0.1, 1.0, 2.0}) {
      INFO(salt.cation << salt.anion << " at " << m << " mol/kg");
      const std::vector<double> molality{salt.nu_m * m, salt.nu_x * m};
      const double engine = model.relative_enthalpy(298.15, constants::standard_atmosphere, molality) / m;
      CHECK(engine == Approx(closed_form_l_phi(b, salt.z_m, salt.z_x, salt.nu_m, salt.nu_x, m)).epsilon(1e-4));
    }
  }
}

}  // namespace
