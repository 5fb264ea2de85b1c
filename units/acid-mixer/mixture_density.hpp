// Density of an aqueous mixture the ionic engine answers (no binary model): the solution's volume is
// the solvent water's at T plus, for each ion, its amount times its partial molar volume at infinite
// dilution (conventional scale, V°(H^+) = 0); a solute without a tabulated volume counts with the
// volume of the same mass of water, and is named. Model, sources and accuracy: docs/units.md,
// "acid_mixer", density.
//
//   V = m_w / ρ_w(T) + Σ_i n_i V°_i + (m_other) / ρ_w(T),    ρ = m_liquid / V
#pragma once

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <string>
#include <vector>

namespace protonflow::units {

struct MixtureDensity {
  double density = 0.0;                         // kg/m³ of the liquid
  // Solutes with no tabulated V°, and their share of the liquid's mass (counted at water's density).
  std::vector<std::string> without_volume;
  double without_volume_mass_fraction = 0.0;
};

// liquid_mass: kg (or kg/s) of the aqueous phase whose speciation `state` is, water included.
MixtureDensity mixture_density(const thermo::ChemicalSystem& system, const thermo::Speciation& state, double liquid_mass);

// The tabulated partial molar volume at infinite dilution of a solute, m³/mol; NaN when there is none.
double infinite_dilution_volume(const std::string& solute);

}  // namespace protonflow::units
