#include "ferrous_aeration.hpp"

#include <protonflow/thermo/errors.hpp>
#include <protonflow/unit_module.hpp>
#include <protonflow/units/component_combinations.hpp>
#include <protonflow/units/message_text.hpp>

#include <algorithm>
#include <cmath>
#include <ranges>

namespace protonflow::units {

namespace {

// The reaction is carried on at most this many slate components (FeCl2, Fe(OH)3, HCl and H2O take four).
constexpr std::size_t max_support = 5;

}  // namespace

FerrousAeration::FerrousAeration(std::string_view unit_type, const thermo::ChemicalSystem& system, double fraction)
    : prefix_("unit '" + std::string(unit_type) + "': parameter '" + parameter + "' " + number_text(fraction) + ": "),
      system_(&system),
      fraction_(fraction) {
  if (!active()) return;
  std::size_t ferric = 0;
  try {
    ferrous_ = system.index_of_solute("Fe^2+");
  } catch (const thermo::ThermoError&) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix_ + "the slate has no Fe(II) component (FeSO4, FeCl2): there is no ferrous iron to oxidise");
  }
  try {
    ferric = system.index_of_solute("Fe^3+");
  } catch (const thermo::ThermoError&) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix_ + "the slate has no Fe(III) component to receive the oxidised iron; add Fe(OH)3 (or FeCl3, "
                                    "Fe2(SO4)3) to the slate's components");
  }

  // The basis change per mol of Fe: -1 Fe^2+, +1 Fe^3+, -1 H^+ (solute 0), +1/2 H2O (the last row).
  const std::size_t basis = system.basis_count();
  const std::size_t rows = basis + 1;
  std::vector<double> target(rows, 0.0);
  target[ferrous_] = -1.0;
  target[ferric] = 1.0;
  target[0] = -1.0;
  target[basis] = 0.5;

  // Every combination of at most max_support components that carries the change exactly, none
  // containing another; by size, then by slate order. Which one a feed uses depends on what it
  // holds (apply): FeCl2 + FeCl3 needs acid to take from, FeCl2 + Fe(OH)3 only water.
  changes_ = component_combinations(system, target, max_support, CombinationSigns::any);
  if (changes_.empty()) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix_ + "no combination of at most " + std::to_string(max_support) +
                              " slate components carries Fe^2+ + 1/4 O2 + H^+ -> Fe^3+ + 1/2 H2O; add Fe(OH)3 and H2O "
                              "to the slate's components");
  }
}

void FerrousAeration::apply(std::span<const double> feed, std::span<double> aerated) {
  std::ranges::copy(feed, aerated.begin());
  oxidised_ = 0.0;
  if (!active()) return;
  double ferrous = 0.0;
  for (std::size_t c = 0; c < feed.size(); ++c) ferrous += system_->composition(c)[ferrous_] * feed[c];
  if (!(ferrous > 0.0)) {
    throw unit::UnitError(PFU_BAD_INLET, prefix_ + "the feed carries no Fe(II) (Fe^2+ total " + number_text(ferrous) +
                                             " mol/s): there is nothing to aerate; set it to 0 or feed ferrous iron");
  }
  const double amount = fraction_ * ferrous;
  for (const Change& change : changes_) {
    // Up to 1e-12 of a component's flow may go below zero: round-off when all of it is oxidised.
    bool fits = true;
    for (std::size_t c = 0; c < feed.size() && fits; ++c) {
      fits = feed[c] + amount * change[c] >= -1e-12 * (std::abs(feed[c]) + amount);
    }
    if (!fits) continue;
    for (std::size_t c = 0; c < feed.size(); ++c) aerated[c] = std::max(0.0, feed[c] + amount * change[c]);
    oxidised_ = amount;
    return;
  }
  throw unit::UnitError(PFU_BAD_INLET,
                        prefix_ + "oxidising " + number_text(amount) +
                            " mol/s of Fe(II) would leave a component of the feed with a negative flow (the H^+ it takes "
                            "has to come from the feed's acid); add Fe(OH)3 to the slate's components, or feed acid");
}

}  // namespace protonflow::units
