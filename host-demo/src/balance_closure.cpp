#include "balance_closure.hpp"

#include <algorithm>
#include <cmath>

#include "protonflow/thermo/constants.hpp"

namespace protonflow::host {
namespace {

// Sums that keep the magnitude of their terms, so a closure is relative to what was added up
// (a proton balance can be near zero while its terms are large).
struct BalanceSum {
  double net = 0.0;
  double magnitude = 0.0;
  void add(double term) {
    net += term;
    magnitude += std::abs(term);
  }
};

double relative_difference(const BalanceSum& found, const BalanceSum& given) {
  const double scale = std::max(found.magnitude, given.magnitude);
  return scale > 0.0 ? (found.net - given.net) / scale : 0.0;
}

}  // namespace

BalanceClosure measure_closure(const thermo::ChemicalSystem& system, std::span<const double> amounts,
                               const thermo::Speciation& speciation) {
  const std::vector<thermo::Solute>& solutes = system.solutes();
  const std::size_t basis_count = system.basis_count();
  const std::size_t component_count = system.components().size();
  BalanceClosure closure;

  for (std::size_t b = 0; b < basis_count; ++b) {
    BalanceSum given;
    for (std::size_t c = 0; c < component_count; ++c) {
      given.add(amounts[c] * system.composition(c)[b]);
    }
    // What open gases brought in counts as given; precipitated solids and a gas phase as found.
    for (std::size_t o = 0; o < system.open_gases().size(); ++o)
      given.add(speciation.gas_uptake[o] * system.open_gases()[o].stoichiometry[b]);
    BalanceSum found;
    for (std::size_t i = 0; i < solutes.size(); ++i) {
      found.add(speciation.molality[i] * speciation.water_mass * solutes[i].stoichiometry[b]);
    }
    for (std::size_t p = 0; p < system.solids().size(); ++p)
      found.add(speciation.solid_amount[p] * system.solids()[p].stoichiometry[b]);
    for (std::size_t g = 0; g < system.phase_gases().size(); ++g)
      found.add(speciation.gas_amount[g] * system.phase_gases()[g].stoichiometry[b]);
    if (b == 0) {
      // The solver balances H^+ through the charge balance, so the proton balance closes to the
      // charge balance's accuracy: measure it against the equivalents in solution, not against its
      // own terms, which in a neutral solution are a millionth of them.
      for (std::size_t i = 0; i < solutes.size(); ++i)
        found.magnitude += 0.5 * std::abs(solutes[i].charge) * speciation.molality[i] * speciation.water_mass;
    }
    closure.mass.push_back(BalanceResidual{solutes[b].name, relative_difference(found, given)});
  }

  // Water: the free solvent plus what the formation reactions of the solutes took from it.
  BalanceSum water_given;
  for (std::size_t c = 0; c < component_count; ++c) {
    water_given.add(amounts[c] * system.water_in(c));
  }
  BalanceSum water_found;
  water_found.add(speciation.water_mass / thermo::constants::water_molar_mass);
  for (std::size_t i = 0; i < solutes.size(); ++i) {
    water_found.add(speciation.molality[i] * speciation.water_mass * solutes[i].water_coefficient);
  }
  for (std::size_t o = 0; o < system.open_gases().size(); ++o)
    water_given.add(speciation.gas_uptake[o] * system.open_gases()[o].water_coefficient);
  for (std::size_t p = 0; p < system.solids().size(); ++p)
    water_found.add(speciation.solid_amount[p] * system.solids()[p].water_coefficient);
  for (std::size_t g = 0; g < system.phase_gases().size(); ++g)
    water_found.add(speciation.gas_amount[g] * system.phase_gases()[g].water_coefficient);
  closure.mass.push_back(BalanceResidual{"H2O", relative_difference(water_found, water_given)});

  BalanceSum charge;
  for (std::size_t i = 0; i < solutes.size(); ++i) {
    charge.add(solutes[i].charge * speciation.molality[i]);
  }
  closure.charge = charge.magnitude > 0.0 ? charge.net / charge.magnitude : 0.0;
  return closure;
}

}  // namespace protonflow::host
