// The titration of a feed by a reagent: the equilibrium of feed + dose at a temperature, as a
// function of the reagent-to-feed mass ratio, and the dose that brings it to a target pH
// (docs/units.md, "neutraliser", "Equations").
//
//   n(x) = n_feed + s(x) n_reagent,   s(x) = x m_feed / m_reagent
//   pH(x) = pH of the equilibrium of n(x) at T, P
//
// with n the component totals (mol/s, all phases), m the mass flows (kg/s) and x in kg of reagent
// per kg of feed. Every equilibrium warm-starts from the previous one (one solver, reused).
//
// At constant outflow (a sump whose make-up water is cut back as reagent goes in), each kg of
// reagent displaces a kg of a given stream d of the feed (mass m_d, kg/s):
//
//   n(x) = n_feed + s(x) n_reagent − x m_feed / m_d · n_d
//
// so that the mass of n(x) stays m_feed, and x can go no higher than m_d / m_feed.
#pragma once

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <cstddef>
#include <optional>
#include <span>
#include <string>
#include <vector>

namespace protonflow::units {

// Mass flow (kg/s) of component totals (mol/s) on a system's components.
double mass_flow(const thermo::ChemicalSystem& system, std::span<const double> totals);

class Titration {
 public:
  // The system must outlive the titration and stay where it is.
  explicit Titration(const thermo::ChemicalSystem& system);

  // The feed's and the reagent's totals (mol/s per component, all phases) as they enter.
  void set_streams(std::span<const double> feed, std::span<const double> reagent);
  // The same, at constant outflow: each kg of reagent displaces a kg of displaced, a stream of the
  // feed (its totals, mol/s per component, all phases; it must have mass).
  void set_streams(std::span<const double> feed, std::span<const double> reagent, std::span<const double> displaced);
  // The highest ratio with no more of the displaced stream displaced than the feed holds; infinite
  // without a displaced stream.
  double displacement_limit() const noexcept;
  // The parameter names the dose search's errors use (default: target_ph, max_reagent_ratio).
  void name_parameters(std::string target, std::string ratio_max);
  // The same with the feed's mass (kg/s) as it enters, where its totals were changed before the
  // equilibrium (aeration adds oxygen): the ratio stays per kg of the feed as it enters.
  void set_streams(std::span<const double> feed, std::span<const double> reagent, double feed_mass);
  double feed_mass() const noexcept { return feed_mass_; }        // kg/s
  double reagent_mass() const noexcept { return reagent_mass_; }  // kg/s, as it enters
  // The ratio (kg/kg) of the reagent as it enters.
  double inlet_ratio() const noexcept { return reagent_mass_ / feed_mass_; }

  // Totals at a ratio x (kg reagent per kg feed); valid until the next call.
  std::span<const double> totals_at(double ratio);
  // The equilibrium at ratio x, T (K) and P (Pa); throws thermo errors. Counts solves.
  const thermo::Speciation& equilibrate(double ratio, double temperature, double pressure);
  double ph_at(double ratio, double temperature, double pressure) { return equilibrate(ratio, temperature, pressure).ph; }
  // pH of the reagent alone at T and P: the limit of pH(x) as x grows without bound.
  double reagent_ph(double temperature, double pressure);

  // The ratio in [0, ratio_max] where pH(x) = target at T, P: TOMS 748 [alefeld-potra-shi-1995]
  // on g(x) = pH(x) − target, to |g| <= 1e-9 or a bracket of relative width 1e-13. Throws
  // protonflow::unit::UnitError (PFU_INVALID_PARAMETER) when the target lies outside
  // [pH(0), pH(ratio_max)], saying why: the feed is already past it, the reagent cannot reach it
  // (naming the reagent's own pH, the highest or lowest it can give), or ratio_max is too small.
  // A hint (a ratio found at a nearby temperature, or at the last pass of a recycle) is tried
  // first, as find_ratio_near: where that brackets the target the ends of [0, ratio_max] are
  // never solved.
  double find_ratio(double target, double temperature, double pressure, double ratio_max, const std::string& unit_type,
                    double hint = 0.0);
  // The same search from a hint alone: the bracket hint ± 0.01 %, widened sixteenfold towards the
  // target each time pH does not change sign across it, inside (0, ratio_max]. Nothing when the
  // widening reaches 0 or ratio_max without a sign change (then only find_ratio can say why).
  // pH(x) is monotone in x (a titration curve), so a bracket found here means the target is
  // reachable and not already passed at x = 0.
  std::optional<double> find_ratio_near(double target, double temperature, double pressure, double ratio_max,
                                        const std::string& unit_type, double hint);
  // The same from a hint by secant steps, for a dose that moves by a small fraction of itself between
  // calls on a steep but smooth curve: the first step with last_slope (dpH/dx where the hint was
  // found; 0 or not finite: the first step measures it), then TOMS 748 once two steps straddle the
  // target, to find_ratio's stopping rules. Nothing where the hint is more than one pH off, a step
  // leaves (0, ratio_max] or goes against the slope, or six steps do not meet the target (then
  // find_ratio_near or find_ratio decide). last_slope becomes the slope the answer was found on.
  std::optional<double> find_ratio_by_secant(double target, double temperature, double pressure, double ratio_max,
                                             double hint, double& last_slope);

  long solves() const noexcept { return solves_; }
  void reset_count() noexcept { solves_ = 0; }
  const thermo::Speciation& state() const noexcept { return state_; }

 private:
  // g(x) = pH(x) − target as the dose searches take it (0 within the stopping rule's 1e-9 pH),
  // keeping in best_ratio and best_miss the ratio whose pH has come nearest the target.
  double miss_tracked(double ratio, double target, double temperature, double pressure, double& best_ratio,
                      double& best_miss);
  double search(double target, double temperature, double pressure, double low, double high, double low_miss,
                double high_miss, const std::string& unit_type);

  const thermo::ChemicalSystem* system_;
  thermo::EquilibriumSolver solver_;
  thermo::EquilibriumSolver reagent_solver_;
  std::vector<double> feed_;
  std::vector<double> reagent_;
  std::vector<double> displaced_;
  std::vector<double> totals_;
  double feed_mass_ = 0.0;
  double reagent_mass_ = 0.0;
  double displaced_mass_ = 0.0;  // 0: nothing displaced
  std::string target_name_ = "target_ph";
  std::string ratio_max_name_ = "max_reagent_ratio";
  thermo::Speciation state_;
  thermo::Speciation reagent_state_;
  long solves_ = 0;
};

}  // namespace protonflow::units
