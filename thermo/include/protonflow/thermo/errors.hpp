// Typed errors of the equilibrium engine: what went wrong, in words a user can act on.
#pragma once

#include <stdexcept>
#include <string>
#include <vector>

namespace protonflow::thermo {

enum class ErrorKind {
  bad_formula,      // a formula the parser cannot read
  bad_data,         // a species data file that is malformed or inconsistent
  unknown_species,  // a name or formula the database cannot map
  bad_input,        // a negative amount, a NaN, an empty solution
  out_of_range,     // temperature or pressure outside the data's range
  not_converged,    // the solver stopped without meeting its tolerance
};

class ThermoError : public std::runtime_error {
 public:
  ThermoError(ErrorKind kind, const std::string& message) : std::runtime_error(message), kind_(kind) {}
  ErrorKind kind() const noexcept { return kind_; }

 private:
  ErrorKind kind_;
};

// A data-file error carries the position of the offending YAML node (1-based line and column).
class DataError : public ThermoError {
 public:
  DataError(std::string file, int line, int column, const std::string& what);
  const std::string& file() const noexcept { return file_; }
  int line() const noexcept { return line_; }
  int column() const noexcept { return column_; }

 private:
  std::string file_;
  int line_;
  int column_;
};

struct EquationResidual {
  std::string equation;  // e.g. "mass balance SO4^2-", "charge balance"
  double scaled_residual;
};

// Non-convergence carries every equation's residual so the caller can see what failed.
class ConvergenceError : public ThermoError {
 public:
  ConvergenceError(const std::string& message, std::vector<EquationResidual> residuals, long iterations);
  const std::vector<EquationResidual>& residuals() const noexcept { return residuals_; }
  long iterations() const noexcept { return iterations_; }

 private:
  std::vector<EquationResidual> residuals_;
  long iterations_;
};

}  // namespace protonflow::thermo
