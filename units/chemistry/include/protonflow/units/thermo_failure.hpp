// A thermo error as the status the unit ABI asks for (docs/units.md, "Errors").
#pragma once

#include <protonflow/unit_abi.h>

#include <protonflow/thermo/errors.hpp>

#include <string>
#include <string_view>

namespace protonflow::units {

// Throws protonflow::unit::UnitError: "unit 'TYPE': WHAT: the engine's message". A non-convergence
// becomes PFU_NOT_CONVERGED with the three largest scaled residuals and the iterations; an
// out-of-range error becomes out_of_range_status (whose fault it is depends on the caller: a
// feed's temperature is the inlet's, a set temperature or duty the parameter's); bad input or data
// PFU_BAD_INLET; anything else PFU_INTERNAL_ERROR.
[[noreturn]] void throw_unit_error(const thermo::ThermoError& error, std::string_view unit_type, const std::string& what,
                                   pfu_status out_of_range_status);

}  // namespace protonflow::units
