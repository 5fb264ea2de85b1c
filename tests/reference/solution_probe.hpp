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

// Mean activity coefficient of a salt CaXb at the given molality: (γ+^a γ−^b)^(1/(a+b)).
double mean_activity_coefficient(const std::string& salt, const std::string& cation, int cations,
                                 const std::string& anion, int anions, double molality, thermo::ActivityModelKind model);

}  // namespace protonflow::reference
