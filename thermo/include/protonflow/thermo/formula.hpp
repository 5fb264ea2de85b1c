// Chemical formulas: parsing "CaSO4:2H2O", "B(OH)4-", "SO4-2" into element counts and charge.
#pragma once

#include <map>
#include <string>
#include <string_view>

namespace protonflow::thermo {

struct Formula {
  std::map<std::string, double> elements;  // element symbol -> atoms per formula unit
  int charge = 0;                          // in units of the elementary charge
};

// Parses element symbols with counts, nested parentheses, hydrate parts after ':' with a leading
// count, and a trailing charge (+, -, +2, -3). Throws ThermoError(bad_formula) naming the position.
Formula parse_formula(std::string_view text);

// Molar mass in kg/mol from IUPAC standard atomic weights (see elements.hpp).
double molar_mass(const Formula& formula);

// Canonical text of a formula (Hill order, charge suffix), for messages and comparisons.
std::string to_string(const Formula& formula);

}  // namespace protonflow::thermo
