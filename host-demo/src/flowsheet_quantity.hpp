// Quantities of a flowsheet: what UDUNITS-2 converts (quantity.hpp), plus the two kinds plant
// engineers write every day that UDUNITS-2 does not know: gauge pressures ("2 barg", "30 psig")
// and gas flows in normal volume ("1200 Nm3/h").
#pragma once

#include <string>
#include <string_view>

#include "quantity.hpp"

namespace protonflow::host {

// Normal conditions of DIN 1343: T_n = 273.15 K (0 °C), p_n = 101.325 kPa. "Nm3" is a cubic metre
// of gas at these conditions (German and much European practice; not the "standard" conditions of
// other codes, which differ: 15 °C, 20 °C or 60 °F).
inline constexpr double din1343_temperature = 273.15;   // K, DIN 1343
inline constexpr double din1343_pressure = 101325.0;    // Pa, DIN 1343

// The standard atmosphere, 101325 Pa exactly (10th CGPM, 1954): the default zero of gauge pressures.
inline constexpr double standard_atmosphere_pressure = 101325.0;  // Pa

// Molar volume of an ideal gas at DIN 1343 conditions, m³/mol: R T_n / p_n with R of CODATA 2018
// (8.314462618 J/(mol K), exact), about 0.0224139695 m³/mol. Real gases differ by well under 1 %
// at these conditions (air: 0.022400 m³/mol, about 0.06 % less; from memory).
double normal_molar_volume() noexcept;

// How a unit text was read.
enum class QuantityKind {
  plain,          // UDUNITS-2 alone
  gauge,          // a gauge pressure: "barg", "psig", "kPa(g)"
  normal_volume,  // a normal volume or its flow: "Nm3", "Nm3/h", "NL/min"
};

// Converts quantities to SI, with gauge pressures measured from a reference (the atmosphere) and
// normal volumes turned into amounts of ideal gas.
class QuantityReader {
 public:
  // gauge_reference: the pressure a gauge reads zero at, Pa (default: 1 standard atmosphere; a
  // site at altitude, where the air pressure is lower, sets its own).
  explicit QuantityReader(const UnitConverter& units, double gauge_reference = standard_atmosphere_pressure)
      : units_(&units), gauge_reference_(gauge_reference) {}

  // value in unit, expressed in si_unit. Gauge units are accepted only where si_unit is "Pa";
  // a normal volume ("Nm3") counts as an amount (mol) and "Nm3/h" as a molar flow. Throws
  // QuantityError for a unit that is unknown or of another dimension.
  double to_si(double value, std::string_view unit, std::string_view si_unit) const;
  double to_si(const QuantityText& quantity, std::string_view si_unit) const {
    return to_si(quantity.value, quantity.unit, si_unit);
  }

  // A difference (a tolerance, a temperature rise): the same conversion without any offset, so
  // that "0.5 degC" is 0.5 K rather than 273.65 K and "1 barg" is 1 bar.
  double difference_to_si(double value, std::string_view unit, std::string_view si_unit) const;

  // Whether unit, as text, converts to si_unit (with the same extensions as to_si).
  bool convertible(std::string_view unit, std::string_view si_unit) const;

  // How to_si reads that unit text.
  static QuantityKind kind_of(std::string_view unit);

  double gauge_reference() const noexcept { return gauge_reference_; }
  const UnitConverter& units() const noexcept { return *units_; }

 private:
  const UnitConverter* units_;
  double gauge_reference_;
};

}  // namespace protonflow::host
