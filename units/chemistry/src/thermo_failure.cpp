#include <protonflow/units/thermo_failure.hpp>

#include <protonflow/unit_module.hpp>

#include <algorithm>
#include <cmath>
#include <vector>

#include <protonflow/units/message_text.hpp>

namespace protonflow::units {

void throw_unit_error(const thermo::ThermoError& error, std::string_view unit_type, const std::string& what,
                      pfu_status out_of_range_status) {
  std::string text = "unit '" + std::string(unit_type) + "': " + what + ": " + error.what();
  switch (error.kind()) {
    case thermo::ErrorKind::not_converged: {
      if (const auto* convergence = dynamic_cast<const thermo::ConvergenceError*>(&error)) {
        std::vector<thermo::EquationResidual> worst = convergence->residuals();
        std::ranges::sort(worst, [](const auto& x, const auto& y) { return std::abs(x.scaled_residual) > std::abs(y.scaled_residual); });
        if (worst.size() > 3) worst.resize(3);
        std::string list;
        for (const auto& r : worst) list += (list.empty() ? "" : ", ") + r.equation + " " + number_text(r.scaled_residual, 3);
        if (!list.empty()) text += "; largest scaled residuals: " + list;
        text += "; " + std::to_string(convergence->iterations()) + " iterations";
      }
      throw unit::UnitError(PFU_NOT_CONVERGED, text);
    }
    case thermo::ErrorKind::out_of_range: throw unit::UnitError(out_of_range_status, text);
    case thermo::ErrorKind::bad_input:
    case thermo::ErrorKind::bad_data: throw unit::UnitError(PFU_BAD_INLET, text);
    default: throw unit::UnitError(PFU_INTERNAL_ERROR, text);
  }
}

}  // namespace protonflow::units
