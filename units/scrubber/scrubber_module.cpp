// protonflow-scrubber: the scrubber unit class.
#include <protonflow/unit_module.hpp>

#include "scrubber.hpp"

PROTONFLOW_EXPORT_UNITS("protonflow-scrubber", "1.0.0", protonflow::scrubber::Scrubber)
