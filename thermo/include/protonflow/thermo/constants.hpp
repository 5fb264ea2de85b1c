// Physical constants, SI. CODATA 2018 exact or recommended values (Tiesinga et al. 2021,
// Rev. Mod. Phys. 93, 025010).
#pragma once

namespace protonflow::thermo::constants {

inline constexpr double gas_constant = 8.314462618;            // J mol⁻¹ K⁻¹, CODATA 2018 (exact)
inline constexpr double avogadro = 6.02214076e23;              // mol⁻¹, CODATA 2018 (exact)
inline constexpr double boltzmann = 1.380649e-23;              // J K⁻¹, CODATA 2018 (exact)
inline constexpr double elementary_charge = 1.602176634e-19;   // C, CODATA 2018 (exact)
inline constexpr double vacuum_permittivity = 8.8541878128e-12;  // F m⁻¹, CODATA 2018
inline constexpr double reference_temperature = 298.15;        // K, standard-state convention (IUPAC)
inline constexpr double standard_atmosphere = 101325.0;        // Pa, exact by definition
inline constexpr double water_molar_mass = 0.018015268;        // kg mol⁻¹, IAPWS-95 (Wagner & Pruss 2002)
inline constexpr double ln10 = 2.302585092994046;              // mathematical constant

}  // namespace protonflow::thermo::constants
