#include "flowsheet_quantity.hpp"

#include <array>
#include <optional>

#include <fmt/format.h>

#include "protonflow/thermo/constants.hpp"

namespace protonflow::host {
namespace {

std::string_view trim(std::string_view text) {
  while (!text.empty() && (text.front() == ' ' || text.front() == '\t')) text.remove_prefix(1);
  while (!text.empty() && (text.back() == ' ' || text.back() == '\t')) text.remove_suffix(1);
  return text;
}

bool ends_with(std::string_view text, std::string_view suffix) {
  return text.size() > suffix.size() && text.substr(text.size() - suffix.size()) == suffix;
}

// A normal-volume unit: the volume one of it stands for, and what follows it ("/h").
struct NormalVolume {
  double cubic_metres;
  std::string_view rest;
};

std::optional<NormalVolume> normal_volume(std::string_view unit) {
  // Normal cubic metres and normal litres; the spellings engineers write.
  constexpr std::array<std::pair<std::string_view, double>, 5> prefixes{{
      {"Nm3", 1.0}, {"Nm^3", 1.0}, {"Nm\u00b3", 1.0}, {"NL", 1e-3}, {"Nl", 1e-3}}};
  for (const auto& [prefix, volume] : prefixes) {
    if (unit.substr(0, prefix.size()) != prefix) continue;
    const std::string_view rest = trim(unit.substr(prefix.size()));
    // "Nm3" alone or followed by a division: "Nm3/h", "Nm3 / h". Anything else ("Nm3h") is not ours.
    if (rest.empty() || rest.front() == '/') return NormalVolume{volume, rest};
  }
  return std::nullopt;
}

// The pressure unit inside a gauge ("barg", "kPa(g)") or absolute ("bara", "psia") spelling.
struct PressureSuffix {
  std::string_view base;
  bool gauge;
};

std::optional<PressureSuffix> pressure_suffix(std::string_view unit) {
  for (const auto& [suffix, gauge] : std::array<std::pair<std::string_view, bool>, 4>{
           {{"(g)", true}, {"(a)", false}, {"g", true}, {"a", false}}}) {
    if (ends_with(unit, suffix)) return PressureSuffix{trim(unit.substr(0, unit.size() - suffix.size())), gauge};
  }
  return std::nullopt;
}

bool udunits_convertible(const UnitConverter& units, std::string_view unit, std::string_view si_unit) {
  try {
    static_cast<void>(units.convert(1.0, unit, si_unit));
    return true;
  } catch (const QuantityError&) {
    return false;
  }
}

}  // namespace

double normal_molar_volume() noexcept {
  return thermo::constants::gas_constant * din1343_temperature / din1343_pressure;
}

QuantityKind QuantityReader::kind_of(std::string_view unit) {
  unit = trim(unit);
  if (normal_volume(unit)) return QuantityKind::normal_volume;
  if (const auto suffix = pressure_suffix(unit); suffix && suffix->gauge) return QuantityKind::gauge;
  return QuantityKind::plain;
}

double QuantityReader::to_si(double value, std::string_view unit, std::string_view si_unit) const {
  unit = trim(unit);
  if (const auto normal = normal_volume(unit)) {
    // An ideal gas: n = p_n V / (R T_n) = V / V_m,n.
    const std::string amount_unit = fmt::format("mol{}", normal->rest);
    if (!udunits_convertible(*units_, amount_unit, si_unit)) {
      throw QuantityError(fmt::format("'{}' is a normal volume of gas (DIN 1343, read as {} of ideal gas); it cannot "
                                      "be converted to {}",
                                      unit, amount_unit, si_unit));
    }
    return units_->convert(value * normal->cubic_metres / normal_molar_volume(), amount_unit, si_unit);
  }
  // A unit UDUNITS-2 knows as it stands is never re-read: "Pa" ends in "a" but is no absolute suffix.
  if (si_unit == "Pa" && !udunits_convertible(*units_, unit, si_unit)) {
    if (const auto suffix = pressure_suffix(unit); suffix && udunits_convertible(*units_, suffix->base, si_unit)) {
      const double pressure = units_->convert(value, suffix->base, si_unit);
      return suffix->gauge ? pressure + gauge_reference_ : pressure;
    }
  }
  if (si_unit != "Pa") {
    if (const auto suffix = pressure_suffix(unit);
        suffix && suffix->gauge && !udunits_convertible(*units_, unit, si_unit) &&
        udunits_convertible(*units_, suffix->base, "Pa")) {
      throw QuantityError(fmt::format("'{}' is a gauge pressure; it cannot be converted to {}", unit, si_unit));
    }
  }
  return units_->convert(value, unit, si_unit);
}

double QuantityReader::difference_to_si(double value, std::string_view unit, std::string_view si_unit) const {
  return to_si(value, unit, si_unit) - to_si(0.0, unit, si_unit);
}

bool QuantityReader::convertible(std::string_view unit, std::string_view si_unit) const {
  try {
    static_cast<void>(to_si(1.0, unit, si_unit));
    return true;
  } catch (const QuantityError&) {
    return false;
  }
}

}  // namespace protonflow::host
