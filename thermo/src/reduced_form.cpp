// The reduced (tableau) form of the equilibrium equations: Newton over the basis solutes' ln m, ln W
// and the phase amounts, with every secondary solute's ln m solved from its mass-action row inside
// the residual (docs/equilibrium.md, "Reduced form").
#include <limits>

#include "dense_linear_solver.hpp"
#include "equilibrium_solver_impl.hpp"

namespace protonflow::thermo {

using detail::inactive_log_molality;

// Solves the mass-action rows for the secondary ln m at the basis ln m and ln W in x, by Newton on
// those rows alone (their Jacobian is the full form's mass-action block), from each row's own
// answer with the activity terms of the latest evaluation. False if it does not converge.
bool EquilibriumSolver::Impl::solve_secondary(double* x) {
  const std::size_t ns = n - nb;
  const double* ln_gamma = evaluation.ln_gamma.data();
  for (std::size_t i = nb; i < n; ++i) {
    if (!active[i]) {
      x[i] = inactive_log_molality;
      continue;
    }
    double value = ln_k[i] + water_coefficient[i] * evaluation.ln_water_activity - ln_gamma[i];
    for (const Term& t : terms[i]) value += t.coefficient * (x[t.basis] + ln_gamma[t.basis]);
    x[i] = std::clamp(value, detail::lowest_log, detail::highest_log);
  }
  // The rows are solved when each residual is a hundredth of the tolerance (relative to its rounding
  // floor, as scale_mass_action_rows measures it), or when Newton's steps reach that floor: a step
  // of a few ε in ln m, or one that no longer halves while below 1e-9 (rounding, not convergence).
  const double floor_per_magnitude = 8.0 * std::numeric_limits<double>::epsilon() / options.tolerance;
  const double solved = 1e-2 * options.tolerance;
  constexpr int most_steps = 50;
  double previous_largest = std::numeric_limits<double>::infinity();
  for (int step = 0; step < most_steps; ++step) {
    evaluate_molalities(x);
    double worst = 0.0;
    for (std::size_t i = nb; i < n; ++i) {
      double& h = secondary_step[i - nb];
      if (!active[i]) {
        h = 0.0;
        continue;
      }
      h = x[i] + ln_gamma[i] - water_coefficient[i] * evaluation.ln_water_activity - ln_k[i];
      double magnitude = std::abs(ln_k[i]) + std::abs(x[i]) + std::abs(ln_gamma[i]);
      for (const Term& t : terms[i]) {
        h -= t.coefficient * (x[t.basis] + ln_gamma[t.basis]);
        magnitude += std::abs(t.coefficient) * (std::abs(x[t.basis]) + std::abs(ln_gamma[t.basis]));
      }
      worst = std::max(worst, std::abs(h) / std::max(1.0, floor_per_magnitude * magnitude));
      h = -h;
    }
    if (worst <= solved) return true;
    // ∂h_s/∂ln m_k over the secondary k: δ_sk + (∂ln γ_s/∂m_k − ν_sw ∂ln a_w/∂m_k − Σ_b ν_sb ∂ln γ_b/∂m_k) m_k.
    const double* dg = evaluation.d_ln_gamma_d_molality.data();
    const double* dw = evaluation.d_ln_water_activity_d_molality.data();
    double* a = secondary_matrix.data();  // column-major, ns × ns
    for (std::size_t i = nb; i < n; ++i) {
      const std::size_t row = i - nb;
      for (std::size_t k = nb; k < n; ++k) {
        double entry = 0.0;
        if (active[i]) {
          entry = dg[i * n + k] - water_coefficient[i] * dw[k];
          for (const Term& t : terms[i]) entry -= t.coefficient * dg[t.basis * n + k];
          entry *= molality[k];
        }
        a[(k - nb) * ns + row] = entry + (i == k ? 1.0 : 0.0);
      }
    }
    const auto length = static_cast<sunindextype>(ns);
    if (detail::factor_in_place(a, length, secondary_pivot.data()) != 0) return false;
    detail::solve_in_place(a, length, secondary_pivot.data(), secondary_step.data());
    double largest = 0.0, largest_x = 1.0;
    for (std::size_t s = 0; s < ns; ++s) {
      largest = std::max(largest, std::abs(secondary_step[s]));
      if (active[nb + s]) largest_x = std::max(largest_x, std::abs(x[nb + s]));
    }
    if (!std::isfinite(largest)) return false;
    constexpr double longest_step = 5.0;  // in ln m: a start far off is approached, not overshot
    const double shorten = largest > longest_step ? longest_step / largest : 1.0;
    for (std::size_t i = nb; i < n; ++i)
      if (active[i]) x[i] = std::clamp(x[i] + shorten * secondary_step[i - nb], detail::lowest_log, detail::highest_log);
    const bool at_rounding_floor =
        largest <= 4.0 * std::numeric_limits<double>::epsilon() * largest_x || (largest < 1e-9 && largest > 0.5 * previous_largest);
    if (at_rounding_floor) return true;
    previous_largest = largest;
  }
  return false;
}

// F_reduced(y): the full form's rows outside the mass-action block, at the full u whose secondary
// ln m solve the mass-action rows.
bool EquilibriumSolver::Impl::reduced_residual(const double* y, double* f) {
  for (std::size_t r = 0; r < reduced_size; ++r) full_x[full_index(r)] = y[r];
  if (!solve_secondary(full_x.data())) return false;
  residual(full_x.data(), full_f.data());
  for (std::size_t r = 0; r < reduced_size; ++r) f[r] = full_f[full_index(r)];
  return true;
}

// dF_reduced/dy by the implicit-function theorem: with J the full Jacobian at the solved u and i the
// mass-action block, J_oo − J_oi J_ii⁻¹ J_io, the Schur complement of J_ii.
bool EquilibriumSolver::Impl::reduced_jacobian(const double* y, double* data) {
  bool at_y = true;
  for (std::size_t r = 0; r < reduced_size; ++r) at_y = at_y && full_x[full_index(r)] == y[r];
  if (!at_y && !reduced_residual(y, N_VGetArrayPointer(f_work))) return false;
  jacobian_entries(full_x.data(), full_jacobian.data());
  return schur->form(full_jacobian.data(), data) == 0;
}

int EquilibriumSolver::Impl::reduced_jacobian_callback(N_Vector y, N_Vector fy, SUNMatrix jm, void* user_data, N_Vector, N_Vector) {
  auto* self = static_cast<Impl*>(user_data);
  // The first step of a warm solve keeps the LU of the previous answer; near the answer, chord
  // steps keep the LU of the step before (as the full form's jacobian_callback).
  if (self->reuse_factorization) {
    self->reuse_factorization = false;
    detail::keep_factorization(jm);
    return 0;
  }
  if (self->chord_step(N_VGetArrayPointer(fy), N_VGetArrayPointer(self->reduced_f_scale), self->reduced_size)) {
    detail::keep_factorization(jm);
    return 0;
  }
  self->factorization_current = true;
  self->factored_temperature = self->temperature;
  self->factored_pressure = self->pressure;
  std::copy(self->solid_present.begin(), self->solid_present.end(), self->factored_solid_present.begin());
  self->factored_gas_phase_present = self->gas_phase_present;
  if (!self->reduced_jacobian(N_VGetArrayPointer(y), detail::dense_jacobian_data(jm))) {
    self->factorization_current = false;
    return 1;
  }
  self->factored_this_call = true;
  self->chord_steps = 0;
  return 0;
}

}  // namespace protonflow::thermo
