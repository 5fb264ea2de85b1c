// A solved column's profile as the start of a column of another stage count at the same feeds
// (docs/units.md, "scrubber", "Stages for a limit"): the search for the stages an emission limit
// needs solves several stage counts one after another, each closer to the last than to a cold start.
#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "column_solver.hpp"

namespace protonflow::scrubber {

namespace {

// How far the top stages are extended, at most, in ln(flow) per stage added: a gas that the liquor
// absorbs falls by a factor a stage, so its ln falls linearly up the column; the bound keeps an
// extrapolated flow where the column's unknowns have an answer (ln flow > −700 from the largest).
constexpr double largest_log_change_per_stage = 30.0;

// ln f at `above` stages over a top stage whose value is f_top and the next one f_next.
double extended(double f_top, double f_next, std::size_t above) {
  if (!(f_top > 0.0) || !(f_next > 0.0)) return f_top;
  const double change = std::clamp(std::log(f_top / f_next), -largest_log_change_per_stage, 0.0);
  return f_top * std::exp(change * static_cast<double>(above));
}

}  // namespace

ColumnProfile profile_for_stages(const ColumnProfile& solved, std::size_t stages) {
  const std::size_t m = solved.stages;
  if (m == 0 || stages == 0 || solved.liquid.size() % m != 0 || solved.gas.size() % m != 0 || solved.temperature.size() != m)
    throw std::invalid_argument("profile_for_stages: not a solved column's profile");
  const std::size_t liquid_count = solved.liquid.size() / m;
  const std::size_t gas_count = solved.gas.size() / m;
  ColumnProfile profile;
  profile.stages = stages;
  profile.liquid.assign(stages * liquid_count, 0.0);
  profile.gas.assign(stages * gas_count, 0.0);
  profile.temperature.assign(stages, 0.0);
  // Aligned at the bottom, where the gas enters: stage j of the new column (top first) is stage
  // j − (stages − m) of the solved one. A shorter column keeps the solved column's lowest stages;
  // a taller one adds stages over its top, each flow going on as it changed from the solved
  // column's second stage to its top (falling only), each temperature the top's.
  for (std::size_t j = 0; j < stages; ++j) {
    if (j + m >= stages) {
      const std::size_t i = j + m - stages;
      std::copy_n(solved.liquid.begin() + static_cast<std::ptrdiff_t>(i * liquid_count), liquid_count,
                  profile.liquid.begin() + static_cast<std::ptrdiff_t>(j * liquid_count));
      std::copy_n(solved.gas.begin() + static_cast<std::ptrdiff_t>(i * gas_count), gas_count,
                  profile.gas.begin() + static_cast<std::ptrdiff_t>(j * gas_count));
      profile.temperature[j] = solved.temperature[i];
      continue;
    }
    const std::size_t above = stages - m - j;  // stages over the solved column's top
    const std::size_t next = m > 1 ? 1 : 0;
    for (std::size_t c = 0; c < liquid_count; ++c)
      profile.liquid[j * liquid_count + c] = extended(solved.liquid[c], solved.liquid[next * liquid_count + c], above);
    for (std::size_t k = 0; k < gas_count; ++k)
      profile.gas[j * gas_count + k] = extended(solved.gas[k], solved.gas[next * gas_count + k], above);
    profile.temperature[j] = solved.temperature.front();
  }
  return profile;
}

}  // namespace protonflow::scrubber
