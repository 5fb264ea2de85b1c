// The equilibrium solver's private state and the pieces of its implementation, shared by
// equilibrium_solver.cpp (set-up, KINSOL, results), equilibrium_equations.cpp (residual and
// Jacobian), equilibrium_guess.cpp (cold start) and phase_set.cpp (which solids and gases exist).
#pragma once

#include <kinsol/kinsol.h>
#include <nvector/nvector_serial.h>
#include <sundials/sundials_matrix.h>

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <memory>
#include <string>
#include <vector>

#include "initial_guess.hpp"
#include "dense_linear_solver.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"
#include "protonflow/thermo/errors.hpp"

namespace protonflow::thermo {

namespace detail {

inline constexpr double inactive_log_molality = -700.0;  // stands for m = 0 in rows of absent solutes
inline constexpr double lowest_log = -700.0;
inline constexpr double highest_log = 40.0;  // e^40 mol/kg: far above any solution, keeps exp() finite

inline double safe_exp(double x) { return std::exp(std::clamp(x, lowest_log, highest_log)); }

}  // namespace detail

struct EquilibriumSolver::Impl {
  explicit Impl(const ChemicalSystem& chemical_system, SolverOptions solver_options);
  ~Impl();
  Impl(const Impl&) = delete;
  Impl& operator=(const Impl&) = delete;

  void solve(double temperature, double pressure, std::span<const double> amounts,
             std::span<const double> open_gas_pressures, Speciation& out);

  // The system of equations, evaluated at u: residual F(u) and its Jacobian.
  void evaluate_molalities(const double* u);
  // Σ_i ν_ib m_i of each basis species at the molalities held now, summed once for them: the warm
  // start's test, the residual scales and the residual at one point share it.
  const double* basis_amounts();
  void residual(const double* u, double* f);
  void jacobian(const double* u, SUNMatrix jacobian_matrix);
  void jacobian_entries(const double* u, double* data);  // column-major, size × size
  // The reduced form (docs/equilibrium.md, "Reduced form"): its unknowns are the full form's less
  // the secondary solutes' ln m, [0, nb) and [n, size); the secondary ln m solve their mass-action
  // rows inside the residual, and the Jacobian is the Schur complement of the mass-action block.
  bool solve_secondary(double* x);
  bool reduced_residual(const double* y, double* f);
  bool reduced_jacobian(const double* y, double* data);
  // A NaN in the reduced F is a recoverable failure, as in the full form's callback below.
  static int reduced_residual_callback(N_Vector y, N_Vector f, void* user_data) {
    auto* self = static_cast<Impl*>(user_data);
    double* values = N_VGetArrayPointer(f);
    if (!self->reduced_residual(N_VGetArrayPointer(y), values)) return 1;
    return has_nan(values, self->reduced_size) ? 1 : 0;
  }
  static int reduced_jacobian_callback(N_Vector y, N_Vector fy, SUNMatrix jacobian_matrix, void* user_data, N_Vector, N_Vector);
  std::size_t full_index(std::size_t reduced_index) const { return reduced_index < nb ? reduced_index : reduced_index + n - nb; }
  // ln of a solid's saturation ratio or a gas's p/p°: ln K + Σ_b ν_b ln a_b + ν_w ln a_w, and its
  // gradient over the solute unknowns.
  double phase_log_activity(const PhaseSpecies& p, double ln_k_phase) const;
  void phase_log_activity_gradient(const PhaseSpecies& p, double* gradient) const;
  // KINSOL's callbacks: the user data is this Impl.
  // A NaN in F is a failure KINSOL can recover from (a shorter step): its line search, given a NaN
  // norm, computes a NaN step length and never meets its own "too small" test, so it would never
  // return (docs/equilibrium.md, "Solving with KINSOL"). An infinite F it backtracks from itself.
  static int residual_callback(N_Vector u, N_Vector f, void* user_data) {
    auto* self = static_cast<Impl*>(user_data);
    double* values = N_VGetArrayPointer(f);
    self->residual(N_VGetArrayPointer(u), values);
    return has_nan(values, self->size) ? 1 : 0;
  }
  static bool has_nan(const double* f, std::size_t length) {
    for (std::size_t i = 0; i < length; ++i)
      if (std::isnan(f[i])) return true;
    return false;
  }
  // KINSOL's messages go into the error we throw, never to stderr: a library does not print.
  static void error_callback(int, const char*, const char* function, char* message, void* user_data) {
    static_cast<Impl*>(user_data)->kinsol_message = fmt::format("{}: {}", function, message);
  }
  static int jacobian_callback(N_Vector u, N_Vector fu, SUNMatrix jacobian_matrix, void* user_data, N_Vector, N_Vector);
  // Whether the next step may keep the LU already held (a chord step) instead of a new Jacobian.
  bool chord_step(const double* f, const double* scale, std::size_t length);

  double jacobian_finite_difference_error(double offset);
  void set_totals(std::span<const double> amounts, std::span<const double> open_gas_pressures);
  bool settle_phases();
  void predict_precipitation(std::size_t allowed_index);
  void update_log_k(double temperature, double pressure);
  void ideal_guess(double* u);  // for the current set of present phases
  void guess_pass(double* u, double ln_water_activity, bool first, double tolerance);
  void settle_water_mass(double* u) const;
  bool solve_current_set();
  bool replace_rival(std::size_t added);
  int run_kinsol(int strategy);
  int full_newton_steps(long most_steps);
  int end_full_newton_steps(int flag);
  void rescale_warm_start(double* u);
  void set_residual_scales(const double* u, double* scale);
  void scale_mass_action_rows(const double* u, double* scale) const;
  int run_newton();
  bool accepted(int flag);
  // With latest_residual_serves, the residual last evaluated stands for F at u if it was evaluated
  // there: only where the equations (totals, phases, T, P) cannot have changed since.
  double scaled_residual_norm(bool latest_residual_serves = false);
  std::vector<EquationResidual> residual_report();
  void fill(Speciation& out, bool warm);

