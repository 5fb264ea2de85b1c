// Phase bookkeeping: an equilibrium's solids and gases written as the slate's formula-component
// flows, row by row, the rest in the aqueous row (docs/units.md, "Phase bookkeeping").
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <cstddef>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace protonflow::units {

class PhasePlacement {
 public:
  // Finds, once, how each solid the system may precipitate and each gas of its gas phase is
  // written on the slate's components; the system is only read here, not kept.
  PhasePlacement(std::string_view unit_type, const thermo::ChemicalSystem& system, const unit::Slate& slate);

  // Writes every flow of outlet from state, the equilibrium of totals (mol/s per component, all
  // phases): solids and gases into their rows where the slate can hold them, the rest of the
  // totals into the aqueous row; warns for each species that stays in the aqueous row.
  void write(std::span<const double> totals, const thermo::Speciation& state, unit::OutletState& outlet,
             unit::Warnings& warnings);

 private:
  // One way to write a phase species as slate components: per component, mol per mol of species.
  using Combination = std::vector<double>;

  // Where the equilibrium's amount of one solid or gas goes in the outlet stream.
  struct Placement {
    std::string name;
    std::size_t row = 0;                    // PFU_GAS_ROW, or the slate row of the solid phase
    std::vector<Combination> combinations;  // non-negative, fewest components first; empty: unplaceable
    std::string unplaced_reason;            // why it stays in the aqueous row, when it must
  };

  void place(const Placement& placement, double amount, std::span<const double> totals, unit::OutletState& outlet,
             unit::Warnings& warnings);

  std::string unit_type_;
  std::vector<Placement> solids_;  // in the order of ChemicalSystem::solids()
  std::vector<Placement> gases_;   // in the order of ChemicalSystem::phase_gases()
  std::vector<double> remainder_;  // scratch: what is left for the aqueous row
};

}  // namespace protonflow::units
