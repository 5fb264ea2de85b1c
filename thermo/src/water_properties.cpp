#include "protonflow/thermo/water_properties.hpp"

#include <array>
#include <cmath>

#include "protonflow/thermo/constants.hpp"

namespace protonflow::thermo {

double water_density(double temperature) {
  // Kell (1975), J. Chem. Eng. Data 20, 97, eq. for 0–150 °C at 1 atm (coefficients from memory;
  // tests/reference checks them against IAPWS-95 through python3-iapws).
  const double t = temperature - 273.15;
  const double numerator = 999.83952 + t * (16.945176 + t * (-7.9870401e-3 + t * (-46.170461e-6 +
                                                                               t * (105.56302e-9 + t * -280.54253e-12))));
  return numerator / (1.0 + 16.879850e-3 * t);
}

double water_relative_permittivity(double temperature, double density) {
  // IAPWS R8-97 (Fernández, Goodwin, Lemmon, Levelt Sengers & Williams 1997, J. Phys. Chem. Ref.
  // Data 26, 1125): Harris–Alder g-factor form. Constants as the release states them.
  constexpr double critical_temperature = 647.096;  // K, IAPWS
  constexpr double critical_density = 322.0;        // kg/m³, IAPWS
  constexpr double molar_mass = 0.018015268;        // kg/mol, IAPWS
  constexpr double boltzmann = 1.380658e-23;        // J/K, as in R8-97
  constexpr double avogadro = 6.0221367e23;         // 1/mol, as in R8-97
  constexpr double polarizability = 1.636e-40;      // C² m² J⁻¹, R8-97
  constexpr double permittivity_vacuum = 8.854187817e-12;  // F/m, R8-97
  constexpr double dipole_moment = 6.138e-30;       // C m, R8-97
  constexpr std::array<double, 11> n{0.978224486826, -0.957771379375, 0.237511794148, 0.714692244396,
                                     -0.298217036956, -0.108863472196, 0.949327488264e-1, -0.980469816509e-2,
                                     0.165167634970e-4, 0.937359795772e-4, -0.12317921872e-9};
  constexpr std::array<double, 11> i{1, 1, 1, 2, 3, 3, 4, 5, 6, 7, 10};
  constexpr std::array<double, 11> j{0.25, 1, 2.5, 1.5, 1.5, 2.5, 2, 2, 5, 0.5, 10};
  constexpr double n12 = 0.196096504426e-2;

  const double delta = density / critical_density;
  const double tau = critical_temperature / temperature;
  double g = 1.0 + n12 * delta * std::pow(temperature / 228.0 - 1.0, -1.2);
  for (std::size_t k = 0; k < n.size(); ++k) g += n[k] * std::pow(delta, i[k]) * std::pow(tau, j[k]);

  const double number_density = avogadro * density / molar_mass;
  const double a = number_density * dipole_moment * dipole_moment * g / (permittivity_vacuum * boltzmann * temperature);
  const double b = number_density * polarizability / (3.0 * permittivity_vacuum);
  return (1.0 + a + 5.0 * b + std::sqrt(9.0 + 2.0 * a + 18.0 * b + a * a + 10.0 * a * b + 9.0 * b * b)) /
         (4.0 * (1.0 - b));
}

double water_pkw(double temperature, double density) {
  // IAPWS R11-07 (Bandura & Lvov 2006, J. Phys. Chem. Ref. Data 35, 15), eq. (3)–(5); ρ in g/cm³.
  constexpr double n = 6.0;
  constexpr double alpha0 = -0.864671, alpha1 = 8659.19, alpha2 = -22786.2;
  constexpr double beta0 = 0.642044, beta1 = -56.8534, beta2 = -0.375754;
  constexpr double gamma0 = 0.61415, gamma1 = 48251.33, gamma2 = -67707.93, gamma3 = 10102100.0;
  constexpr double molar_mass_g = 18.015268;  // g/mol, as in R11-07
  const double rho = density * 1e-3;
  const double t = temperature;
  const double z = rho * std::exp(alpha0 + alpha1 / t + alpha2 / (t * t) * std::cbrt(rho * rho));
  const double pkw_gas = gamma0 + gamma1 / t + gamma2 / (t * t) + gamma3 / (t * t * t);
  return -2.0 * n * (std::log10(1.0 + z) - z / (z + 1.0) * rho * (beta0 + beta1 / t + beta2 * rho)) + pkw_gas +
         2.0 * std::log10(molar_mass_g / 1000.0);
}

double water_saturation_pressure(double temperature) {
  // Wagner & Pruss (1993), J. Phys. Chem. Ref. Data 22, 783, eq. (1): ln(p/pc) = (Tc/T)(a1 τ +
  // a2 τ^1.5 + a3 τ³ + a4 τ^3.5 + a5 τ⁴ + a6 τ^7.5), τ = 1 − T/Tc (coefficients from memory; tests
  // check them against IAPWS-95 through python3-iapws).
  constexpr double critical_temperature = 647.096;  // K, IAPWS
  constexpr double critical_pressure = 22.064e6;    // Pa, IAPWS
  constexpr double a1 = -7.85951783, a2 = 1.84408259, a3 = -11.7866497, a4 = 22.6807411, a5 = -15.9618719,
                   a6 = 1.80122502;
  const double tau = 1.0 - temperature / critical_temperature;
  const double sum = a1 * tau + a2 * std::pow(tau, 1.5) + a3 * tau * tau * tau + a4 * std::pow(tau, 3.5) +
                     a5 * tau * tau * tau * tau + a6 * std::pow(tau, 7.5);
  return critical_pressure * std::exp(critical_temperature / temperature * sum);
}

DebyeHuckelParameters debye_huckel_parameters(double temperature, double /*pressure*/) {
  // A = (2π N_A ρ)^½ (e²/(4π ε0 εr k T))^{3/2} / ln 10 and B = (2 N_A ρ e²/(ε0 εr k T))^½,
  // the Debye–Hückel constants for a molal scale (Robinson & Stokes 1959, Electrolyte Solutions, ch. 9).
  using namespace constants;
  const double density = water_density(temperature);
  const double permittivity = water_relative_permittivity(temperature, density);
  constexpr double pi = 3.14159265358979323846;
  const double e2 = elementary_charge * elementary_charge;
  const double bjerrum_length = e2 / (4.0 * pi * vacuum_permittivity * permittivity * boltzmann * temperature);
  const double a = std::sqrt(2.0 * pi * avogadro * density) * std::pow(bjerrum_length, 1.5) / ln10;
  const double b = std::sqrt(2.0 * avogadro * density * e2 / (vacuum_permittivity * permittivity * boltzmann * temperature));
  return {a, b * 1e-10};
}

}  // namespace protonflow::thermo
