// The Pitzer ion-interaction model (Pitzer 1973, 1991) behind ActivityModel, and what it alone can
// give: the excess Gibbs energy itself, its temperature derivative (relative enthalpy), and the
// species it has no parameters for. Equations: docs/activity.md.
#pragma once

#include <array>
#include <memory>
#include <span>
#include <string>
#include <vector>

#include "protonflow/thermo/activity_model.hpp"
#include "protonflow/thermo/pitzer_parameters.hpp"

namespace protonflow::thermo {

class PitzerModel final : public ActivityModel {
 public:
  // solutes.name must be filled; throws ThermoError(bad_input) otherwise.
  PitzerModel(SoluteProperties solutes, const PitzerParameters& parameters);
  ~PitzerModel() override;
  PitzerModel(const PitzerModel&) = delete;
  PitzerModel& operator=(const PitzerModel&) = delete;

  std::string_view name() const noexcept override { return "pitzer"; }
  double maximum_ionic_strength() const noexcept override;
  void evaluate(double temperature, double pressure, std::span<const double> molality,
                ActivityEvaluation& out) const override;

  // G^ex / (w_w R T), mol/kg: the one function every other result derives from.
  double excess_gibbs_energy(double temperature, double pressure, std::span<const double> molality) const;
  // Relative enthalpy of the solution per kilogram of water, L / w_w = −R T² ∂(G^ex/(w_w R T))/∂T
  // at constant molalities, J/kg (the heat released on dilution to infinity, per kg of water).
  double relative_enthalpy(double temperature, double pressure, std::span<const double> molality) const;
  // Relative partial molal enthalpies at constant molalities, J/mol: of each solute,
  // L̄_i = −R T² ∂ln γ_i/∂T, into solutes (sized as the molalities), and of water,
  // L̄_w = −R T² ∂ln a_w/∂T, returned. Σ m_i L̄_i + L̄_w / M_w = relative_enthalpy (Euler).
  double relative_partial_enthalpies(double temperature, double pressure, std::span<const double> molality,
                                     std::span<double> solutes) const;
  // Names of solutes the model has no parameters for: a charged one with no binary parameters
  // against any counter-ion of the system, a neutral one with no λ. Only the Debye–Hückel term
  // (charged) or nothing (neutral, γ = 1) acts on them.
  const std::vector<std::string>& species_without_parameters() const noexcept;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

// J(x) of the unsymmetrical mixing term Eθ by Pitzer's (1975) approximation, eq. 47, with its first
// and second derivatives in x: {J, dJ/dx, d²J/dx²}. Zero for x ≤ 0.
std::array<double, 3> pitzer_1975_j(double x);

std::unique_ptr<ActivityModel> make_pitzer_model(SoluteProperties solutes,
                                                 const PitzerParameters& parameters = bundled_pitzer_parameters());

}  // namespace protonflow::thermo
