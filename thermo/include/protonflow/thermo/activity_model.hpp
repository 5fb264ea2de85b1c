// Activity models: one interface, so another model (Pitzer) can be added without touching the solver.
#pragma once

#include <memory>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace protonflow::thermo {

// Solute properties an activity model may use; index i is the solver's solute index.
struct SoluteProperties {
  std::vector<int> charge;
  std::vector<double> ion_size_angstrom;  // 0 for neutral species
  std::vector<std::string> name;          // species names; the Pitzer model finds its parameters by them
};

// Output buffers, sized once for n solutes; a model writes every entry on each call.
struct ActivityEvaluation {
  explicit ActivityEvaluation(std::size_t n = 0)
      : ln_gamma(n), d_ln_gamma_d_molality(n * n), d_ln_water_activity_d_molality(n) {}
  std::vector<double> ln_gamma;                        // natural log of γ_i (molal scale)
  std::vector<double> d_ln_gamma_d_molality;           // ∂ln γ_i/∂m_k, row-major n×n, kg/mol
  double ln_water_activity = 0.0;                      // from the Gibbs–Duhem equation
  std::vector<double> d_ln_water_activity_d_molality;  // ∂ln a_w/∂m_k, kg/mol
  double ionic_strength = 0.0;                         // mol/kg
};

class ActivityModel {
 public:
  virtual ~ActivityModel() = default;
  virtual std::string_view name() const noexcept = 0;
  // Ionic strength (mol/kg) above which the model's published accuracy no longer holds.
  virtual double maximum_ionic_strength() const noexcept = 0;
  // Fills every field of out for molalities m (mol/kg) at temperature (K) and pressure (Pa).
  virtual void evaluate(double temperature, double pressure, std::span<const double> molality,
                        ActivityEvaluation& out) const = 0;
};

enum class ActivityModelKind { ideal, davies, b_dot, pitzer };

// Davies (1962) for charged species, γ = 1 for neutral ones.
std::unique_ptr<ActivityModel> make_davies_model(SoluteProperties solutes);
// Extended Debye–Hückel with ion size and the B-dot term (Helgeson 1969).
std::unique_ptr<ActivityModel> make_b_dot_model(SoluteProperties solutes);
// γ = 1 and a_w from the mole fraction (Raoult): for ideal-solution check cases.
std::unique_ptr<ActivityModel> make_ideal_model(SoluteProperties solutes);

std::unique_ptr<ActivityModel> make_activity_model(ActivityModelKind kind, SoluteProperties solutes);

}  // namespace protonflow::thermo
