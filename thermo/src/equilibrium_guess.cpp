// The cold start of the equilibrium solver (docs/equilibrium.md, "First guess").
#include "equilibrium_solver_impl.hpp"

#include <Eigen/LU>

#include "initial_guess.hpp"
#include "protonflow/thermo/constants.hpp"

namespace protonflow::thermo {

using detail::highest_log;
using detail::inactive_log_molality;
using detail::lowest_log;
using detail::safe_exp;

// The cold start: the ideal problem (then with the previous pass's γ and a_w as conditional
// constants) minimised as a convex function of the basis ln molalities, W from the water total. A
// phase of fixed activity — an open gas (p/p°) or a solid taken as present (activity 1) — fixes one
// basis species, its pivot: the guess swaps the phase into the basis in its place
// (docs/equilibrium.md), which keeps the problem convex, and the phase's amount follows from the
// pivots' mass balances.
void EquilibriumSolver::Impl::ideal_guess(double* x) {
  // How closely each pass meets its ideal balances (relative to each total). A pass before the last
  // only starts the next, whose activity corrections move the balances by far more; the last only
  // has to land in the basin of Newton on the full problem, which finishes it (docs/equilibrium.md).
  constexpr double early_pass_tolerance = 1e-1;
  constexpr double last_pass_tolerance = 1e-4;
  // Up to three passes: ideal first, then with the activity coefficients and water activity of the
  // previous pass as conditional constants, which brings a concentrated solution's guess close.
  std::fill(guess_ln_gamma.begin(), guess_ln_gamma.end(), 0.0);
  double ln_water_activity = 0.0;
  const int passes = system->options().activity == ActivityModelKind::ideal ? 1 : 3;
  for (int pass = 0; pass < passes; ++pass) {
    guess_pass(x, ln_water_activity, pass == 0, pass + 1 == passes ? last_pass_tolerance : early_pass_tolerance);
    if (pass + 1 == passes) break;
    evaluate_molalities(x);
    std::copy(evaluation.ln_gamma.begin(), evaluation.ln_gamma.end(), guess_ln_gamma.begin());
    ln_water_activity = evaluation.ln_water_activity;
  }
}

void EquilibriumSolver::Impl::guess_pass(double* x, double ln_water_activity, bool first, double tolerance) {
  const double water_guess = water_total * constants::water_molar_mass;
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
  struct Fixed {
    const PhaseSpecies* phase;
    std::size_t pivot, unknown;
    double constant, scale;  // ln activity − ln K; amount = scale · x[unknown] is held out of solution
  };
  std::vector<Fixed> fixed;
  // ln activity − ln K − Σ_b ν_b ln γ_b − ν_w ln a_w: the phase's condition on the basis molalities.
  const auto condition = [&](const PhaseSpecies& p, double ln_activity, double ln_k_phase) {
    double c = ln_activity - ln_k_phase - p.water_coefficient * ln_water_activity;
    for (std::size_t b = 0; b < nb; ++b) c -= p.stoichiometry[b] * guess_ln_gamma[b];
    return c;
  };
  for (std::size_t o = 0; o < open.size(); ++o)
    fixed.push_back({&open[o], open[o].pivot, open_offset + o, condition(open[o], open_log_pressure[o], ln_k_open[o]),
                     -uptake_scale});
  for (std::size_t a = 0; a < allowed.size(); ++a)
    if (solid_present[a])
      fixed.push_back({&solids[allowed[a]], nb, solid_offset + a, condition(solids[allowed[a]], 0.0, ln_k_solid[allowed[a]]),
                       solid_scale[a]});

  // row[f]: phase f's stoichiometry in the current (swapped) basis. Each phase takes as pivot a basis
  // species still in its swapped row (an open gas its own pivot where it can, H^+ only as the last
  // resort); a phase whose swapped row has none left (anhydrite after gypsum: only water remains)
  // is left for Newton to place.
  std::vector<std::vector<double>> row(fixed.size());
  std::vector<char> pivot_taken(nb, 0);
  std::vector<Fixed> swapped;
  std::vector<std::vector<double>> swapped_row;
  for (std::size_t f = 0; f < fixed.size(); ++f) row[f] = fixed[f].phase->stoichiometry;
  for (std::size_t f = 0; f < fixed.size(); ++f) {
    constexpr double negligible = 1e-12;
    std::size_t pivot = nb;
    if (fixed[f].pivot < nb && std::abs(row[f][fixed[f].pivot]) > negligible && !pivot_taken[fixed[f].pivot])
      pivot = fixed[f].pivot;
    for (std::size_t b = 1; b < nb && pivot == nb; ++b)
      if (std::abs(row[f][b]) > negligible && !pivot_taken[b] && active[b]) pivot = b;
    if (pivot == nb && std::abs(row[f][0]) > negligible && !pivot_taken[0]) pivot = 0;
    if (pivot == nb) continue;
    pivot_taken[pivot] = 1;
    fixed[f].pivot = pivot;
    const double nu_pivot = row[f][pivot];
    // x_pivot = (constant − Σ_{b≠pivot} ν_fb x_b) / ν_f,pivot; substitute into every solute and later phase.
    for (std::size_t i = 0; i < n; ++i) {
      const double nu = guess_stoichiometry[i * nb + pivot];
      if (nu == 0.0) continue;
      for (std::size_t b = 0; b < nb; ++b)
        if (b != pivot) guess_stoichiometry[i * nb + b] -= nu * row[f][b] / nu_pivot;
      guess_ln_k[i] += nu * fixed[f].constant / nu_pivot;
      guess_stoichiometry[i * nb + pivot] = 0.0;
    }
    for (std::size_t later = f + 1; later < fixed.size(); ++later) {
      const double nu = row[later][pivot];
      if (nu == 0.0) continue;
      for (std::size_t b = 0; b < nb; ++b)
        if (b != pivot) row[later][b] -= nu * row[f][b] / nu_pivot;
      fixed[later].constant -= nu * fixed[f].constant / nu_pivot;
      row[later][pivot] = 0.0;
    }
    for (std::size_t b = 0; b < nb; ++b)
      if (b != pivot) guess_totals[b] -= row[f][b] / nu_pivot * guess_totals[pivot];
    guess_active[pivot] = 0;  // not swept: it follows from the phase
    swapped.push_back(fixed[f]);
    swapped_row.push_back(row[f]);
  }
  // The first pass starts from the totals; a later one from the pass before, whose conditional
  // constants differ from its own only by the activity corrections.
  for (std::size_t b = 0; b < nb; ++b)
    if (first || !std::isfinite(guess_x[b]) || !active[b])
      guess_x[b] = !active[b] ? inactive_log_molality : b == 0 ? std::log(1e-7) : std::log(std::max(std::abs(guess_totals[b]), 1e-7));
  // Swapped-out and absent basis species are not variables, but solutes built from them stay in.
  detail::GuessProblem problem{n, nb, guess_stoichiometry, guess_ln_k, std::span<const char>(guess_active.data(), n),
                               guess_totals, std::span<const char>(active.data(), n)};
  detail::minimise_ideal_dual(problem, guess_x, 100, tolerance);
  // Back-substitute the pivots, last swap first.
  for (std::size_t f = swapped.size(); f-- > 0;) {
    const std::size_t pivot = swapped[f].pivot;
    double value = swapped[f].constant;
    for (std::size_t b = 0; b < nb; ++b)
      if (b != pivot) value -= swapped_row[f][b] * guess_x[b];
    guess_x[pivot] = value / swapped_row[f][pivot];
  }
  for (std::size_t b = 0; b < nb; ++b) x[b] = active[b] ? std::clamp(guess_x[b], lowest_log, highest_log) : inactive_log_molality;
  for (std::size_t i = nb; i < n; ++i) {
    if (!active[i]) {
      x[i] = inactive_log_molality;
      continue;
    }
    double exponent = conditional_ln_k[i];
    for (std::size_t b = 0; b < nb; ++b) exponent += stoichiometry[i * nb + b] * x[b];
    x[i] = std::clamp(exponent, lowest_log, highest_log);
  }
  x[n] = std::log(water_guess);
  std::fill(x + solid_offset, x + size, 0.0);
  if (swapped.empty()) return;

  // Amounts held in the swapped phases: the pivots' mass balances, Σ_f ν_f,q h_f = T_q − D_q.
  const auto& fixed_phases = swapped;
  Eigen::MatrixXd balance(fixed_phases.size(), fixed_phases.size());
  Eigen::VectorXd missing(fixed_phases.size());
  for (std::size_t q = 0; q < fixed_phases.size(); ++q) {
    const std::size_t pivot = fixed_phases[q].pivot;
    double dissolved = 0.0;
    for (std::size_t i = 0; i < n; ++i)
      if (active[i]) dissolved += stoichiometry[i * nb + pivot] * std::exp(x[i]) * water_guess;
    missing[static_cast<Eigen::Index>(q)] = (pivot == 0 ? proton_total : basis_total[pivot]) - dissolved;
    for (std::size_t f = 0; f < fixed_phases.size(); ++f)
      balance(static_cast<Eigen::Index>(q), static_cast<Eigen::Index>(f)) = fixed_phases[f].phase->stoichiometry[pivot];
  }
  const Eigen::VectorXd held = balance.fullPivLu().solve(missing);
  for (std::size_t f = 0; f < fixed_phases.size(); ++f)
    if (std::isfinite(held[static_cast<Eigen::Index>(f)]))
      x[fixed_phases[f].unknown] = held[static_cast<Eigen::Index>(f)] / fixed_phases[f].scale;
}

}  // namespace protonflow::thermo
