// Chemical formulas: parsing "CaSO4.2H2O", "B(OH)4^-", "SO4^2-" into element counts and charge.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <string_view>

namespace protonflow::thermo {

struct Formula {
  std::map<std::string, double> elements;  // element symbol -> atoms per formula unit
  int charge = 0;                          // in units of the elementary charge
};

// Parses element symbols with whole counts, nested parentheses, hydrate parts after '.' (or the
// IUPAC middle dot '·') with a leading count ("CaSO4.2H2O", "CaSO3.0.5H2O"), and a trailing charge
// after '^' ("H^+", "SO4^2-", "Fe2(OH)2^4+"). Throws ThermoError(bad_formula) naming the position;
// text in the older notation ("Ca^2+", "CaSO4.2H2O") is refused with the text to write instead.
Formula parse_formula(std::string_view text);

// The same name in the project's notation when `name` is written in the older one ("Ca^2+" ->
// "Ca^2+", "Cl^-" -> "Cl^-", "CaSO4.2H2O" -> "CaSO4.2H2O"); nullopt when there is nothing to change.
std::optional<std::string> notation_replacement(std::string_view name);

// Molar mass in kg/mol from IUPAC standard atomic weights (see elements.hpp).
double molar_mass(const Formula& formula);

// Canonical text of a formula (Hill order, charge suffix "^2+"), for messages and comparisons.
std::string to_string(const Formula& formula);

}  // namespace protonflow::thermo
