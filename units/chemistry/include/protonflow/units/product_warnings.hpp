// The warnings a chemistry unit gives about its product at equilibrium: hot corrosive liquor,
// a gas phase (boiling, degassing), precipitated solids, and the engine's own (a model stretched).
// Thresholds and their sources: docs/units.md, "Warnings".
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <string>
#include <string_view>
#include <vector>

namespace protonflow::units {

// What the unit's inlets held at their own equilibria, to set the product's gas and solids beside.
struct InletPhases {
  std::string label;                 // how the warnings name them: "feed", "inlets"
  double gas_amount = 0.0;           // mol/s in their gas phases
  std::vector<double> solid_amount;  // mol/s per solid, in the order of ChemicalSystem::solids()
};

// Adds the safety warnings about product, an equilibrium state of system. fouling says what solids
// do in this unit ("scaling and fouling of the heat-transfer surfaces, blocked lines").
void warn_about_product(std::string_view unit_type, std::string_view fouling, const thermo::ChemicalSystem& system,
                        const thermo::Speciation& product, const InletPhases& inlets, unit::Warnings& warnings);

// Adds the engine's warnings about one state (thermo::describe_warnings), each prefixed with the
// stream's name: "unit 'heater': feed: ...".
void warn_about_model(std::string_view unit_type, std::string_view stream, const thermo::Speciation& state,
                      unit::Warnings& warnings);

}  // namespace protonflow::units
