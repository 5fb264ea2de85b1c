// Converging recycles: the tear streams' variables x solve x = G(x), where G is one pass of the
// flowsheet through its recycle units. KINSOL's fixed-point iteration (KIN_FP) with Anderson
// acceleration (Walker & Ni 2011, SIAM J. Numer. Anal. 49, 1715) does the work; with depth 0 it is
// plain successive substitution.
#pragma once

#include <cstddef>
#include <functional>
#include <span>
#include <stdexcept>
#include <string>
#include <vector>

namespace protonflow::host {

struct RecycleOptions {
  double tolerance = 1e-9;      // on the largest relative change of any variable in one pass
  long max_iterations = 100;    // passes through the recycle (evaluations of G)
  long acceleration_depth = 5;  // Anderson depth m; 0: plain substitution
  double damping = 1.0;         // β in (0, 1]; 1: undamped
};

struct RecycleIteration {
  long iteration;                  // 1-based
  double largest_relative_change;  // max_i |G_i(x) − x_i| / max(|G_i(x)|, |x_i|, floor_i)
  std::size_t variable;            // the i of that maximum
};

struct RecycleOutcome {
  std::vector<double> x;  // the last G(x): the newest and (for a contraction) the best estimate
  long iterations = 0;
  double largest_relative_change = 0.0;
  std::size_t variable = 0;
  std::vector<RecycleIteration> history;
};

// The recycle did not converge; history says how it went, reason why it stopped.
class RecycleNotConverged : public std::runtime_error {
 public:
  RecycleNotConverged(const std::string& reason, std::vector<RecycleIteration> history)
      : std::runtime_error(reason), history_(std::move(history)) {}
  const std::vector<RecycleIteration>& history() const noexcept { return history_; }

 private:
  std::vector<RecycleIteration> history_;
};

// One pass: writes G(x) into g. May throw; the exception is carried across KINSOL and rethrown.
using RecycleFunction = std::function<void(std::span<const double> x, std::span<double> g)>;
// The absolute floor of each variable's relative change given G(x) (e.g. a small share of the
// stream's total flow for a trace component, so round-off on nothing does not count as change).
using RecycleFloor = std::function<void(std::span<const double> g, std::span<double> floor)>;

// Solves x = G(x) from x0. The first pass is plain substitution from the estimate; KINSOL then
// iterates in variables scaled by their current size (so that Anderson's least-squares problem
// weighs a temperature in K, a pressure in Pa and a flow in mol/s alike), restarting with new
// scales if its own step test is met before the relative-change test is. Throws
// RecycleNotConverged after max_iterations passes, or when KINSOL fails.
RecycleOutcome converge_recycle(std::vector<double> x0, const RecycleFunction& g, const RecycleFloor& floor,
                                const RecycleOptions& options);

}  // namespace protonflow::host
