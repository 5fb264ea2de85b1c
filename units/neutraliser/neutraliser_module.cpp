// The module protonflow-neutraliser: one unit class, the neutraliser.
#include <protonflow/unit_module.hpp>

#include "neutraliser.hpp"

PROTONFLOW_EXPORT_UNITS("protonflow-neutraliser", "0.1.0", protonflow::units::Neutraliser)
