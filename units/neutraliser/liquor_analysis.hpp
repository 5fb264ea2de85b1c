// What a treated liquor holds, from its equilibrium: each element still dissolved (mg/L), the
// mass of the precipitated solids, and Van Slyke's buffer capacity (docs/units.md, "neutraliser",
// "Precipitation" and "Gain and buffer capacity").
#pragma once

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <array>
#include <cstddef>
#include <optional>
#include <string_view>
#include <vector>

namespace protonflow::units {

// The elements whose dissolved concentration the neutraliser reports, in its results' order.
inline constexpr std::array<std::string_view, 9> reported_elements{"Fe", "Al", "Zn", "Cu", "Ni", "Ca", "Mg", "F", "Cr"};

class LiquorAnalysis {
 public:
  // Reads the formulas of the system's solutes from their names and the solids' molar masses from
  // their formation reactions, once. Throws thermo::ThermoError for a name that is no formula.
  explicit LiquorAnalysis(const thermo::ChemicalSystem& system);

  // Total dissolved element (free ion, complexes, ion pairs), mg per litre of liquor, where the
  // system reaches it; nothing where it does not. The litre is taken as the liquor's mass over
  // the density of water at the state's temperature (Kell 1975): a dilute-liquor approximation.
  std::optional<double> dissolved_mg_per_litre(std::size_t element, const thermo::Speciation& state) const;
  // Mass of all precipitated solids, kg (kg/s for a state of one second of flow).
  double solids_mass(const thermo::Speciation& state) const;
  // Mass of the liquor (water and solutes), kg.
  double liquor_mass(const thermo::Speciation& state) const;
  // Van Slyke's buffer capacity β = dC_B/dpH, mol per kg of water per pH unit, of the dissolved
  // acid–base pairs at the state's free molalities with activity coefficients held constant:
  //   β = ln 10 (m_H + m_OH + Σ_families [Σ h_i² m_i − (Σ h_i m_i)² / Σ m_i])
  // (h_i: the protons species i carries relative to its family's basis species). Solids that
  // dissolve as the pH moves (lime, brucite) buffer beyond this.
  double buffer_capacity(const thermo::Speciation& state) const;

 private:
  std::vector<std::array<double, reported_elements.size()>> element_counts_;  // per solute
  std::vector<bool> element_reached_;
  std::vector<double> solute_molar_mass_;  // kg/mol
  std::vector<double> solid_molar_mass_;   // kg/mol
  std::vector<double> protons_;            // per solute: its H+ coefficient in the basis
  std::vector<std::ptrdiff_t> family_;     // per solute: family index, −1 for H+ and OH−
  std::size_t family_count_ = 0;
  std::size_t hydrogen_ = 0;               // H+
  std::optional<std::size_t> hydroxide_;   // OH−
};

}  // namespace protonflow::units
