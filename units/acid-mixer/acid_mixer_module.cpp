// The module protonflow-acid-mixer: one unit class, acid_mixer.
#include <protonflow/unit_module.hpp>

#include "acid_mixer.hpp"

PROTONFLOW_EXPORT_UNITS("protonflow-acid-mixer", "0.1.0", protonflow::units::AcidMixer)