  const ChemicalSystem* system;
  SolverOptions options;
  std::size_t n;      // solutes
  std::size_t nb;     // basis solutes (index 0 is H^+)
  // Unknowns: [0, n) ln m_i; n: ln W; then one per allowed solid (n_p / s_p), one per open gas
  // (uptake / ξ_s), one per gas of a closed phase (n_g / N_s) and the phase total (N / N_s).
  std::size_t solid_offset, open_offset, phase_offset, phase_total_index, size;
  std::vector<std::size_t> allowed;  // indices into system->solids() of the allowed solids
  std::vector<double> charge, stoichiometry, water_coefficient, ln_k;
  std::vector<double> ln_k_solid, ln_k_open, ln_k_phase;
  std::vector<char> active, solid_active;
  // Whether each basis species has a total or an open gas to supply it; set_totals rebuilds
  // `active` and `solid_active` from it when it changes (2 stands for "not yet set").
  std::vector<char> basis_available;
  // The active set: which allowed solids are present, whether the closed gas phase is; and the sets
  // already tried in this solve (flat, one row of allowed.size() + 2 flags each: the phases and the
  // outcome of their Newton solve; capacity reserved).
  std::vector<char> solid_present, previous_solid_present, tried_sets;
  bool gas_phase_present = false, previous_gas_phase_present = false;
  std::size_t maximum_rounds = 0;
  std::vector<double> basis_total;  // mol
  double water_total = 0.0;         // mol H2O as a component
  double proton_total = 0.0;        // mol H^+ from the tableau (for the cold start only)
  std::vector<double> solid_scale;  // s_p, mol: the most of each allowed solid the totals allow
  double uptake_scale = 1.0;        // ξ_s, mol: 1 mol per kg of the water present
  double phase_scale = 1.0;         // N_s, mol: all the moles the system holds
  std::vector<double> open_log_pressure;  // ln(p_g / p°) of each open gas
  double temperature = 0.0, pressure = 0.0, log_k_temperature = -1.0;
  std::unique_ptr<ActivityModel> activity;
  ActivityEvaluation evaluation;
  std::vector<double> molality;
  double water_mass = 0.0;
  std::vector<double> before_addition;  // u before the latest solid was added
  std::vector<double> newton_start;    // u before a Newton solve, for the full-step retry
  std::vector<double> guess_ln_gamma, conditional_ln_k;  // the guess's activity corrections
  std::vector<double> shift_by_basis;  // ln of the fraction of each basis species a precipitation leaves
  std::vector<double> guess_x, guess_totals, guess_stoichiometry, guess_ln_k, previous_u, gradient;
  std::vector<double> basis_amount;  // Σ_i ν_ib m_i of each basis species (basis_amounts())
  bool basis_amount_current = false;  // whether basis_amount is of the molalities held now
  std::vector<double> previous_basis_total;  // basis_total of the previous answer, mol
  std::vector<double> ln_basis_activity;  // ln a_b of each basis species, scratch of fill()
  std::vector<char> guess_active, previous_active;
  detail::GuessWorkspace guess_workspace;  // the cold start's work arrays (equilibrium_guess.cpp)
  bool has_previous = false;
  // The LU in the linear solver: at which T and P its Jacobian was evaluated, and whether the next
  // KINSOL call may start with it (a warm start of the same phase set: docs/equilibrium.md).
  bool factorization_current = false, reuse_factorization = false;
  // Whether the LU held was made in the current KINSOL call (or kept for its first step), and how
  // many chord steps have used it since.
  bool factored_this_call = false;
  int chord_steps = 0;
  double factored_temperature = -1.0, factored_pressure = -1.0;
  std::vector<char> factored_solid_present;  // the phase set the LU's Jacobian was evaluated for
  bool factored_gas_phase_present = false;
  int last_flag = 0;
  std::string kinsol_message;
  std::vector<double> latest_residual, latest_residual_at;  // the last F evaluated, and its u
  std::vector<double> evaluated_at;  // the u of the current molalities and activity evaluation
  bool evaluation_valid = false;
  // Non-zero stoichiometry of each solute, so the Jacobian skips the zeros of a sparse tableau.
  struct Term {
    std::size_t basis;
    double coefficient;
  };
  std::vector<std::vector<Term>> terms;

  // The reduced form's state: its size, the full u and F it works through, the full Jacobian and
  // its Schur complement, and the secondary solve's Newton matrix (sized once).
  std::size_t reduced_size = 0;
  std::vector<double> full_x, full_f, full_jacobian, secondary_matrix, secondary_step;
  std::vector<sunindextype> secondary_pivot;
  std::unique_ptr<detail::SchurComplement> schur;

  SUNContext context = nullptr;
  void* kinsol = nullptr;
  N_Vector u = nullptr, u_scale = nullptr, f_scale = nullptr, f_work = nullptr, newton_step = nullptr;
  long newton_iterations = 0;  // Newton steps of the latest KINSOL call or full_newton_steps
  N_Vector reduced_u = nullptr, reduced_u_scale = nullptr, reduced_f_scale = nullptr;  // reduced form only
  SUNMatrix jacobian_matrix = nullptr;
  SUNLinearSolver linear_solver = nullptr;
};

}  // namespace protonflow::thermo
