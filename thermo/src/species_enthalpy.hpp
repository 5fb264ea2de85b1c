// A species' standard enthalpy at 298.15 K and heat capacity, from its own data or, where that is
// missing, from its formation reaction (the enthalpy the log K function implies).
#pragma once

#include "protonflow/thermo/database.hpp"

namespace protonflow::thermo::detail {

struct StandardEnthalpy {
  double at_reference;   // J/mol at 298.15 K; NaN where neither the species nor its reaction gives it
  double heat_capacity;  // J/(mol K)
};

StandardEnthalpy standard_enthalpy(const Database& database, const Species& species);

}  // namespace protonflow::thermo::detail
