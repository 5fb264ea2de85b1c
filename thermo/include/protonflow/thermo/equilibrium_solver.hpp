// Aqueous speciation on KINSOL: given T, P and component amounts, find every solute's molality.
#pragma once

#include <memory>
#include <span>
#include <string>
#include <vector>

#include "protonflow/thermo/chemical_system.hpp"

namespace protonflow::thermo {

// Conditions a user must hear about: the answer is a converged solution of the model, but the
// model itself is stretched. Bit flags, so a warm solve allocates nothing.
enum SpeciationWarning : unsigned {
  ionic_strength_beyond_model = 1u << 0,
};

struct Speciation {
  double temperature = 0.0;         // K
  double pressure = 0.0;            // Pa
  double ph = 0.0;                  // −log10 a(H^+)
  double ionic_strength = 0.0;      // mol/kg
  double water_mass = 0.0;          // kg of solvent water
  double water_activity = 0.0;
  std::vector<double> molality;     // per solute, mol/kg
  std::vector<double> activity;     // per solute
  std::vector<double> log10_gamma;  // per solute
  // Solids, in the order of ChemicalSystem::solids(): amount precipitated (mol; 0 for a solid that
  // is absent or not allowed) and saturation index log10(IAP/Ksp) (NaN outside the solid's data range).
  std::vector<double> solid_amount;
  std::vector<double> saturation_index;
  // Open gases, in the order of ChemicalSystem::open_gases(): mol taken up by the solution from the
  // reservoir (negative: released to it).
  std::vector<double> gas_uptake;
  // Closed gas phase, in the order of ChemicalSystem::phase_gases(): mol in the gas phase and the
  // equilibrium partial pressure over the solution (Pa; equals y·P when the phase exists).
  bool gas_phase_present = false;
  double gas_phase_amount = 0.0;  // mol
  std::vector<double> gas_amount;
  std::vector<double> partial_pressure;
  long iterations = 0;              // Newton iterations of the final KINSOL call
  double residual_norm = 0.0;       // scaled max-norm of the residual at the answer
  bool warm_started = false;
  unsigned warnings = 0;                 // SpeciationWarning flags
  double activity_model_limit = 0.0;     // the model's maximum ionic strength, mol/kg
  const char* activity_model_name = "";  // static string owned by the model
};

// One sentence per warning flag set in a speciation, for reports.
std::vector<std::string> describe_warnings(const Speciation& speciation);

// How Newton's equations are posed and solved (docs/equilibrium.md, "Reduced form").
enum class NewtonForm {
  full,           // every solute's ln m an unknown, one LU of the whole Jacobian
  full_by_schur,  // the same Newton steps, solved by the Schur complement of the mass-action block
  reduced,        // basis ln m, ln W and phases the unknowns; secondary solutes from mass action
};

struct SolverOptions {
  double tolerance = 1e-13;  // scaled residual (relative mass balance, relative charge balance)
  long max_iterations = 200;
  NewtonForm form = NewtonForm::full;
};

class EquilibriumSolver {
 public:
  explicit EquilibriumSolver(const ChemicalSystem& system, SolverOptions options = {});
  ~EquilibriumSolver();
  EquilibriumSolver(EquilibriumSolver&&) noexcept;
  EquilibriumSolver& operator=(EquilibriumSolver&&) noexcept;
  EquilibriumSolver(const EquilibriumSolver&) = delete;
  EquilibriumSolver& operator=(const EquilibriumSolver&) = delete;

  // Solves for temperature (K), pressure (Pa) and amounts (mol) of each component, in the order
  // of system.components(). Warm-starts from the previous answer when there is one. Writes into
  // out (sized on first use, reused after). Throws ThermoError(bad_input, out_of_range) or
  // ConvergenceError with the residuals.
  void solve(double temperature, double pressure, std::span<const double> amounts, Speciation& out);
  Speciation solve(double temperature, double pressure, std::span<const double> amounts);
  // The same with the partial pressures (Pa) of the system's open gases, in their order.
  void solve(double temperature, double pressure, std::span<const double> amounts,
             std::span<const double> open_gas_pressures, Speciation& out);

  // Forget the previous answer, so the next solve starts cold.
  void reset_warm_start() noexcept;

  // A check for tests: the largest difference between the analytic Jacobian of the equations and
  // central finite differences of the residual, each relative to its row's largest entry, at the
  // previous answer moved off the solution by `offset` in every ln unknown (docs/equilibrium.md).
  // Needs a previous solve; throws ThermoError(bad_input) without one.
  double jacobian_finite_difference_error(double offset = 0.01);

  const ChemicalSystem& system() const noexcept;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace protonflow::thermo
