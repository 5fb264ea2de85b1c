// The order in which a sequential-modular host solves the units of a flowsheet, and the tear
// streams that open its recycles. Pure graph work over indices: units are vertices, streams that
// run from an outlet to an inlet are edges.
#pragma once

#include <cstddef>
#include <span>
#include <stdexcept>
#include <vector>

namespace protonflow::host {

struct GraphEdge {
  std::size_t stream;  // the stream's index, which names the edge
  std::size_t from;    // the unit whose outlet it leaves
  std::size_t to;      // the unit whose inlet it enters
};

struct SolveOrder {
  std::vector<std::size_t> tears;     // stream indices, ascending
  std::vector<std::size_t> sequence;  // every unit, in an order where each follows what feeds it (tears cut)
  // The same units in three groups, each in sequence order: those no tear reaches (solved once,
  // first), those on a path from a tear back to a tear (solved every recycle iteration), and those
  // only downstream of the recycles (solved once, last).
  std::vector<std::size_t> before;
  std::vector<std::size_t> loop;
  std::vector<std::size_t> after;
};

// Tear streams chosen by the user do not open every recycle; cycle names the units of one that is
// left, in flow order.
class UnbrokenCycleError : public std::runtime_error {
 public:
  UnbrokenCycleError(std::vector<std::size_t> cycle)
      : std::runtime_error("the tear streams leave a recycle closed"), cycle_(std::move(cycle)) {}
  const std::vector<std::size_t>& cycle() const noexcept { return cycle_; }

 private:
  std::vector<std::size_t> cycle_;
};

// Plans the solve. With forced_tears the user's tears are used as they are (and must open every
// recycle); otherwise the host chooses: first the preferred streams (those with a starting
// estimate) that lie on a recycle, then, while a recycle is left, the stream that lies on the most
// remaining recycles (ties: the lowest stream index, i.e. the first in the file). Greedy, not a
// minimum tear set in general (that problem is NP-hard), but minimal on the flowsheets people draw:
// single loops and loops that share a stream.
SolveOrder plan_solve_order(std::size_t unit_count, std::span<const GraphEdge> edges,
                            std::span<const std::size_t> preferred_tears, std::span<const std::size_t> forced_tears);

}  // namespace protonflow::host
