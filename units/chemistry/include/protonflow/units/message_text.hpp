// Numbers as the chemistry units' messages and warnings write them.
#pragma once

#include <array>
#include <charconv>
#include <string>

namespace protonflow::units {

// Six significant digits unless told: enough for an engineer, short enough to read.
inline std::string number_text(double value, int digits = 6) {
  std::array<char, 48> text{};
  const auto written = std::to_chars(text.data(), text.data() + text.size(), value, std::chars_format::general, digits);
  return std::string(text.data(), written.ptr);
}

// 0 °C = 273.15 K by the definition of the Celsius scale (SI Brochure).
inline std::string celsius_text(double kelvin) { return number_text(kelvin - 273.15, 4) + " °C"; }

}  // namespace protonflow::units
