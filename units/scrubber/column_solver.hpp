// A counter-current column of N equilibrium stages with a Murphree vapour efficiency, every stage
// solved together by KINSOL on the block-tridiagonal (banded) structure. Stage 0 is the top: the
// liquor enters it; the gas enters stage N-1, the bottom. Equations, unknowns, Jacobian and start:
// docs/units.md, "scrubber".
#pragma once

#include <cstddef>
#include <memory>
#include <stdexcept>
#include <string>
#include <vector>

#include "stage_model.hpp"

namespace protonflow::scrubber {

struct ColumnFeeds {
  std::vector<double> liquid;  // mol/s per liquid component, into the top stage
  double liquid_temperature = 298.15;  // K
  std::vector<double> gas;     // mol/s per gas, into the bottom stage
  double gas_temperature = 298.15;     // K
};

struct ColumnSpecification {
  std::size_t stages = 1;
  double pressure = 101325.0;     // Pa, the same on every stage
  std::vector<double> efficiency; // Murphree vapour efficiency per gas, 0 < E <= 1
  double tolerance = 1e-10;       // scaled residual max-norm
  long max_iterations = 100;
};

// Flows leaving each stage, top first: liquid[j * liquid_count + c], gas[j * gas_count + k].
struct ColumnProfile {
  std::size_t stages = 0;
  std::vector<double> liquid;       // mol/s
  std::vector<double> gas;          // mol/s
  std::vector<double> temperature;  // K
  long iterations = 0;              // Newton iterations
  double residual_norm = 0.0;       // scaled max-norm at the answer
};

struct StageResidual {
  std::size_t stage;      // 1-based from the top, as an engineer counts trays
  std::string equation;   // "balance of component 2", "equilibrium of gas 1", "energy"
  double scaled_residual;
};

// The column did not converge: the largest scaled residuals, where they are, and the iterations.
class ColumnConvergenceError : public std::runtime_error {
 public:
  ColumnConvergenceError(const std::string& message, std::vector<StageResidual> residuals, long iterations)
      : std::runtime_error(message), residuals_(std::move(residuals)), iterations_(iterations) {}
  const std::vector<StageResidual>& residuals() const noexcept { return residuals_; }
  long iterations() const noexcept { return iterations_; }

 private:
  std::vector<StageResidual> residuals_;
  long iterations_;
};

// What a column of one stage count keeps from one solve to the next: the LU factors of the last
// Jacobian of its last solve, with which the next solve from a previous answer first tries chord
// steps (docs/units.md, "scrubber", "Warm start"). Move-only; empty until a solve fills it.
class ColumnMemory {
 public:
  ColumnMemory();
  ~ColumnMemory();
  ColumnMemory(ColumnMemory&&) noexcept;
  ColumnMemory& operator=(ColumnMemory&&) noexcept;
  ColumnMemory(const ColumnMemory&) = delete;
  ColumnMemory& operator=(const ColumnMemory&) = delete;
  struct Objects;  // the SUNDIALS objects (column_solver.cpp)
  Objects& objects() { return *objects_; }

 private:
  std::unique_ptr<Objects> objects_;
};

// Solves the column: from `previous` (an answer of the same column at other feeds) where it is
// given and fits, else, or if Newton from it fails, from a cold start (column_start.cpp). With a
// memory of the same column's last solve, chord steps on its Jacobian come first from `previous`;
// the memory then keeps this solve's last Jacobian. Throws ColumnConvergenceError, or
// std::invalid_argument for feeds or a specification that make no column.
ColumnProfile solve_column(StageModel& model, const ColumnSpecification& specification, const ColumnFeeds& feeds,
                           const ColumnProfile* previous = nullptr, ColumnMemory* memory = nullptr);

// A start for a column of `stages` stages from the answer of the same column, at the same feeds,
// with another stage count (column_resize.cpp): the solved profile aligned at the bottom, cut or
// extended over its top. Pass it to solve_column as `previous`.
ColumnProfile profile_for_stages(const ColumnProfile& solved, std::size_t stages);

}  // namespace protonflow::scrubber
