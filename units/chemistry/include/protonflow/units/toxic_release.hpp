// Toxic gases a liquor gives off where one of its species meets acid: chlorine from hypochlorite
// (HOCl and OCl^- with chloride and H^+ form Cl2(aq): the chlorine hydrolysis run backwards) and
// hydrogen cyanide from cyanide (docs/units.md, "Warnings"). Every chemistry unit whose product can
// hold them gives these warnings the same way.
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <string_view>

namespace protonflow::units {

// Warns where the partial pressure of Cl2 or HCN over product (an equilibrium state of system), as a
// closed headspace over the liquor would hold it, passes the gas's NIOSH recommended exposure limit
// [niosh-pocket-guide]: Cl2 0.5 ppm (ceiling), HCN 4.7 ppm (short-term). The warning gives the
// dissolved molecular gas in mg/L of water, the pH, and what to do. Gases the system does not reach
// are skipped.
void warn_about_toxic_release(std::string_view unit_type, const thermo::ChemicalSystem& system,
                              const thermo::Speciation& product, unit::Warnings& warnings);

}  // namespace protonflow::units
