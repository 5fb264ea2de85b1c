// The neutraliser's own safety warnings about its product: toxic gas over the liquor, CO2 foaming,
// a hot outlet, a corrosive liquor (docs/units.md, "neutraliser", "Warnings"). The shared product
// warnings (product_warnings.hpp) add the gas phase, the solids and hot corrosive liquor.
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <string_view>

namespace protonflow::units {

void warn_about_release(std::string_view unit_type, const thermo::ChemicalSystem& system, const thermo::Speciation& product,
                        unit::Warnings& warnings);

}  // namespace protonflow::units
