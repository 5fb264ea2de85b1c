// Small helpers that set up and solve one solution for a reference check.
#pragma once

#include <string>
#include <utility>
#include <vector>

#include "protonflow/thermo/activity_model.hpp"
#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"

namespace protonflow::reference {

const thermo::Database& bundled_database();

// Molality inputs per component, on 1 kg of water.
using Recipe = std::vector<std::pair<std::string, double>>;

struct ProbeResult {
  thermo::ChemicalSystem system;
  thermo::Speciation speciation;
  double molality(const std::string& solute) const;
  double log10_gamma(const std::string& solute) const;
};

ProbeResult solve_recipe(const Recipe& recipe, thermo::ActivityModelKind model, double temperature = 298.15);

// log10 K of a species' formation reaction from the bundled data, at temperature (K).
double formation_log_k(const std::string& species, double temperature = 298.15);

// A solution of these molalities open to one gas at a partial pressure (Pa).
ProbeResult solve_open_to(const Recipe& recipe, const std::string& gas, double partial_pressure,
                          thermo::ActivityModelKind model);

// Partial pressure (Pa) of a gas over a solution in a closed system at 1 atm total pressure.
double equilibrium_partial_pressure(const Recipe& recipe, const std::string& gas, thermo::ActivityModelKind model);

// ΔH (J/mol) of dissolving `amount` mol of a pure species (its data ΔfH°) into 1 kg of water at
// 298.15 K, as the difference of the engine's state enthalpies: the infinite-dilution heat of
// solution when the amount is small.
double dissolution_enthalpy(const std::string& component, const std::string& pure_species, double amount);

// ΔH (J/mol) of turning one mole of a pure species into the standard-state solutes its component
// decomposes into (the infinite-dilution heat of solution), from the engine's species enthalpies.
double standard_dissolution_enthalpy(const std::string& component, const std::string& pure_species);

// ΔH (J/mol of water formed) of mixing 1 kg of HCl solution with 1 kg of NaOH solution of the same
// molality at 298.15 K, from the engine's state enthalpies.
double neutralisation_enthalpy(double molality);

// Mean activity coefficient of a salt CaXb at the given molality: (γ+^a γ−^b)^(1/(a+b)).
double mean_activity_coefficient(const std::string& salt, const std::string& cation, int cations,
                                 const std::string& anion, int anions, double molality, thermo::ActivityModelKind model);

}  // namespace protonflow::reference

namespace protonflow::reference {

// Solubility of gypsum (mol CaSO4 per kg of water) in NaCl of the given molality at 25 °C: excess
// gypsum equilibrated with the solution, dissolved calcium over the water mass.
double gypsum_solubility(double nacl_molality, thermo::ActivityModelKind model, double temperature = 298.15);

// Solubility (mol of the salt per kg of the water left in solution) of one solid fed in excess as
// `component` (e.g. "Na2SO4" with only "mirabilite" allowed to form) at the given temperature, with
// the Pitzer model; `feed` mol per kg of water must exceed what dissolves.
double salt_solubility(const std::string& component, const std::string& solid, double feed, double temperature);

}  // namespace protonflow::reference
