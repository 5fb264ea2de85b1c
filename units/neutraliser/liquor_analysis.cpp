#include "liquor_analysis.hpp"

#include <protonflow/thermo/formula.hpp>
#include <protonflow/thermo/water_properties.hpp>

#include <cmath>
#include <numbers>
#include <string>

namespace protonflow::units {

namespace {

// A solute's name is its formula, with "(aq)" on neutral species that share a formula with a gas.
thermo::Formula formula_of(std::string name) {
  constexpr std::string_view aqueous = "(aq)";
  if (name.ends_with(aqueous)) name.resize(name.size() - aqueous.size());
  return thermo::parse_formula(name);
}

}  // namespace

LiquorAnalysis::LiquorAnalysis(const thermo::ChemicalSystem& system) : element_reached_(reported_elements.size(), false) {
  const auto& solutes = system.solutes();
  const std::size_t basis_count = system.basis_count();
  const double water_molar_mass = thermo::molar_mass(thermo::parse_formula("H2O"));
  // Families: one per basis solute other than H+; a secondary solute joins the family of the first
  // anion among its basis species (the ligand that takes up protons), else of its first basis species.
  std::vector<std::ptrdiff_t> family_of_basis(basis_count, -1);
  for (std::size_t b = 0; b < basis_count; ++b) {
    if (b == hydrogen_) continue;
    family_of_basis[b] = static_cast<std::ptrdiff_t>(family_count_++);
  }
  for (std::size_t i = 0; i < solutes.size(); ++i) {
    const thermo::Solute& solute = solutes[i];
    const thermo::Formula formula = formula_of(solute.name);
    std::array<double, reported_elements.size()> counts{};
    for (std::size_t e = 0; e < reported_elements.size(); ++e) {
      const auto found = formula.elements.find(std::string(reported_elements[e]));
      counts[e] = found == formula.elements.end() ? 0.0 : found->second;
      if (counts[e] > 0.0) element_reached_[e] = true;
    }
    element_counts_.push_back(counts);
    solute_molar_mass_.push_back(thermo::molar_mass(formula));
    protons_.push_back(solute.stoichiometry[hydrogen_]);
    std::ptrdiff_t family = -1;
    for (const bool anions_first : {true, false}) {
      for (std::size_t b = 0; b < basis_count && family < 0; ++b) {
        if (b == hydrogen_ || solute.stoichiometry[b] == 0.0) continue;
        if (!anions_first || solutes[b].charge < 0) family = family_of_basis[b];
      }
    }
    if (family < 0 && solute.stoichiometry[hydrogen_] == -1.0 && solute.charge == -1) hydroxide_ = i;
    family_.push_back(family);
  }
  for (const thermo::PhaseSpecies& solid : system.solids()) {
    double mass = solid.water_coefficient * water_molar_mass;
    for (std::size_t b = 0; b < basis_count; ++b) mass += solid.stoichiometry[b] * solute_molar_mass_[b];
    solid_molar_mass_.push_back(mass);
  }
}

std::optional<double> LiquorAnalysis::dissolved_mg_per_litre(std::size_t element, const thermo::Speciation& state) const {
  if (!element_reached_[element]) return std::nullopt;
  double molality = 0.0;  // mol of the element per kg of water
  for (std::size_t i = 0; i < element_counts_.size(); ++i) molality += element_counts_[i][element] * state.molality[i];
  const thermo::Formula atom = thermo::parse_formula(reported_elements[element]);
  const double grams = molality * state.water_mass * thermo::molar_mass(atom) * 1e3;
  const double litres = liquor_mass(state) / thermo::water_density(state.temperature) * 1e3;
  return grams * 1e3 / litres;
}

double LiquorAnalysis::solids_mass(const thermo::Speciation& state) const {
  double mass = 0.0;
  for (std::size_t s = 0; s < solid_molar_mass_.size(); ++s) mass += state.solid_amount[s] * solid_molar_mass_[s];
  return mass;
}

double LiquorAnalysis::liquor_mass(const thermo::Speciation& state) const {
  double solutes = 0.0;
  for (std::size_t i = 0; i < solute_molar_mass_.size(); ++i) solutes += state.molality[i] * solute_molar_mass_[i];
  return state.water_mass * (1.0 + solutes);
}

double LiquorAnalysis::buffer_capacity(const thermo::Speciation& state) const {
  double sum = state.molality[hydrogen_] + (hydroxide_ ? state.molality[*hydroxide_] : 0.0);
  std::vector<double> total(family_count_, 0.0), first(family_count_, 0.0), second(family_count_, 0.0);
  for (std::size_t i = 0; i < family_.size(); ++i) {
    if (family_[i] < 0) continue;
    const auto f = static_cast<std::size_t>(family_[i]);
    const double m = state.molality[i];
    total[f] += m;
    first[f] += protons_[i] * m;
    second[f] += protons_[i] * protons_[i] * m;
  }
  for (std::size_t f = 0; f < family_count_; ++f) {
    if (total[f] > 0.0) sum += std::max(0.0, second[f] - first[f] * first[f] / total[f]);
  }
  return std::numbers::ln10 * sum;
}

}  // namespace protonflow::units
