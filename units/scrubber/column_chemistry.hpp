// The scrubber's view of a slate: which components the column carries in its liquid and which
// gases leave it (docs/units.md, "scrubber", "Column components").
//
// The column's liquid components are chosen from the slate so that every physical liquid has
// non-negative amounts of them: every slate component that is also a gas of the species data
// (H2O, CO2, HCl, SO2, ...), each carrying its own basis species, and then, for each remaining
// basis species, a slate component that carries it alone beside H+ and H2O (NaOH for Na+). A
// liquor given in other components (Na2CO3) is re-expressed in these (2 NaOH + CO2 − H2O), so that
// soda ash giving up its CO2 to an acid gas leaves no negative amount behind.
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/activity_model.hpp>
#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/database.hpp>

#include <memory>
#include <span>
#include <string_view>
#include <vector>

#include "chemistry_stage_model.hpp"

namespace protonflow::scrubber {

struct ColumnChemistry {
  std::unique_ptr<thermo::ChemicalSystem> liquid_system;  // the column's components; no gas phase, no solids
  std::unique_ptr<thermo::ChemicalSystem> flash_system;   // the same with a gas phase, for stage flashes
  std::vector<ColumnGas> gases;                            // one per volatile column component
  std::vector<std::size_t> slate_component;                // per column component: its slate index
  std::vector<std::size_t> gas_of_slate_component;         // per slate component: its gas, or no_component
  // Column amount k = Σ_c to_column[k][c] · slate amount c (liquids only; exact for the basis).
  std::vector<std::vector<double>> to_column;

  // The column's liquid amounts of a slate liquid (mol/s per slate component).
  std::vector<double> liquid_of(std::span<const double> slate_amounts) const;
};

// Builds the column's chemistry over slate with the given activity model. Throws
// unit::UnitError(PFU_INVALID_PARAMETER) when the slate lacks H2O or a component to carry one of
// its basis species alone, naming it; the message begins "unit 'UNIT_TYPE': ".
ColumnChemistry make_column_chemistry(std::string_view unit_type, const thermo::Database& database,
                                      const unit::Slate& slate, thermo::ActivityModelKind activity);

}  // namespace protonflow::scrubber
