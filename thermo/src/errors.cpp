#include "protonflow/thermo/errors.hpp"

#include <fmt/format.h>

namespace protonflow::thermo {

DataError::DataError(std::string file, int line, int column, const std::string& what)
    : ThermoError(ErrorKind::bad_data, fmt::format("{}:{}:{}: {}", file, line, column, what)),
      file_(std::move(file)),
      line_(line),
      column_(column) {}

ConvergenceError::ConvergenceError(const std::string& message, std::vector<EquationResidual> residuals,
                                   long iterations)
    : ThermoError(ErrorKind::not_converged, message), residuals_(std::move(residuals)), iterations_(iterations) {}

}  // namespace protonflow::thermo
