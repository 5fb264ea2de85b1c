// The module protonflow-heater: the units whose energy balance runs through equilibrium
// enthalpies, sharing one implementation (equilibrium_stream.hpp and its neighbours).
#include <protonflow/unit_module.hpp>

#include "heater.hpp"
#include "mixer.hpp"

PROTONFLOW_EXPORT_UNITS("protonflow-heater", "0.1.0", protonflow::units::Heater, protonflow::units::Mixer)
