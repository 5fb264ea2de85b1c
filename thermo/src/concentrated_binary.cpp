// The property model shared by every concentrated binary: tables at 298.15 K (binary_*.cpp) carried
// to other temperatures by Kirchhoff's and the Gibbs–Helmholtz equations, so that enthalpy, heat
// capacity and vapour pressures come from one consistent set. Equations: docs/concentrated-acids.md.
#include "protonflow/thermo/concentrated_binary.hpp"

#include <fmt/format.h>

#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <boost/math/tools/roots.hpp>
#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>

#include "concentrated_binary_data.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/water_enthalpy.hpp"
#include "protonflow/thermo/water_properties.hpp"

namespace protonflow::thermo {

namespace {

using detail::BinaryData;

constexpr double t0 = constants::reference_temperature;
constexpr double gas_constant = constants::gas_constant;
constexpr double water_molar_mass = constants::water_molar_mass;
constexpr double infinity = std::numeric_limits<double>::infinity();
constexpr double density_reference_temperature = 293.15;  // the density tables are at 20 °C

// NBS convention (docs/energy.md): ΔfH° of H2O(l) and H2O(g), J/mol (nbs-1982, from memory),
// and Cp° of H2O(g), J/(mol K) (nbs-1982, from memory).
constexpr double water_formation_enthalpy = -285830.0;
constexpr double steam_formation_enthalpy = -241818.0;
constexpr double steam_heat_capacity = 33.58;

const BinaryData& data_of(ConcentratedBinary binary) {
  switch (binary) {
    case ConcentratedBinary::sulfuric_acid:
      return detail::sulfuric_acid_data();
    case ConcentratedBinary::hydrochloric_acid:
      return detail::hydrochloric_acid_data();
    case ConcentratedBinary::nitric_acid:
      return detail::nitric_acid_data();
    case ConcentratedBinary::sodium_hydroxide:
      return detail::sodium_hydroxide_data();
  }
  throw ThermoError(ErrorKind::bad_input, "unknown concentrated binary");
}

std::string binary_name(ConcentratedBinary binary) { return fmt::format("{}–H2O", data_of(binary).description.solute); }

void check_mass_fraction(ConcentratedBinary binary, double mass_fraction) {
  const BinaryRange& range = data_of(binary).description.range;
  if (std::isnan(mass_fraction))
    throw ThermoError(ErrorKind::bad_input,
                      fmt::format("{}: the solute mass fraction is not a number", binary_name(binary)));
  if (mass_fraction < range.minimum_mass_fraction || mass_fraction > range.maximum_mass_fraction)
    throw BinaryRangeError(binary, "solute mass fraction", mass_fraction, range.minimum_mass_fraction,
                           range.maximum_mass_fraction);
}

void check_temperature(ConcentratedBinary binary, double temperature) {
  const BinaryRange& range = data_of(binary).description.range;
  if (std::isnan(temperature))
    throw ThermoError(ErrorKind::bad_input, fmt::format("{}: the temperature is not a number", binary_name(binary)));
  if (temperature < range.minimum_temperature || temperature > range.maximum_temperature)
    throw BinaryRangeError(binary, "temperature (K)", temperature, range.minimum_temperature,
                           range.maximum_temperature);
}

double solute_molar_mass(const BinaryData& d) { return d.description.solute_molar_mass; }

double mole_fraction(const BinaryData& d, double mass_fraction) {
  const double solute = mass_fraction / solute_molar_mass(d), water = (1.0 - mass_fraction) / water_molar_mass;
  return solute / (solute + water);
}

double mean_molar_mass(const BinaryData& d, double x) {
  return (1.0 - x) * water_molar_mass + x * solute_molar_mass(d);
}

// Δcp: the solution's specific heat capacity less that of its unmixed components at 298.15 K, J/(kg K),
// and its slope against mass fraction. The water in it is the table's own pure-water value, so that
// Δcp vanishes at w = 0 whatever water's Cp the table's source used (IAPWS-95 4181.3 J/(kg K) beside
// the engine's 4183.9): an excess Cp left at infinite dilution would give water a partial heat
// capacity of its own and a water activity above 1 in dilute solutions away from 25 °C.
double mixing_heat_capacity(const BinaryData& d, double w) {
  return d.heat_capacity(w) - (1.0 - w) * d.heat_capacity(0.0) - w * d.solute_heat_capacity / solute_molar_mass(d);
}
double mixing_heat_capacity_slope(const BinaryData& d, double w) {
  return d.heat_capacity.slope(w) + d.heat_capacity(0.0) - d.solute_heat_capacity / solute_molar_mass(d);
}

// β(w) = ∂Δcp/∂T per kg of solution, and its slope against mass fraction (zero without a table).
double heat_capacity_temperature_slope(const BinaryData& d, double w) {
  return d.heat_capacity_temperature_slope ? (*d.heat_capacity_temperature_slope)(w) : 0.0;
}
double heat_capacity_temperature_slope_slope(const BinaryData& d, double w) {
  return d.heat_capacity_temperature_slope ? d.heat_capacity_temperature_slope->slope(w) : 0.0;
}

// Enthalpy of mixing at T per kg of solution (Kirchhoff with Δcp(T) = Δcp + β (T − T0)).
double mixing_enthalpy_per_kg(const BinaryData& d, double temperature, double w) {
  const double x = mole_fraction(d, w), dt = temperature - t0;
  return x * d.heat_of_solution(x) / mean_molar_mass(d, x) + mixing_heat_capacity(d, w) * dt +
         heat_capacity_temperature_slope(d, w) * dt * dt / 2.0;
}

// Partial molar quantities of water and solute from a per-mole-of-solution quantity f(x) and f'(x).
struct Partials {
  double water, solute;
};
Partials partials(double f, double slope, double x) { return {f - x * slope, f + (1.0 - x) * slope}; }

// Relative partial molar enthalpies (against the pure components) at 298.15 K, J/mol, from the heat
// of solution φ(x) per mole of solute: with Δh = x φ, L̄_w = −x² φ′ and L̄_s = φ + x (1 − x) φ′.
Partials relative_enthalpies(const BinaryData& d, double x) {
  return partials(x * d.heat_of_solution(x), d.heat_of_solution(x) + x * d.heat_of_solution.slope(x), x);
}

// Partial molar quantities, per mol, of a property given per kg of solution as f(w) with slope f′(w).
template <typename PerKg, typename PerKgSlope>
Partials partials_of_per_kg(const BinaryData& d, double x, PerKg per_kg, PerKgSlope per_kg_slope) {
  const double ms = solute_molar_mass(d), mean = mean_molar_mass(d, x);
  const double w = x * ms / mean, dw_dx = ms * water_molar_mass / (mean * mean);
  const double per_mole = per_kg(d, w) * mean;
  const double slope = per_kg_slope(d, w) * dw_dx * mean + per_kg(d, w) * (ms - water_molar_mass);
  return partials(per_mole, slope, x);
}

// Relative partial molar heat capacities at 298.15 K, J/(mol K), from Δcp per mole of solution.
Partials relative_heat_capacities(const BinaryData& d, double x) {
  return partials_of_per_kg(d, x, mixing_heat_capacity, mixing_heat_capacity_slope);
}

// Their temperature slopes, J/(mol K²), from β per mole of solution.
Partials relative_heat_capacity_slopes(const BinaryData& d, double x) {
  return partials_of_per_kg(d, x, heat_capacity_temperature_slope, heat_capacity_temperature_slope_slope);
}

// ∫_{T0}^{T} H(T') / (R T'²) dT' for H(T') = h + c (T' − T0) + k (T' − T0)²/2: the Gibbs–Helmholtz
// integral. With H = A + B T' + (k/2) T'², A = h − c T0 + k T0²/2, B = c − k T0.
double gibbs_helmholtz(double h, double c, double k, double temperature) {
  const double a = h - c * t0 + k * t0 * t0 / 2.0, b = c - k * t0;
  return (a * (1.0 / t0 - 1.0 / temperature) + b * std::log(temperature / t0) + k * (temperature - t0) / 2.0) /
         gas_constant;
}

// ∂ ln a_w / ∂T = −L̄_w / (R T²), L̄_w(T) = L̄_w(T0) + J̄_w (T − T0) + K̄_w (T − T0)²/2.
double ln_water_activity(const BinaryData& d, double temperature, double x) {
  if (x == 0.0) return 0.0;
  return d.ln_water_activity(x) - gibbs_helmholtz(relative_enthalpies(d, x).water,
                                                  relative_heat_capacities(d, x).water,
                                                  relative_heat_capacity_slopes(d, x).water, temperature);
}

// ∂ ln p / ∂T = (H_gas − H̄_solute) / (R T²), both against the pure solute's reference phase.
double solute_vapour_pressure(const BinaryData& d, double temperature, double x) {
  if (!d.ln_solute_pressure || x == 0.0) return 0.0;
  const double vaporisation =
      d.vapour_formation_enthalpy - d.solute_formation_enthalpy - relative_enthalpies(d, x).solute;
  const double change = d.vapour_heat_capacity - d.solute_heat_capacity - relative_heat_capacities(d, x).solute;
  const double change_slope = -relative_heat_capacity_slopes(d, x).solute;
  return std::exp(d.ln_solute_pressure(x) + gibbs_helmholtz(vaporisation, change, change_slope, temperature));
}

double water_vapour_pressure(const BinaryData& d, double temperature, double x) {
  if (x == 1.0) return 0.0;
  return std::exp(ln_water_activity(d, temperature, x)) * water_saturation_pressure(temperature);
}

double specific_enthalpy(const BinaryData& d, double temperature, double w) {
  const double water = (water_formation_enthalpy + liquid_water_enthalpy_change(temperature)) / water_molar_mass;
  const double solute =
      (d.solute_formation_enthalpy + d.solute_heat_capacity * (temperature - t0)) / solute_molar_mass(d);
  return (1.0 - w) * water + w * solute + mixing_enthalpy_per_kg(d, temperature, w);
}

// The table's cp(w) with its water carried to T as the engine's liquid water (its pure-water end is
// then exactly the engine's water at every T, and ∂h/∂T is this, Kirchhoff).
double heat_capacity(const BinaryData& d, double temperature, double w) {
  return d.heat_capacity(w) + heat_capacity_temperature_slope(d, w) * (temperature - t0) +
         (1.0 - w) * (liquid_water_heat_capacity(temperature) / water_molar_mass - d.heat_capacity(0.0));
}

// Excess volume taken independent of T: each component expands as it does pure.
double density(const BinaryData& d, double temperature, double w) {
  const double water_expansion = 1.0 / water_density(temperature) - 1.0 / water_density(density_reference_temperature);
  return 1.0 / (1.0 / d.density(w) + (1.0 - w) * water_expansion + w * d.solute_expansion(temperature));
}

double solute_molality(const BinaryData& d, double w) {
  return w == 1.0 ? infinity : w / ((1.0 - w) * solute_molar_mass(d));
}

// TOMS 748 on a bracketed root; a search that runs out of iterations says so with its residual.
template <typename F>
double bracketed_root(F f, double low, double high, double f_low, double f_high, const std::string& what) {
  std::uintmax_t iterations = 200;
  const auto [a, b] = boost::math::tools::toms748_solve(f, low, high, f_low, f_high,
                                                        boost::math::tools::eps_tolerance<double>(48), iterations);
  const double root = 0.5 * (a + b);
  if (iterations >= 200)
    throw ConvergenceError(fmt::format("{}: the root search stopped after {} iterations", what, iterations),
                           {{what, f(root)}}, static_cast<long>(iterations));
  return root;
}

double total_pressure(const BinaryData& d, double temperature, double x) {
  return water_vapour_pressure(d, temperature, x) + solute_vapour_pressure(d, temperature, x);
}

}  // namespace

BinaryRangeError::BinaryRangeError(ConcentratedBinary binary, std::string quantity, double value, double minimum,
                                   double maximum)
    : ThermoError(ErrorKind::out_of_range,
                  std::isinf(value)
                      ? fmt::format("{}: the {} lies {} the model's range {:g}–{:g} (docs/concentrated-acids.md)",
                                    binary_name(binary), quantity, value > 0 ? "above" : "below", minimum, maximum)
                      : fmt::format("{}: {} {:g} is outside the model's range {:g}–{:g} (docs/concentrated-acids.md)",
                                    binary_name(binary), quantity, value, minimum, maximum)),
      binary_(binary),
      quantity_(std::move(quantity)),
      value_(value),
      minimum_(minimum),
      maximum_(maximum) {}

const BinaryDescription& describe(ConcentratedBinary binary) { return data_of(binary).description; }

ConcentratedBinary concentrated_binary_of(std::string_view solute) {
  for (const ConcentratedBinary binary : {ConcentratedBinary::sulfuric_acid, ConcentratedBinary::hydrochloric_acid,
                                          ConcentratedBinary::nitric_acid, ConcentratedBinary::sodium_hydroxide})
    if (describe(binary).solute == solute) return binary;
  throw ThermoError(ErrorKind::unknown_species,
                    fmt::format("no concentrated-binary model for '{}' (there are models for H2SO4, HCl, HNO3 and NaOH "
                                "with water)",
                                solute));
}

IonicModelScope ionic_model_scope(ConcentratedBinary binary, double solute_mass_fraction) {
  check_mass_fraction(binary, solute_mass_fraction);
  const BinaryData& d = data_of(binary);
  const double molality = solute_molality(d, solute_mass_fraction);
  const bool meaningful = molality <= d.largest_ionic_molality;
  return {meaningful, molality, d.largest_ionic_molality,
          fmt::format("{} at {:.4g} mol/kg: {}", binary_name(binary), molality,
                      meaningful ? d.ionic_within : d.ionic_beyond)};
}

namespace {

// ln a_s of H2SO4 (pure liquid reference) at mole fraction x from Gibbs–Duhem, integrated from the
// pure acid (a_s = 1):
//   ln a_s(x) = ∫_x^1 F(y) dy,   F(y) = ((1 − y)/y) ∂ln a_w/∂y
// F stays finite as y → 1: there the table's water is dilute in the acid (a_w ∝ 1 − x), so F → −1
// (the acid obeys Raoult's law at its own end).
double ln_sulfuric_acid_activity(const BinaryData& d, double temperature, double x) {
  if (x == 1.0) return 0.0;
  const auto integrand = [&](double y) {
    if (y >= 1.0) return -1.0;
    const double step = std::min(1e-6, 0.5 * (1.0 - y));
    const double slope =
        (ln_water_activity(d, temperature, y + step) - ln_water_activity(d, temperature, y - step)) / (2.0 * step);
    return (1.0 - y) / y * slope;
  };
  // Adaptive Gauss–Kronrod: F has kinks where the tables' second derivatives jump.
  double error = 0.0;
  return boost::math::quadrature::gauss_kronrod<double, 31>::integrate(integrand, x, 1.0, 10, 1e-7, &error);
}

// Vapour pressure of pure liquid H2SO4, Pa: ayers-gillett-gras-1980, ln(p/atm) = −10156/T + 16.259,
// measured 338–445 K and carried by the same line to the model's 273–473 K (below 338 K an
// extrapolation, uncertain by a factor of a few: for a warning, not for a design figure).
double pure_sulfuric_acid_vapour_pressure(double temperature) {
  return std::exp(-10156.0 / temperature + 16.259) * detail::atmosphere;
}

}  // namespace

double sulfuric_acid_vapour_pressure(double temperature, double solute_mass_fraction) {
  const ConcentratedBinary binary = ConcentratedBinary::sulfuric_acid;
  check_mass_fraction(binary, solute_mass_fraction);
  check_temperature(binary, temperature);
  const BinaryData& d = data_of(binary);
  if (solute_mass_fraction == 0.0) return 0.0;
  const double x = mole_fraction(d, solute_mass_fraction);
  return std::exp(ln_sulfuric_acid_activity(d, temperature, x)) * pure_sulfuric_acid_vapour_pressure(temperature);
}

double binary_specific_enthalpy(ConcentratedBinary binary, double temperature, double solute_mass_fraction) {
  check_mass_fraction(binary, solute_mass_fraction);
  check_temperature(binary, temperature);
  return specific_enthalpy(data_of(binary), temperature, solute_mass_fraction);
}

double pure_solute_specific_enthalpy(ConcentratedBinary binary, double temperature) {
  check_temperature(binary, temperature);
  const BinaryData& d = data_of(binary);
  return (d.solute_formation_enthalpy + d.solute_heat_capacity * (temperature - t0)) / solute_molar_mass(d);
}

double vapour_specific_enthalpy(ConcentratedBinary binary, double temperature, double solute_mass_fraction) {
  check_temperature(binary, temperature);
  const BinaryData& d = data_of(binary);
  if (std::isnan(solute_mass_fraction) || solute_mass_fraction < 0.0 || solute_mass_fraction > 1.0)
    throw ThermoError(ErrorKind::bad_input,
                      fmt::format("{}: a vapour mass fraction must lie in 0–1", binary_name(binary)));
  const double steam = (steam_formation_enthalpy + steam_heat_capacity * (temperature - t0)) / water_molar_mass;
  if (solute_mass_fraction == 0.0) return steam;
  if (std::isnan(d.vapour_formation_enthalpy))
    throw ThermoError(ErrorKind::bad_input,
                      fmt::format("{}: the model has no vapour of {}", binary_name(binary), d.description.solute));
  const double solute =
      (d.vapour_formation_enthalpy + d.vapour_heat_capacity * (temperature - t0)) / solute_molar_mass(d);
  return (1.0 - solute_mass_fraction) * steam + solute_mass_fraction * solute;
}

BinaryProperties binary_properties(ConcentratedBinary binary, double temperature, double solute_mass_fraction) {
  check_mass_fraction(binary, solute_mass_fraction);
  check_temperature(binary, temperature);
  const BinaryData& d = data_of(binary);
  const double w = solute_mass_fraction, x = mole_fraction(d, w);
  BinaryProperties p{};
  p.temperature = temperature;
  p.solute_mass_fraction = w;
  p.solute_molality = solute_molality(d, w);
  p.water_per_solute = x == 0.0 ? infinity : (1.0 - x) / x;
  p.specific_enthalpy = specific_enthalpy(d, temperature, w);
  p.enthalpy_of_mixing = mixing_enthalpy_per_kg(d, temperature, w);
  p.heat_of_solution = w == 0.0 ? 0.0 : p.enthalpy_of_mixing * solute_molar_mass(d) / w;
  p.heat_capacity = heat_capacity(d, temperature, w);
  p.density = density(d, temperature, w);
  p.water_activity = x == 1.0 ? 0.0 : std::exp(ln_water_activity(d, temperature, x));
  p.water_vapour_pressure = water_vapour_pressure(d, temperature, x);
  p.solute_vapour_pressure = solute_vapour_pressure(d, temperature, x);
  p.ionic_scope = ionic_model_scope(binary, w);
  return p;
}

double bubble_temperature(ConcentratedBinary binary, double solute_mass_fraction, double pressure) {
  check_mass_fraction(binary, solute_mass_fraction);
  if (!(pressure > 0.0) || !std::isfinite(pressure))
    throw ThermoError(ErrorKind::bad_input, fmt::format("{}: the pressure must be positive", binary_name(binary)));
  const BinaryData& d = data_of(binary);
  const BinaryRange& range = d.description.range;
  const double x = mole_fraction(d, solute_mass_fraction);
  const auto excess = [&](double t) { return total_pressure(d, t, x) - pressure; };
  const double low = range.minimum_temperature, high = range.maximum_temperature;
  const double f_low = excess(low), f_high = excess(high);
  const std::string quantity = fmt::format("bubble temperature at {:g} Pa", pressure);
  if (f_low > 0.0) throw BinaryRangeError(binary, quantity, -infinity, low, high);
  if (f_high < 0.0) throw BinaryRangeError(binary, quantity, infinity, low, high);
  return bracketed_root(excess, low, high, f_low, f_high, binary_name(binary) + " " + quantity);
}

double bubble_vapour_mass_fraction(ConcentratedBinary binary, double solute_mass_fraction, double pressure) {
  const double t = bubble_temperature(binary, solute_mass_fraction, pressure);
  const BinaryData& d = data_of(binary);
  const double x = mole_fraction(d, solute_mass_fraction);
  const double solute = solute_vapour_pressure(d, t, x) * solute_molar_mass(d);
  const double water = water_vapour_pressure(d, t, x) * water_molar_mass;
  return solute / (solute + water);
}

AdiabaticOutlet adiabatic_outlet(ConcentratedBinary binary, double solute_mass_fraction, double enthalpy,
                                 double pressure) {
  check_mass_fraction(binary, solute_mass_fraction);
  if (!std::isfinite(enthalpy))
    throw ThermoError(ErrorKind::bad_input,
                      fmt::format("{}: the enthalpy is not a finite number", binary_name(binary)));
  const BinaryData& d = data_of(binary);
  const BinaryRange& range = d.description.range;
  const double w = solute_mass_fraction;
  const auto liquid_mismatch = [&](double t) { return specific_enthalpy(d, t, w) - enthalpy; };
  const double low = range.minimum_temperature;
  const double f_low = liquid_mismatch(low);
  if (f_low > 0.0)
    throw BinaryRangeError(binary, "temperature (K) of this enthalpy", -infinity, low, range.maximum_temperature);

  // Below the bubble point (or the top of the range, where the bubble point lies above it): a liquid.
  double top = range.maximum_temperature;
  bool can_boil = true;
  try {
    top = bubble_temperature(binary, w, pressure);
  } catch (const BinaryRangeError& e) {
    if (!(e.value() > 0.0)) throw;
    can_boil = false;
  }
  const double f_top = liquid_mismatch(top);
  if (f_top >= 0.0) {
    const double t =
        f_top == 0.0 ? top : bracketed_root(liquid_mismatch, low, top, f_low, f_top, "adiabatic temperature");
    return {t, w, 0.0, 0.0, false};
  }
  if (!can_boil)
    throw BinaryRangeError(binary, "temperature (K) of this enthalpy", infinity, low, range.maximum_temperature);

  // Boiling: the liquid left (mass fraction wl) is at its bubble point with the vapour it made;
  // mass balance V = (wl − w)/(wl − y), energy (1 − V) h_l + V h_v = h.
  const double y0 = bubble_vapour_mass_fraction(binary, w, pressure);
  const auto boiling_state = [&](double wl, double& vapour, double& y, double& t) {
    t = bubble_temperature(binary, wl, pressure);
    y = bubble_vapour_mass_fraction(binary, wl, pressure);
    vapour = wl == w ? 0.0 : (wl - w) / (wl - y);
  };
  const auto boiling_mismatch = [&](double wl) {
    double vapour = 0.0, y = 0.0, t = 0.0;
    boiling_state(wl, vapour, y, t);
    return (1.0 - vapour) * specific_enthalpy(d, t, wl) + vapour * vapour_specific_enthalpy(binary, t, y) - enthalpy;
  };
  if (std::abs(y0 - w) < 1e-9) {  // an azeotrope boils without changing composition
    const double vapour = (enthalpy - specific_enthalpy(d, top, w)) /
                          (vapour_specific_enthalpy(binary, top, y0) - specific_enthalpy(d, top, w));
    if (vapour >= 1.0) throw BinaryRangeError(binary, "vapour fraction (kg/kg) on boiling", vapour, 0.0, 1.0);
    return {top, w, vapour, y0, true};
  }
  // The liquid moves away from its vapour's composition; step until the energy balance changes sign.
  const double end = y0 < w ? range.maximum_mass_fraction : range.minimum_mass_fraction;
  constexpr int steps = 64;
  bool boils_away = false;
  double previous = w, f_previous = boiling_mismatch(w);
  for (int k = 1; k <= steps; ++k) {
    const double wl = w + (end - w) * k / steps;
    double vapour = 0.0, y = 0.0, t = 0.0;
    try {
      boiling_state(wl, vapour, y, t);
    } catch (const BinaryRangeError&) {
      break;
    }
    if (!(vapour >= 0.0 && vapour < 1.0)) {
      boils_away = true;
      break;
    }
    const double f =
        (1.0 - vapour) * specific_enthalpy(d, t, wl) + vapour * vapour_specific_enthalpy(binary, t, y) - enthalpy;
    if (f >= 0.0) {
      const double root = bracketed_root(boiling_mismatch, std::min(previous, wl), std::max(previous, wl),
                                         previous < wl ? f_previous : f, previous < wl ? f : f_previous,
                                         "composition of the boiling liquid");
      boiling_state(root, vapour, y, t);
      return {t, root, vapour, y, true};
    }
    previous = wl;
    f_previous = f;
  }
  if (boils_away)  // one equilibrium stage cannot take up this much heat: the whole feed would boil
    throw BinaryRangeError(binary, "vapour made per kg fed (the heat would boil the whole feed)", infinity, 0.0, 1.0);
  throw BinaryRangeError(binary, "liquid mass fraction left on boiling", y0 < w ? infinity : -infinity,
                         range.minimum_mass_fraction, range.maximum_mass_fraction);
}

}  // namespace protonflow::thermo
