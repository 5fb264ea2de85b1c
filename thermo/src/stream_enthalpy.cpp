#include "protonflow/thermo/stream_enthalpy.hpp"

#include <boost/math/tools/roots.hpp>
#include <algorithm>
#include <cmath>
#include <limits>
#include <fmt/format.h>
#include <optional>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/water_enthalpy.hpp"

namespace protonflow::thermo {

namespace {

// H(T) = H°(298.15 K) + Cp° (T − 298.15 K): constant heat capacity (docs/energy.md).
template <typename Species>
double species_enthalpy(const Species& s, double temperature, double amount) {
  if (amount == 0.0) return 0.0;
  if (std::isnan(s.reference_enthalpy))
    throw ThermoError(ErrorKind::bad_data,
                      fmt::format("'{}' has no formation enthalpy in the species data, so the energy balance of this "
                                  "state cannot be closed; add formation_enthalpy_kJ_mol to its data",
                                  s.name));
  return amount * (s.reference_enthalpy + s.heat_capacity * (temperature - constants::reference_temperature));
}

}  // namespace

double state_enthalpy(const ChemicalSystem& system, const Speciation& state, const ExcessEnthalpyModel* excess) {
  const double t = state.temperature;
  const double water_moles = state.water_mass / constants::water_molar_mass;
  if (std::isnan(system.water_formation_enthalpy()))
    throw ThermoError(ErrorKind::bad_data, "H2O has no formation enthalpy in the species data");
  double h = water_moles * (system.water_formation_enthalpy() + liquid_water_enthalpy_change(t));
  for (std::size_t i = 0; i < system.solutes().size(); ++i)
    h += species_enthalpy(system.solutes()[i], t, state.molality[i] * state.water_mass);
  for (std::size_t p = 0; p < system.solids().size(); ++p) h += species_enthalpy(system.solids()[p], t, state.solid_amount[p]);
  for (std::size_t g = 0; g < system.phase_gases().size(); ++g)
    h += species_enthalpy(system.phase_gases()[g], t, state.gas_amount[g]);
  if (excess) h += excess->excess_enthalpy(system, state);
  return h;
}

double solve_at_enthalpy(EquilibriumSolver& solver, double enthalpy, double pressure, std::span<const double> amounts,
                         std::span<const double> open_gas_pressures, Speciation& out, const ExcessEnthalpyModel* excess,
                         TemperatureEstimate estimate) {
  if (!std::isfinite(enthalpy)) throw ThermoError(ErrorKind::bad_input, "the enthalpy to match is not a finite number");
  const ChemicalSystem& system = solver.system();
  const auto mismatch = [&](double t) {
    solver.solve(t, pressure, amounts, open_gas_pressures, out);
    return state_enthalpy(system, out, excess) - enthalpy;
  };
  const auto solves_at = [&](double t) {
    try {
      solver.solve(t, pressure, amounts, open_gas_pressures, out);
      return true;
    } catch (const ConvergenceError&) {
      return false;
    }
  };
  // TOMS 748 (Alefeld, Potra & Shi 1995) until the bracket is 1e-9 K wide; returns the slope of H
  // across the bracket it was given.
  const auto solve_in = [&](double low, double high, double at_low, double at_high) {
    std::uintmax_t iterations = 100;
    const auto [a, b] = boost::math::tools::toms748_solve(
        mismatch, low, high, at_low, at_high, [](double x, double y) { return std::abs(y - x) < 1e-9; }, iterations);
    if (iterations >= 100)
      throw ThermoError(ErrorKind::not_converged,
                        fmt::format("the temperature for an enthalpy of {:.6g} J was not bracketed to 1e-9 K in 100 steps "
                                    "(last bracket {:.9f}–{:.9f} K)",
                                    enthalpy, a, b));
    mismatch(0.5 * (a + b));
    return (at_high - at_low) / (high - low);
  };

  // From an estimate: step away from it towards the target (H rises with T), the first step the
  // heat-capacity (Newton) step with a quarter's margin, or 1 K without a heat capacity, each next
  // step four times longer, until H − target changes sign. The whole range below takes over where
  // this meets the range's end or a state that does not solve, so that it gives the same errors.
  struct Bracket {
    double low, high, at_low, at_high;
  };
  const auto bracket_near = [&]() -> std::optional<Bracket> {
    const double t_min = system.minimum_temperature(), t_max = system.maximum_temperature();
    double near = estimate.temperature;
    if (!(near >= t_min && near <= t_max) || !solves_at(near)) return std::nullopt;
    double at_near = state_enthalpy(system, out, excess) - enthalpy;
    if (at_near == 0.0) return Bracket{near, near, 0.0, 0.0};
    const double direction = at_near > 0.0 ? -1.0 : 1.0;
    const double heat_capacity = estimate.heat_capacity;
    double step = heat_capacity > 0.0 && std::isfinite(heat_capacity) ? 1.25 * std::abs(at_near) / heat_capacity + 1e-6 : 1.0;
    for (int i = 0; i < 16; ++i, step *= 4.0) {
      const double far = std::clamp(near + direction * step, t_min, t_max);
      if (far == near || !solves_at(far)) return std::nullopt;
      const double at_far = state_enthalpy(system, out, excess) - enthalpy;
      if (at_far == 0.0 || (at_far > 0.0) != (at_near > 0.0))
        return direction > 0.0 ? Bracket{near, far, at_near, at_far} : Bracket{far, near, at_far, at_near};
      near = far;
      at_near = at_far;
    }
    return std::nullopt;
  };
  if (const std::optional<Bracket> bracket = bracket_near()) {
    // An end where H meets the target exactly was the last state solved: out holds it already.
    if (bracket->at_low != 0.0 && bracket->at_high != 0.0) return solve_in(bracket->low, bracket->high, bracket->at_low, bracket->at_high);
    return bracket->low != bracket->high ? (bracket->at_high - bracket->at_low) / (bracket->high - bracket->low)
                                         : std::numeric_limits<double>::quiet_NaN();
  }

  // The bracket is the data's range, narrowed where the state cannot exist at an end: pure water at
  // 1 atm boils at 373.12 K, below the data's 373.15 K, and a closed system then has no liquid. The
  // failing end is moved to the last temperature, found by bisection to 1e-6 K, where a state solves.
  double low = system.minimum_temperature(), high = system.maximum_temperature();
  const auto mismatch_inward = [&](double& end, double towards) {
    if (solves_at(end)) return mismatch(end);
    if (!solves_at(towards))
      throw ThermoError(ErrorKind::out_of_range,
                        fmt::format("no equilibrium state of these amounts exists at either end of {:.2f}–{:.2f} K at "
                                    "{:.6g} Pa",
                                    std::min(end, towards), std::max(end, towards), pressure));
    double good = towards, failing = end;
    while (std::abs(failing - good) > 1e-6) {
      const double middle = 0.5 * (good + failing);
      (solves_at(middle) ? good : failing) = middle;
    }
    end = good;
    return mismatch(end);
  };
  const double at_high = mismatch_inward(high, low);
  const double at_low = mismatch_inward(low, high);
  if (at_low > 0.0 || at_high < 0.0)
    throw ThermoError(ErrorKind::out_of_range,
                      fmt::format("an enthalpy of {:.6g} J puts this state {} the temperatures where it exists here, "
                                  "{:.2f}–{:.2f} K (it would need {:+.4g} J more to reach {:.2f} K){}",
                                  enthalpy, at_low > 0.0 ? "below" : "above", low, high, at_low > 0.0 ? at_low : at_high,
                                  at_low > 0.0 ? low : high,
                                  high < system.maximum_temperature() ? "; above that the liquid boils away at this pressure" : ""));
  return solve_in(low, high, at_low, at_high);
}

}  // namespace protonflow::thermo
