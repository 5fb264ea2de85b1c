// Parameters of the Pitzer ion-interaction model, as read from thermo/data/pitzer/*.yaml
// (format: docs/activity.md, "Pitzer parameter file").
#pragma once

#include <array>
#include <filesystem>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "protonflow/thermo/temperature_function.hpp"

namespace protonflow::thermo {

// A parameter as a function of temperature: the Taylor form of Silvester & Pitzer (1977) about
// T_r = 298.15 K, P(T) = P + (∂P/∂T)(T − T_r) + ½ (∂²P/∂T²)(T − T_r)², with the cubic term and the
// other reference temperature of Clegg, Rard & Pitzer (1994, eq. 24: T_r = 328.15 K); or a published
// function of T in the form of Møller (1988, eq. 13), carried from the value at T_r:
// P(T) = P + F(T) − F(T_r), F(T) = a1 + a2 T + a3/T + a4 ln T + a5/(T − 263) + a6 T² + a7/(680 − T) + a8/(T − 227).
struct PitzerCoefficient {
  double value = 0.0;
  double d_dT = 0.0;    // K⁻¹
  double d2_dT2 = 0.0;  // K⁻²
  double d3_dT3 = 0.0;  // K⁻³
  double reference_temperature = 298.15;  // K
  bool has_function = false;
  std::array<double, 8> function_terms{};  // a1..a8 of F(T), T in K
  double function_at_reference = 0.0;      // F(T_r)
  double at(double temperature) const noexcept;
};

// F(T) of Møller (1988, eq. 13), the form shared by Greenberg & Møller (1989, eq. 3).
double moller_temperature_function(const std::array<double, 8>& terms, double temperature) noexcept;

// One cation–anion pair: β⁰, β¹, β², Cφ and the α of its charge type, and Archer's (1992) extension
// of the third virial term, C^T(I) = C⁰ + 4 C¹ h(ω√I), with C⁰ = Cφ/(2√|z_c z_a|).
struct PitzerBinary {
  std::string cation, anion;  // species names, e.g. "Na^+", "Cl^-"
  PitzerCoefficient beta0, beta1, beta2, c_phi;
  double alpha1 = 2.0, alpha2 = 0.0;  // kg^½ mol^-½
  PitzerCoefficient c1{};             // C¹, on the scale of C⁰ (not of Cφ)
  double omega = 2.5;                 // ω of the C¹ term, kg^½ mol^-½
  // α₁(T) = alpha1 + alpha1_reciprocal_T (1/T − 1/298.15 K), K (Clegg, Rard & Pitzer 1994, H^+–SO4^2-)
  double alpha1_reciprocal_T = 0.0;
  // The temperatures the pair's functions were fitted over, K: beyond them every parameter of the
  // pair is held at its value at the nearer edge (a cubic in T runs away outside its fit).
  double minimum_temperature = 0.0, maximum_temperature = 1e9;
};

// An equilibrium constant fitted together with a parameter set: with this model, it replaces the
// species data's log10 K of the species' formation reaction (which must be the same reaction).
struct PitzerEquilibriumConstant {
  std::string species;                                       // e.g. "HSO4^-"
  std::vector<std::pair<std::string, double>> reaction;      // basis species and coefficients, as the species data
  TemperatureFunction log_k;
};

struct PitzerPair {  // θ of two ions of the same sign, or λ of a neutral species with another species
  std::string first, second;
  PitzerCoefficient value;
};

struct PitzerTriple {  // ψ of two ions of one sign and one of the other, or ζ of a neutral with a cation and an anion
  std::string first, second, third;
  PitzerCoefficient value;
};

struct PitzerParameters {
  std::vector<PitzerBinary> binary;
  std::vector<PitzerPair> theta;
  std::vector<PitzerPair> lambda;
  std::vector<PitzerTriple> psi;
  std::vector<PitzerTriple> zeta;
  // Ion pairs whose association the binary parameters already describe (CaSO4(aq) in β² of
  // Ca–SO4): a system solved with this model leaves them out, or they would be counted twice.
  std::vector<std::string> folded_ion_pairs;
  double maximum_ionic_strength = 6.0;  // mol/kg, where the parameter set's fits stop
  std::vector<PitzerEquilibriumConstant> equilibrium_constants;
};

// Reads one parameter file; throws DataError with file, line and column.
PitzerParameters load_pitzer_parameters(const std::filesystem::path& file);

// thermo/data/pitzer/ion-interaction.yaml under default_data_directory().
std::filesystem::path default_pitzer_parameters_file();

// The bundled parameters, read once per process (thread-safe).
const PitzerParameters& bundled_pitzer_parameters();

}  // namespace protonflow::thermo
