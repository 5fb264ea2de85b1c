#pragma once
// The ways of writing a change of basis totals as a combination of slate components: a solid or
// gas put on a slate's row (phase_placement), a reaction applied to a feed (the neutraliser's
// aeration). docs/units.md, "The unit chemistry library".
#include <protonflow/thermo/chemical_system.hpp>

#include <cstddef>
#include <span>
#include <vector>

namespace protonflow::units {

// Whether a combination may take components away (a reaction) or only add them (a phase).
enum class CombinationSigns { non_negative, any };

// Every combination of at most most_components slate components whose basis composition (and
// water, the last entry of target) equals target exactly, none containing another, with no zero
// coefficient and coefficients snapped to simple fractions; by size, then by slate order. Each is
// one coefficient per slate component.
std::vector<std::vector<double>> component_combinations(const thermo::ChemicalSystem& system, std::span<const double> target,
                                                        std::size_t most_components, CombinationSigns signs);

}  // namespace protonflow::units
