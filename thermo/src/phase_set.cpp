// Which solids and gas phase are present: the active-set rule (docs/equilibrium.md, "Solids").
#include "equilibrium_solver_impl.hpp"

#include <boost/math/tools/roots.hpp>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"

namespace protonflow::thermo {

using detail::highest_log;
using detail::inactive_log_molality;
using detail::lowest_log;
using detail::safe_exp;

// The active-set rule for phases (docs/equilibrium.md): solve with the present phases saturated and
// the others absent; if a present phase came out with a negative amount, remove the most negative;
// otherwise, if an absent phase is supersaturated, add the most supersaturated; otherwise done. A
// set solved before in the same solve is a cycle and an error, so the sets never oscillate. A set
// whose Newton solve failed may be met once more, from the answer of a neighbouring set: that start
// is closer than the one it failed from.
bool EquilibriumSolver::Impl::settle_phases() {
  constexpr double supersaturation_to_add = 1e-10;  // log10 units, well inside the 1e-8 of the tests
  // Each row of tried_sets: the present flags of the allowed solids, the gas phase's, the outcome.
  enum Outcome : char { solved, failed, failed_twice };
  const std::size_t width = allowed.size() + 2;
  const auto& solids = system->solids();
  const auto record = [&](Outcome outcome) {
    tried_sets.insert(tried_sets.end(), solid_present.begin(), solid_present.end());
    tried_sets.push_back(static_cast<char>(gas_phase_present));
    tried_sets.push_back(outcome);
  };
  tried_sets.clear();
  std::ptrdiff_t last_added = -1;
  for (std::size_t round = 0; round < maximum_rounds; ++round) {
    const std::size_t rows = tried_sets.size() / width;
    std::size_t row = rows;  // this set's row in tried_sets
    for (std::size_t r = 0; r < rows && row == rows; ++r)
      if (std::equal(solid_present.begin(), solid_present.end(), tried_sets.begin() + static_cast<std::ptrdiff_t>(r * width)) &&
          tried_sets[r * width + allowed.size()] == static_cast<char>(gas_phase_present))
        row = r;
    if (row < rows && tried_sets[row * width + width - 1] != failed) {
      std::string phases;
      for (std::size_t a = 0; a < allowed.size(); ++a)
        if (solid_present[a]) phases += (phases.empty() ? "" : ", ") + solids[allowed[a]].name;
      if (gas_phase_present) phases += phases.empty() ? "gas phase" : ", gas phase";
      throw ConvergenceError(fmt::format("the set of phases present cycles back to {{{}}}; no consistent set was found",
                                         phases),
                             residual_report(), 0);
    }
    if (row == rows) record(solved);

    if (!solve_current_set()) {
      tried_sets[row * width + width - 1] = tried_sets[row * width + width - 1] == failed ? failed_twice : failed;
      // A solid just added that cannot coexist with the present phases (gypsum and anhydrite are
      // both saturated only at one water activity) replaces a present phase it shares a basis
      // species with; without such a rival the failure stands.
      if (last_added < 0 || !replace_rival(static_cast<std::size_t>(last_added))) return false;
      record(solved);
    } else {
      tried_sets[row * width + width - 1] = solved;
    }
    last_added = -1;
    const double* x = N_VGetArrayPointer(u);
    evaluate_molalities(x);

    // Remove the present phase with the most negative (scaled) amount.
    double most_negative = 0.0;
    std::ptrdiff_t remove = -1;  // allowed-solid index, or allowed.size() for the gas phase
    for (std::size_t a = 0; a < allowed.size(); ++a)
      if (solid_present[a] && x[solid_offset + a] < most_negative) {
        most_negative = x[solid_offset + a];
        remove = static_cast<std::ptrdiff_t>(a);
      }
    if (gas_phase_present && x[phase_total_index] < most_negative) remove = static_cast<std::ptrdiff_t>(allowed.size());
    if (remove >= 0) {
      if (static_cast<std::size_t>(remove) == allowed.size()) {
        gas_phase_present = false;
      } else {
        solid_present[static_cast<std::size_t>(remove)] = 0;
      }
      continue;
    }
    // Add the absent phase that is most supersaturated.
    double most_supersaturated = supersaturation_to_add;
    std::ptrdiff_t add = -1;
    for (std::size_t a = 0; a < allowed.size(); ++a) {
      if (solid_present[a] || !solid_active[allowed[a]]) continue;
      const double si = phase_log_activity(solids[allowed[a]], ln_k_solid[allowed[a]]) / constants::ln10;
      if (si > most_supersaturated) {
        most_supersaturated = si;
        add = static_cast<std::ptrdiff_t>(a);
      }
    }
    if (!gas_phase_present && !system->phase_gases().empty()) {
      double pressure_sum = 0.0;
      for (std::size_t g = 0; g < system->phase_gases().size(); ++g)
        pressure_sum += safe_exp(phase_log_activity(system->phase_gases()[g], ln_k_phase[g])) *
                        constants::standard_atmosphere / pressure;
      if (std::log10(pressure_sum) > most_supersaturated) add = static_cast<std::ptrdiff_t>(allowed.size());
    }
    if (add < 0) return true;
    if (static_cast<std::size_t>(add) == allowed.size()) {
      gas_phase_present = true;
    } else {
      std::copy(N_VGetArrayPointer(u), N_VGetArrayPointer(u) + size, before_addition.begin());
      solid_present[static_cast<std::size_t>(add)] = 1;
      last_added = add;
      predict_precipitation(static_cast<std::size_t>(add));
    }
  }
  throw ConvergenceError(fmt::format("the set of phases present did not settle in {} rounds", maximum_rounds),
                         residual_report(), 0);
}

// Tries the set with `added` in place of each present solid that shares a basis species with it,
// from the state before `added` came in; keeps the first that solves.
bool EquilibriumSolver::Impl::replace_rival(std::size_t added) {
  const auto& solids = system->solids();
  const PhaseSpecies& newcomer = solids[allowed[added]];
  // The rivals that share the most basis species with the newcomer first: a hydrate and its
  // anhydrous form (mirabilite, thenardite) share all of theirs, halite only Na^+ with them.
  const auto shared_with = [&](std::size_t rival) {
    std::size_t shared = 0;
    for (std::size_t b = 1; b < nb; ++b)
      shared += newcomer.stoichiometry[b] != 0.0 && solids[allowed[rival]].stoichiometry[b] != 0.0 ? 1 : 0;
    return shared;
  };
  std::size_t most_shared = 0;
  for (std::size_t rival = 0; rival < allowed.size(); ++rival)
    if (rival != added && solid_present[rival]) most_shared = std::max(most_shared, shared_with(rival));
  for (std::size_t count = most_shared; count > 0; --count) {
    for (std::size_t rival = 0; rival < allowed.size(); ++rival) {
      if (rival == added || !solid_present[rival] || shared_with(rival) != count) continue;
      solid_present[rival] = 0;
      double* x = N_VGetArrayPointer(u);
      std::copy(before_addition.begin(), before_addition.end(), x);
      x[solid_offset + rival] = 0.0;
      predict_precipitation(added);
      if (solve_current_set()) return true;
      solid_present[rival] = 1;
    }
  }
  // The gas phase is a rival too where one of its gases shares a basis species with the newcomer:
  // halite out of a strong brine lowers the ionic strength, and with it the activities that raised
  // the vapour pressures to the total pressure.
  if (gas_phase_present) {
    bool shares = false;
    for (const PhaseSpecies& gas : system->phase_gases())
      for (std::size_t b = 1; b < nb; ++b) shares = shares || (newcomer.stoichiometry[b] != 0.0 && gas.stoichiometry[b] != 0.0);
    if (shares) {
      gas_phase_present = false;
      double* x = N_VGetArrayPointer(u);
      std::copy(before_addition.begin(), before_addition.end(), x);
      std::fill(x + phase_offset, x + size, 0.0);
      predict_precipitation(added);
      if (solve_current_set()) return true;
      gas_phase_present = true;
    }
  }
  return false;
}

// Newton for the current set from where the previous set left off; if that fails, Newton again
// from the ideal guess made for this set.
bool EquilibriumSolver::Impl::solve_current_set() {
  last_flag = run_newton();
  if (accepted(last_flag)) return true;
  ideal_guess(N_VGetArrayPointer(u));
  last_flag = run_newton();
  return accepted(last_flag);
}

// Before Newton meets a newly added solid, precipitate the amount ξ that saturates it if the
// solution's speciation stayed in proportion: ln Ω(ξ) = ln Ω(0) + Σ_b ν_pb ln(1 − ν_pb ξ / S_b) = 0
// over the basis species the solid takes (S_b: what the solution holds). ln Ω falls monotonically in
// ξ, so TOMS 748 brackets the root; Newton then corrects what the proportional guess missed. From a
// state many decades supersaturated, this is the difference between a few Newton steps and none.
void EquilibriumSolver::Impl::predict_precipitation(std::size_t a) {
  double* x = N_VGetArrayPointer(u);
  evaluate_molalities(x);
  const PhaseSpecies& p = system->solids()[allowed[a]];
  const double ln_omega = phase_log_activity(p, ln_k_solid[allowed[a]]);
  // What the solution holds of each basis species the solid takes, and the most ξ can be.
  double ceiling = 1e300;
  for (std::size_t b = 1; b < nb; ++b) {
    guess_totals[b] = 0.0;
    if (p.stoichiometry[b] <= 0.0) continue;
    for (std::size_t i = 0; i < n; ++i) guess_totals[b] += stoichiometry[i * nb + b] * molality[i] * water_mass;
    ceiling = std::min(ceiling, guess_totals[b] / p.stoichiometry[b]);
  }
  if (!(ln_omega > 0.0) || !(ceiling > 0.0) || ceiling >= 1e300) return;
  const auto saturation = [&](double xi) {
    double value = ln_omega;
    for (std::size_t b = 1; b < nb; ++b)
      if (p.stoichiometry[b] > 0.0) value += p.stoichiometry[b] * std::log1p(-p.stoichiometry[b] * xi / guess_totals[b]);
    return value;
  };
  const double high = ceiling * (1.0 - 1e-15);
  const double at_high = saturation(high);
  if (!(at_high < 0.0)) return;
  std::uintmax_t iterations = 60;
  const auto [low_end, high_end] = boost::math::tools::toms748_solve(
      saturation, 0.0, high, ln_omega, at_high, boost::math::tools::eps_tolerance<double>(30), iterations);
  const double xi = 0.5 * (low_end + high_end);
  // Scale the basis species, and every solute built from them, by the fraction left in solution.
  shift_by_basis[0] = 0.0;  // H^+ is left to Newton
  for (std::size_t b = 1; b < nb; ++b)
    shift_by_basis[b] = p.stoichiometry[b] > 0.0 ? std::log1p(-p.stoichiometry[b] * xi / guess_totals[b]) : 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    if (!active[i]) continue;
    double shift = 0.0;
    for (const Term& t : terms[i]) shift += t.coefficient * shift_by_basis[t.basis];
    x[i] += shift;
  }
  x[solid_offset + a] = xi / solid_scale[a];
}

}  // namespace protonflow::thermo
