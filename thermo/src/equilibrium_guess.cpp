// The cold start of the equilibrium solver (docs/equilibrium.md, "First guess").
#include "equilibrium_solver_impl.hpp"

#include "initial_guess.hpp"
#include "protonflow/thermo/constants.hpp"

namespace protonflow::thermo {

using detail::highest_log;
using detail::inactive_log_molality;
using detail::lowest_log;
using detail::safe_exp;

// The cold start: the ideal problem with conditional constants (γ and a_w at full dissociation
// first, then those of the previous pass's answer) minimised as a convex function of the basis ln
// molalities, W from the water balance at the previous pass's answer (the water total at first). A
// phase of fixed activity — an open gas (p/p°) or a solid taken as present (activity 1) — fixes one
// basis species, its pivot: the guess swaps the phase into the basis in its place
// (docs/equilibrium.md), which keeps the problem convex, and the phase's amount follows from the
// pivots' mass balances.
void EquilibriumSolver::Impl::ideal_guess(double* x) {
  // How closely each pass meets its ideal balances (relative to each total). A pass before the last
  // sets the next pass's activity corrections, and the closer those come to their fixed point the
  // fewer Newton iterations the full problem needs (1e-2 against 1e-1: 2.65 against 2.96 on the
  // benchmark, fewer instructions in all); the last only has to land in the basin of Newton on the
  // full problem, which finishes it (docs/equilibrium.md, docs/performance.md).
  constexpr double early_pass_tolerance = 1e-2;
  constexpr double last_pass_tolerance = 1e-4;
  // Three passes, each with the activity coefficients and water activity at the answer of the pass
  // before as conditional constants, which brings a concentrated solution's guess close.
  const int passes = system->options().activity == ActivityModelKind::ideal ? 1 : 3;
  std::fill(guess_ln_gamma.begin(), guess_ln_gamma.end(), 0.0);
  double ln_water_activity = 0.0;
  if (passes > 1) {
    // The first pass's corrections: the model's at full dissociation (each basis species at its
    // total, no complexes, H^+ at 1e-7 mol/kg). Its ionic strength errs high where ions pair, but
    // lands the first pass far closer to the answer than γ = 1 does.
    const double water_guess = water_total * constants::water_molar_mass;
    std::fill(x, x + size, 0.0);
    for (std::size_t i = 0; i < n; ++i) x[i] = inactive_log_molality;
    for (std::size_t b = 1; b < nb; ++b)
      if (active[b]) x[b] = std::log(std::max(basis_total[b] / water_guess, 1e-300));
    x[0] = std::log(1e-7);
    x[n] = std::log(water_guess);
    evaluate_molalities(x);
    std::copy(evaluation.ln_gamma.begin(), evaluation.ln_gamma.end(), guess_ln_gamma.begin());
    ln_water_activity = evaluation.ln_water_activity;
  }
  for (int pass = 0; pass < passes; ++pass) {
    guess_pass(x, ln_water_activity, pass == 0, pass + 1 == passes ? last_pass_tolerance : early_pass_tolerance);
    settle_water_mass(x);
    if (pass + 1 == passes) break;
    evaluate_molalities(x);
    std::copy(evaluation.ln_gamma.begin(), evaluation.ln_gamma.end(), guess_ln_gamma.begin());
    ln_water_activity = evaluation.ln_water_activity;
  }
}

// The water balance W (1/M_w + Σ_i ν_iw m_i) + Σ_p ν_pw n_p − Σ_o ν_ow ξ_o = T_w solved for W at the
// pass's molalities and phase amounts: a pass takes the totals per kg of this water. W = T_w M_w
// (the first pass's) is off by the water bound in the solutes and phases, about 2e-3 at 0.1 mol/kg,
// which would be the largest residual handed to Newton.
void EquilibriumSolver::Impl::settle_water_mass(double* x) const {
  double bound = 1.0 / constants::water_molar_mass;
  for (std::size_t i = 0; i < n; ++i)
    if (active[i] && water_coefficient[i] != 0.0) bound += water_coefficient[i] * std::exp(x[i]);
  double outside = 0.0;
  const auto& solids = system->solids();
  for (std::size_t a = 0; a < allowed.size(); ++a)
    if (solid_present[a]) outside += solids[allowed[a]].water_coefficient * solid_scale[a] * x[solid_offset + a];
  const auto& open = system->open_gases();
  for (std::size_t o = 0; o < open.size(); ++o) outside -= open[o].water_coefficient * uptake_scale * x[open_offset + o];
  // Within a factor 2 of T_w M_w: a poor pass must not carry the next far off.
  const double nominal = water_total * constants::water_molar_mass;
  const double water = (water_total - outside) / bound;
  if (std::isfinite(water)) x[n] = std::log(std::clamp(water, 0.5 * nominal, 2.0 * nominal));
}

void EquilibriumSolver::Impl::guess_pass(double* x, double ln_water_activity, bool first, double tolerance) {
  // The first pass takes W = T_w M_w; a later one the W the pass before settled.
  const double water_guess = first ? water_total * constants::water_molar_mass : std::exp(x[n]);
  std::copy(stoichiometry.begin(), stoichiometry.end(), guess_stoichiometry.begin());
  // Conditional constants: ln m_i = ln K'_i + Σ_b ν_ib ln m_b with the γ and a_w of the last pass.
  for (std::size_t i = 0; i < n; ++i) {
    double k = ln_k[i];
    if (i >= nb) {
      k += water_coefficient[i] * ln_water_activity - guess_ln_gamma[i];
      for (const Term& t : terms[i]) k += t.coefficient * guess_ln_gamma[t.basis];
    }
    conditional_ln_k[i] = k;
  }
  std::copy(conditional_ln_k.begin(), conditional_ln_k.end(), guess_ln_k.begin());
  std::copy(active.begin(), active.end(), guess_active.begin());
  for (std::size_t b = 0; b < nb; ++b) guess_totals[b] = (b == 0 ? proton_total : basis_total[b]) / water_guess;

  // The fixed phases: open gases first (their pivots are chosen by the system), then present solids.
  const auto& open = system->open_gases();
  const auto& solids = system->solids();
  detail::GuessWorkspace& work = guess_workspace;
  auto& fixed = work.fixed;
  fixed.clear();
  // ln activity − ln K − Σ_b ν_b ln γ_b − ν_w ln a_w: the phase's condition on the basis molalities.
  const auto condition = [&](const PhaseSpecies& p, double ln_activity, double ln_k_phase) {
    double c = ln_activity - ln_k_phase - p.water_coefficient * ln_water_activity;
    for (std::size_t b = 0; b < nb; ++b) c -= p.stoichiometry[b] * guess_ln_gamma[b];
    return c;
  };
  for (std::size_t o = 0; o < open.size(); ++o)
    fixed.push_back({open[o].stoichiometry, open[o].pivot, open_offset + o,
                     condition(open[o], open_log_pressure[o], ln_k_open[o]), -uptake_scale});
  for (std::size_t a = 0; a < allowed.size(); ++a)
    if (solid_present[a])
      fixed.push_back({solids[allowed[a]].stoichiometry, nb, solid_offset + a,
                       condition(solids[allowed[a]], 0.0, ln_k_solid[allowed[a]]), solid_scale[a]});

  // row(f): phase f's stoichiometry in the current (swapped) basis. Each phase takes as pivot a basis
  // species still in its swapped row (an open gas its own pivot where it can, H^+ only as the last
  // resort); a phase whose swapped row has none left (anhydrite after gypsum: only water remains)
  // is left for Newton to place.
  work.row.resize(fixed.size() * nb);
  work.pivot_taken.assign(nb, 0);
  work.swapped.clear();
  work.swapped_row.clear();
  const auto row = [&](std::size_t f) { return work.row.data() + f * nb; };
  for (std::size_t f = 0; f < fixed.size(); ++f) std::copy(fixed[f].stoichiometry.begin(), fixed[f].stoichiometry.end(), row(f));
  for (std::size_t f = 0; f < fixed.size(); ++f) {
    constexpr double negligible = 1e-12;
    const double* own = row(f);
    std::size_t pivot = nb;
    if (fixed[f].pivot < nb && std::abs(own[fixed[f].pivot]) > negligible && !work.pivot_taken[fixed[f].pivot])
      pivot = fixed[f].pivot;
    for (std::size_t b = 1; b < nb && pivot == nb; ++b)
      if (std::abs(own[b]) > negligible && !work.pivot_taken[b] && active[b]) pivot = b;
    if (pivot == nb && std::abs(own[0]) > negligible && !work.pivot_taken[0]) pivot = 0;
    if (pivot == nb) continue;
    work.pivot_taken[pivot] = 1;
    fixed[f].pivot = pivot;
    const double nu_pivot = own[pivot];
    // x_pivot = (constant − Σ_{b≠pivot} ν_fb x_b) / ν_f,pivot; substitute into every solute and later phase.
    for (std::size_t i = 0; i < n; ++i) {
      const double nu = guess_stoichiometry[i * nb + pivot];
      if (nu == 0.0) continue;
      for (std::size_t b = 0; b < nb; ++b)
        if (b != pivot) guess_stoichiometry[i * nb + b] -= nu * own[b] / nu_pivot;
      guess_ln_k[i] += nu * fixed[f].constant / nu_pivot;
      guess_stoichiometry[i * nb + pivot] = 0.0;
    }
    for (std::size_t later = f + 1; later < fixed.size(); ++later) {
      double* other = row(later);
      const double nu = other[pivot];
      if (nu == 0.0) continue;
      for (std::size_t b = 0; b < nb; ++b)
        if (b != pivot) other[b] -= nu * own[b] / nu_pivot;
      fixed[later].constant -= nu * fixed[f].constant / nu_pivot;
      other[pivot] = 0.0;
    }
    for (std::size_t b = 0; b < nb; ++b)
      if (b != pivot) guess_totals[b] -= own[b] / nu_pivot * guess_totals[pivot];
    guess_active[pivot] = 0;  // not swept: it follows from the phase
    work.swapped.push_back(fixed[f]);
    work.swapped_row.insert(work.swapped_row.end(), own, own + nb);
  }
  const auto& swapped = work.swapped;
  const auto swapped_row = [&](std::size_t f) { return work.swapped_row.data() + f * nb; };
  // The first pass starts from the totals; a later one from the pass before, whose conditional
  // constants differ from its own only by the activity corrections.
  for (std::size_t b = 0; b < nb; ++b)
    if (first || !std::isfinite(guess_x[b]) || !active[b])
      guess_x[b] = !active[b] ? inactive_log_molality : b == 0 ? std::log(1e-7) : std::log(std::max(std::abs(guess_totals[b]), 1e-7));
  // Swapped-out and absent basis species are not variables, but solutes built from them stay in.
  detail::GuessProblem problem{n, nb, guess_stoichiometry, guess_ln_k, std::span<const char>(guess_active.data(), n),
                               guess_totals, std::span<const char>(active.data(), n)};
  // The passes of one cold start share the phases swapped in, hence the problem's structure.
  if (first) detail::prepare_ideal_dual(problem, work.dual);
  detail::minimise_ideal_dual(problem, guess_x, 100, tolerance, work.dual);
  // Back-substitute the pivots, last swap first.
  for (std::size_t f = swapped.size(); f-- > 0;) {
    const std::size_t pivot = swapped[f].pivot;
    const double* own = swapped_row(f);
    double value = swapped[f].constant;
    for (std::size_t b = 0; b < nb; ++b)
      if (b != pivot) value -= own[b] * guess_x[b];
    guess_x[pivot] = value / own[pivot];
  }
  for (std::size_t b = 0; b < nb; ++b) x[b] = active[b] ? std::clamp(guess_x[b], lowest_log, highest_log) : inactive_log_molality;
  for (std::size_t i = nb; i < n; ++i) {
    if (!active[i]) {
      x[i] = inactive_log_molality;
      continue;
    }
    double exponent = conditional_ln_k[i];
    for (const Term& t : terms[i]) exponent += t.coefficient * x[t.basis];
    x[i] = std::clamp(exponent, lowest_log, highest_log);
  }
  x[n] = std::log(water_guess);
  std::fill(x + solid_offset, x + size, 0.0);
  if (swapped.empty()) return;

  // Amounts held in the swapped phases: the pivots' mass balances, Σ_f ν_f,q h_f = T_q − D_q.
  const std::size_t count = swapped.size();
  work.balance.resize(count * count);
  work.missing.resize(count);
  work.held.resize(count);
  for (std::size_t q = 0; q < count; ++q) {
    const std::size_t pivot = swapped[q].pivot;
    double dissolved = 0.0;
    for (std::size_t i = 0; i < n; ++i)
      if (active[i]) dissolved += stoichiometry[i * nb + pivot] * std::exp(x[i]) * water_guess;
    work.missing[q] = (pivot == 0 ? proton_total : basis_total[pivot]) - dissolved;
    for (std::size_t f = 0; f < count; ++f) work.balance[q * count + f] = swapped[f].stoichiometry[pivot];
  }
  detail::solve_small_system(count, work.balance, work.missing, work.held, work.column_order);
  for (std::size_t f = 0; f < count; ++f)
    if (std::isfinite(work.held[f])) x[swapped[f].unknown] = work.held[f] / swapped[f].scale;
}

}  // namespace protonflow::thermo
