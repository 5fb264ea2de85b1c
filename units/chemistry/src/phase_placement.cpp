#include <protonflow/units/phase_placement.hpp>

#include <algorithm>
#include <cmath>
#include <utility>

#include <protonflow/units/component_combinations.hpp>
#include <protonflow/units/message_text.hpp>

namespace protonflow::units {

namespace {

// A phase species (a solid or a gas) is written onto the slate as a combination of at most this
// many components, found once at create.
constexpr std::size_t max_combination = 3;

std::vector<double> target_of(const thermo::PhaseSpecies& species) {
  std::vector<double> target = species.stoichiometry;
  target.push_back(species.water_coefficient);
  return target;
}

std::string no_combination_reason(const std::string& name) {
  return name + " is no non-negative combination of at most " + std::to_string(max_combination) +
         " slate components; add a component of its formula to the slate";
}

}  // namespace

PhasePlacement::PhasePlacement(std::string_view unit_type, const thermo::ChemicalSystem& system, const unit::Slate& slate)
    : unit_type_(unit_type) {
  for (const thermo::PhaseSpecies& solid : system.solids()) {
    Placement p;
    p.name = solid.name;
    const auto row = std::ranges::find(slate.solids, solid.name);
    if (row == slate.solids.end()) {
      p.unplaced_reason = "the slate has no solid phase '" + solid.name + "'; add it to the slate's solids";
    } else {
      p.row = PFU_FIRST_SOLID_ROW + static_cast<std::size_t>(row - slate.solids.begin());
      p.combinations = component_combinations(system, target_of(solid), max_combination, CombinationSigns::non_negative);
      if (p.combinations.empty()) p.unplaced_reason = no_combination_reason(solid.name);
    }
    solids_.push_back(std::move(p));
  }
  for (const thermo::PhaseSpecies& gas : system.phase_gases()) {
    Placement p;
    p.name = gas.name;
    p.row = PFU_GAS_ROW;
    p.combinations = component_combinations(system, target_of(gas), max_combination, CombinationSigns::non_negative);
    if (p.combinations.empty()) p.unplaced_reason = no_combination_reason(gas.name);
    gases_.push_back(std::move(p));
  }
  remainder_.assign(slate.components.size(), 0.0);
}

void PhasePlacement::write(std::span<const double> totals, const thermo::Speciation& state, unit::OutletState& outlet,
                           unit::Warnings& warnings) {
  std::ranges::fill(outlet.flows, 0.0);
  std::ranges::copy(totals, remainder_.begin());
  for (std::size_t s = 0; s < solids_.size(); ++s) place(solids_[s], state.solid_amount[s], totals, outlet, warnings);
  if (state.gas_phase_present) {
    for (std::size_t g = 0; g < gases_.size(); ++g) place(gases_[g], state.gas_amount[g], totals, outlet, warnings);
  }
  for (std::size_t c = 0; c < remainder_.size(); ++c) outlet.flow(PFU_AQUEOUS_ROW, c) = remainder_[c];
}

// Moves amount × the first combination the remaining totals can cover into the species' row.
void PhasePlacement::place(const Placement& p, double amount, std::span<const double> totals, unit::OutletState& outlet,
                           unit::Warnings& warnings) {
  if (amount <= 0.0) return;
  const std::string head =
      "unit '" + unit_type_ + "': " + p.name + " (" + number_text(amount, 4) + " mol/s) is present in the product, but ";
  if (p.combinations.empty()) {
    warnings.add(head + p.unplaced_reason + ". It is carried in the aqueous row: totals are right, the phase split is not");
    return;
  }
  for (const Combination& combination : p.combinations) {
    bool fits = true;
    for (std::size_t c = 0; c < combination.size() && fits; ++c) {
      // Up to 1e-10 of a component's total may be missing: the engine's mass-balance tolerance.
      fits = remainder_[c] - amount * combination[c] >= -1e-10 * totals[c];
    }
    if (!fits) continue;
    for (std::size_t c = 0; c < combination.size(); ++c) {
      if (combination[c] == 0.0) continue;
      const double moved = std::min(amount * combination[c], remainder_[c]);
      outlet.flow(p.row, c) += moved;
      remainder_[c] -= moved;
    }
    return;
  }
  warnings.add(head + "no way of writing it on the slate's components leaves the aqueous row non-negative. It is carried "
                      "in the aqueous row: totals are right, the phase split is not");
}

}  // namespace protonflow::units
