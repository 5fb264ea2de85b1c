// Parameters of the Pitzer ion-interaction model, as read from thermo/data/pitzer/*.yaml
// (format: docs/activity.md, "Pitzer parameter file").
#pragma once

#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

namespace protonflow::thermo {

// A parameter as a function of temperature: the Taylor form about 298.15 K of Silvester & Pitzer
// (1977), P(T) = P + (∂P/∂T)(T − T_r) + ½ (∂²P/∂T²)(T − T_r)².
struct PitzerCoefficient {
  double value = 0.0;
  double d_dT = 0.0;    // K⁻¹
  double d2_dT2 = 0.0;  // K⁻²
  double at(double temperature) const noexcept;
};

// One cation–anion pair: β⁰, β¹, β², Cφ and the α of its charge type.
struct PitzerBinary {
  std::string cation, anion;  // species names, e.g. "Na^+", "Cl^-"
  PitzerCoefficient beta0, beta1, beta2, c_phi;
  double alpha1 = 2.0, alpha2 = 0.0;  // kg^½ mol^-½
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
};

// Reads one parameter file; throws DataError with file, line and column.
PitzerParameters load_pitzer_parameters(const std::filesystem::path& file);

// thermo/data/pitzer/ion-interaction.yaml under default_data_directory().
std::filesystem::path default_pitzer_parameters_file();

// The bundled parameters, read once per process (thread-safe).
const PitzerParameters& bundled_pitzer_parameters();

}  // namespace protonflow::thermo
