// The module protonflow-heater: the heater, whose energy balance runs through equilibrium
// enthalpies (units/chemistry/).
#include <protonflow/unit_module.hpp>

#include "heater.hpp"

PROTONFLOW_EXPORT_UNITS("protonflow-heater", "0.1.0", protonflow::units::Heater)
