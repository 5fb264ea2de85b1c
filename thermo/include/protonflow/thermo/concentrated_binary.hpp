// Property models of the concentrated solute–water binaries that acid mixers handle (H2SO4, HCl,
// HNO3, NaOH with water) over their whole working range, where the ionic activity models stop.
// Composition in (mass fraction of solute, temperature), properties out; SI units; enthalpies on
// the NBS convention of docs/energy.md so that they add to the engine's other enthalpies. The
// models, their sources and ranges: docs/concentrated-acids.md.
#pragma once

#include <string>
#include <string_view>

#include "protonflow/thermo/errors.hpp"

namespace protonflow::thermo {

enum class ConcentratedBinary {
  sulfuric_acid,      // H2SO4–H2O, 0–100 wt %; solute reference H2SO4(l)
  hydrochloric_acid,  // HCl–H2O, 0–38 wt %; solute reference HCl(g)
  nitric_acid,        // HNO3–H2O, 0–70 wt %; solute reference HNO3(l)
  sodium_hydroxide,   // NaOH–H2O, 0–50 wt %; solute reference NaOH(s)
};

// Where a binary's model holds: solute mass fraction and temperature (K). The upper temperature is
// the model's, not the boiling point: a liquid above its bubble point at the pressure given is
// reported by bubble_temperature and adiabatic_outlet, not refused here.
struct BinaryRange {
  double minimum_mass_fraction;
  double maximum_mass_fraction;
  double minimum_temperature;
  double maximum_temperature;
};

// What the solute is called ("H2SO4"), its molar mass (kg/mol), the phase its pure reference is in
// ("l", "g" or "s") and its range.
struct BinaryDescription {
  std::string_view solute;
  double solute_molar_mass;
  std::string_view solute_reference_phase;
  BinaryRange range;
};

const BinaryDescription& describe(ConcentratedBinary binary);

// The binary whose solute is this formula component ("H2SO4", "HCl", "HNO3", "NaOH"); throws
// ThermoError(unknown_species) for any other.
ConcentratedBinary concentrated_binary_of(std::string_view solute);

// Composition or temperature outside a binary's range: names the quantity, its value and the range.
// kind() is ErrorKind::out_of_range.
class BinaryRangeError : public ThermoError {
 public:
  BinaryRangeError(ConcentratedBinary binary, std::string quantity, double value, double minimum, double maximum);
  ConcentratedBinary binary() const noexcept { return binary_; }
  const std::string& quantity() const noexcept { return quantity_; }
  double value() const noexcept { return value_; }
  double minimum() const noexcept { return minimum_; }
  double maximum() const noexcept { return maximum_; }

 private:
  ConcentratedBinary binary_;
  std::string quantity_;
  double value_, minimum_, maximum_;
};

// Whether an ionic (speciation) model can describe this composition, and why (or why not). The
// mixer prints `reason` instead of a pH where `meaningful` is false (98 % H2SO4 has no pH).
struct IonicModelScope {
  bool meaningful;
  double solute_molality;        // mol solute per kg water (infinite for the pure solute)
  double largest_molality;       // mol/kg up to which the ionic engine's Pitzer model is fitted
  std::string reason;
};

struct BinaryProperties {
  double temperature;                 // K
  double solute_mass_fraction;        // kg solute / kg solution
  double solute_molality;             // mol/kg water (infinite at mass fraction 1)
  double water_per_solute;            // n, mol H2O per mol solute (0 at mass fraction 1)
  double specific_enthalpy;           // J/kg solution, NBS convention (docs/energy.md)
  double enthalpy_of_mixing;          // J/kg solution, relative to pure water(l) and pure solute at the same T
  double heat_of_solution;            // J/mol solute: the same, per mole of solute (0 at mass fraction 0)
  double heat_capacity;               // J/(kg K), at constant pressure
  double density;                     // kg/m³
  double water_activity;              // mole-fraction scale, pure liquid water reference
  double water_vapour_pressure;       // Pa, partial pressure of H2O over the solution
  double solute_vapour_pressure;      // Pa, partial pressure of HCl or HNO3 (0 for H2SO4 and NaOH)
  IonicModelScope ionic_scope;
};

// All properties at temperature T (K) and solute mass fraction w. Throws BinaryRangeError outside
// describe(binary).range, ThermoError(bad_input) for a NaN.
BinaryProperties binary_properties(ConcentratedBinary binary, double temperature, double solute_mass_fraction);

// Specific enthalpy alone (J/kg, NBS convention), for energy balances; the same number as
// binary_properties(...).specific_enthalpy. Mass fraction 0 is pure liquid water; mass fraction 1
// (H2SO4 only) the pure liquid acid.
double binary_specific_enthalpy(ConcentratedBinary binary, double temperature, double solute_mass_fraction);

// Specific enthalpy of the pure solute in its reference phase (J/kg, NBS convention): H2SO4(l),
// HCl(g), HNO3(l), NaOH(s). A feed of the pure solute to a mixer enters with this.
double pure_solute_specific_enthalpy(ConcentratedBinary binary, double temperature);

// Specific enthalpy of the vapour (J/kg, ideal gas, NBS convention) of the given solute mass fraction.
double vapour_specific_enthalpy(ConcentratedBinary binary, double temperature, double solute_mass_fraction);

// Bubble (boiling) temperature, K, of the liquid at pressure p (Pa): p_H2O + p_solute = p.
// Throws BinaryRangeError (value ±infinity) when it lies above or below the model's temperature range.
double bubble_temperature(ConcentratedBinary binary, double solute_mass_fraction, double pressure);

// Mass fraction of solute in the vapour in equilibrium with the liquid at its bubble point.
double bubble_vapour_mass_fraction(ConcentratedBinary binary, double solute_mass_fraction, double pressure);

// The outlet of an adiabatic vessel at pressure p holding 1 kg of overall mass fraction w and
// specific enthalpy h: a liquid below its bubble point, or a boiling liquid with the vapour it made.
struct AdiabaticOutlet {
  double temperature;                  // K
  double liquid_solute_mass_fraction;  // of the liquid left
  double vapour_fraction;              // kg vapour per kg fed
  double vapour_solute_mass_fraction;  // of that vapour (0 without vapour)
  bool boiling;                        // true when the outlet is at its bubble point with vapour
};

// Throws BinaryRangeError when the enthalpy would need a temperature below the range, or boil the
// liquid beyond the binary's composition range, ConvergenceError if the root search fails.
AdiabaticOutlet adiabatic_outlet(ConcentratedBinary binary, double solute_mass_fraction, double specific_enthalpy,
                                 double pressure);

// Where the ionic engine may take over from this model (see IonicModelScope).
IonicModelScope ionic_model_scope(ConcentratedBinary binary, double solute_mass_fraction);

// Partial pressure (Pa) of H2SO4 vapour over H2SO4–H2O at T (K) and mass fraction w: p = a_s p°(T),
// with the acid's activity a_s (pure liquid H2SO4 reference) from Gibbs–Duhem on this model's water
// activity, and p° of pure H2SO4(l) from Ayers, Gillett & Gras (1980), measured 338–445 K and
// extrapolated along the same line. SO3 in the vapour (above about 98 wt %) is left out. For an acid-mist
// warning, not for the bubble point (H2SO4 vapour is a few Pa at most below 473 K). Throws
// BinaryRangeError outside the H2SO4 binary's range. Docs: docs/concentrated-acids.md.
double sulfuric_acid_vapour_pressure(double temperature, double solute_mass_fraction);

}  // namespace protonflow::thermo
