#include "flowsheet_solver.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>

#include <fmt/format.h>

namespace protonflow::host {
namespace {

// Below this share of its stream's total flow a component's change is round-off, not change: a
// recycle converged to 1e-9 relative does not wait for a trace at 1e-20 mol/s to settle.
constexpr double trace_share = 1e-12;

// A tear stream with no estimate starts empty, at the conditions of the flowsheet's first feed
// (or 25 °C and 1 atm if it has none).
constexpr double fallback_temperature = 298.15;  // K, the standard-state temperature (IUPAC)
constexpr double fallback_pressure = 101325.0;   // Pa, 1 standard atmosphere

class Runner {
 public:
  Runner(const Flowsheet& flowsheet, std::vector<unit_host::Instance>& instances, const SolveOrder& order)
      : flowsheet_(flowsheet), instances_(instances), order_(order) {
    solution_.order = order;
    solution_.streams = flowsheet.given;
    for (auto& stream : solution_.streams) {
      if (stream.flows.empty()) stream = unit_host::empty_stream(flowsheet.slate);
    }
    computed_ = solution_.streams;
    solution_.units.resize(flowsheet.units.size());
    is_tear_.assign(flowsheet.streams.size(), false);
    for (const std::size_t tear : order.tears) is_tear_[tear] = true;
    for (const UnitNode& unit : flowsheet.units) {
      inlet_scratch_.emplace_back(unit.inlets.size());
      outlet_scratch_.emplace_back(unit.outlets.size());
    }
  }

  FlowsheetSolution run() {
    for (const std::size_t unit : order_.before) solve_unit(unit, "");
    if (!order_.tears.empty()) converge();
    for (const std::size_t unit : order_.after) solve_unit(unit, "");
    return std::move(solution_);
  }

 private:
  std::size_t width() const { return 2 + flowsheet_.slate.flow_count(); }

  std::vector<std::string> variable_names() const {
    std::vector<std::string> names;
    const unit_host::Slate& slate = flowsheet_.slate;
    for (const std::size_t tear : order_.tears) {
      const std::string& stream = flowsheet_.streams[tear].name;
      names.push_back(fmt::format("stream '{}' temperature", stream));
      names.push_back(fmt::format("stream '{}' pressure", stream));
      for (std::size_t row = 0; row < slate.phase_count(); ++row) {
        for (const std::string& component : slate.components) {
          names.push_back(fmt::format("stream '{}' {} {} flow", stream, phase_name(slate, row), component));
        }
      }
    }
    return names;
  }

  std::vector<double> initial_estimate() const {
    double temperature = fallback_temperature;
    double pressure = fallback_pressure;
    for (std::size_t s = 0; s < flowsheet_.streams.size(); ++s) {
      if (flowsheet_.streams[s].is_feed()) {
        temperature = flowsheet_.given[s].temperature;
        pressure = flowsheet_.given[s].pressure;
        break;
      }
    }
    std::vector<double> x;
    for (const std::size_t tear : order_.tears) {
      const StreamNode& stream = flowsheet_.streams[tear];
      if (stream.spec && flowsheet_.input.streams[*stream.spec].estimate) {
        const unit_host::StreamState& estimate = flowsheet_.given[tear];
        x.push_back(estimate.temperature);
        x.push_back(estimate.pressure);
        x.insert(x.end(), estimate.flows.begin(), estimate.flows.end());
      } else {
        x.push_back(temperature);
        x.push_back(pressure);
        x.insert(x.end(), flowsheet_.slate.flow_count(), 0.0);
      }
    }
    return x;
  }

  // Tear values from the iteration vector. Anderson's extrapolation can overshoot below zero; a
  // flow is clipped to zero and T, P kept positive, so a unit sees a physical state (the fixed
  // point itself is never clipped: every unit writes non-negative outlets).
  void unpack(std::span<const double> x) {
    for (std::size_t k = 0; k < order_.tears.size(); ++k) {
      unit_host::StreamState& stream = solution_.streams[order_.tears[k]];
      const std::span<const double> values = x.subspan(k * width(), width());
      stream.temperature = std::max(values[0], 1.0);
      stream.pressure = std::max(values[1], 1.0);
      for (std::size_t i = 0; i < stream.flows.size(); ++i) stream.flows[i] = std::max(values[2 + i], 0.0);
    }
  }

  void pack(std::span<double> g) const {
    for (std::size_t k = 0; k < order_.tears.size(); ++k) {
      const unit_host::StreamState& stream = computed_[order_.tears[k]];
      const std::span<double> values = g.subspan(k * width(), width());
      values[0] = stream.temperature;
      values[1] = stream.pressure;
      std::ranges::copy(stream.flows, values.begin() + 2);
    }
  }

  void floors(std::span<const double> g, std::span<double> floor) const {
    for (std::size_t k = 0; k < order_.tears.size(); ++k) {
      const std::span<const double> values = g.subspan(k * width(), width());
      const std::span<double> out = floor.subspan(k * width(), width());
      double total = 0.0;
      for (std::size_t i = 2; i < values.size(); ++i) total += std::abs(values[i]);
      out[0] = 0.0;
      out[1] = 0.0;
      for (std::size_t i = 2; i < values.size(); ++i) out[i] = trace_share * total;
    }
  }

  void converge() {
    RecycleReport report;
    report.tears = order_.tears;
    report.variables = variable_names();
    const RecycleOptions options{flowsheet_.input.solver.tolerance, flowsheet_.input.solver.max_iterations,
                                 flowsheet_.input.solver.acceleration_depth, flowsheet_.input.solver.damping};
    long iteration = 0;
    const RecycleFunction pass = [&](std::span<const double> x, std::span<double> g) {
      ++iteration;
      unpack(x);
      const std::string when = fmt::format("in iteration {} of the recycle", iteration);
      // Only the outlets of these passes are read: units that can skip the rest do (unit ABI 1.4).
      for (const std::size_t unit : order_.loop) solve_unit(unit, when, true);
      pack(g);
    };
    const RecycleFloor floor = [&](std::span<const double> g, std::span<double> out) { floors(g, out); };
    RecycleOutcome outcome;
    try {
      outcome = converge_recycle(initial_estimate(), pass, floor, options);
    } catch (const RecycleNotConverged& error) {
      report.history = error.history();
      if (!report.history.empty()) {
        report.iterations = report.history.back().iteration;
        report.largest_relative_change = report.history.back().largest_relative_change;
        report.largest_change_at = report.variables.at(report.history.back().variable);
      }
      throw RecycleFailure(error.what(), std::move(report));
    }
    report.iterations = outcome.iterations;
    report.largest_relative_change = outcome.largest_relative_change;
    report.largest_change_at = report.variables.at(outcome.variable);
    report.history = std::move(outcome.history);

    // The reporting pass: every recycle unit once more from the converged tears, so that every
    // stream, result and warning belongs to one and the same state.
    unpack(outcome.x);
    for (const std::size_t unit : order_.loop) solve_unit(unit, "in the final pass of the recycle");
    std::vector<double> g(outcome.x.size());
    pack(g);
    std::vector<double> floor_values(g.size());
    floors(g, floor_values);
    for (std::size_t i = 0; i < g.size(); ++i) {
      const double size = std::max({std::abs(g[i]), std::abs(outcome.x[i]), floor_values[i]});
      if (size > 0.0) report.closure = std::max(report.closure, std::abs(g[i] - outcome.x[i]) / size);
    }
    // A tear stream is reported as its producer made it in that pass.
    for (const std::size_t tear : order_.tears) solution_.streams[tear] = computed_[tear];
    solution_.recycle = std::move(report);
  }

  void solve_unit(std::size_t index, const std::string& when, bool outlets_only = false) {
    const UnitNode& unit = flowsheet_.units[index];
    std::vector<unit_host::StreamState>& inlets = inlet_scratch_[index];
    std::vector<unit_host::StreamState>& outlets = outlet_scratch_[index];
    for (std::size_t k = 0; k < unit.inlets.size(); ++k) inlets[k] = solution_.streams[unit.inlets[k]];
    // An unconnected optional inlet carries nothing, at the conditions of the unit's first
    // connected inlet, so that a rule such as "the lowest inlet pressure" is not led astray.
    const auto connected = std::ranges::find_if(unit.inlets, [&](std::size_t s) { return !flowsheet_.streams[s].unconnected; });
    for (std::size_t k = 0; k < unit.inlets.size(); ++k) {
      if (!flowsheet_.streams[unit.inlets[k]].unconnected) continue;
      inlets[k].temperature = connected != unit.inlets.end() ? solution_.streams[*connected].temperature : fallback_temperature;
      inlets[k].pressure = connected != unit.inlets.end() ? solution_.streams[*connected].pressure : fallback_pressure;
    }
    UnitOutcome& outcome = solution_.units[index];
    const auto start = std::chrono::steady_clock::now();
    unit_host::Solution result;
    try {
      result = instances_[index].solve(inlets, unit.inlet_counts, outlets, unit.outlet_counts, outlets_only);
    } catch (const unit_host::SolveError& error) {
      throw UnitSolveFailure(index, error.status(), error.what(), when);
    } catch (const std::invalid_argument& error) {
      throw UnitSolveFailure(index, PFU_INVALID_ARGUMENT, error.what(), when);
    }
    const auto stop = std::chrono::steady_clock::now();
    outcome.solve_seconds.push_back(std::chrono::duration<double>(stop - start).count());
    outcome.results = std::move(result.results);
    outcome.warnings = std::move(result.warnings);
    outcome.series = std::move(result.series);
    for (std::size_t k = 0; k < unit.outlets.size(); ++k) {
      const std::size_t stream = unit.outlets[k];
      (is_tear_[stream] ? computed_ : solution_.streams)[stream] = outlets[k];
    }
  }

  const Flowsheet& flowsheet_;
  std::vector<unit_host::Instance>& instances_;
  const SolveOrder& order_;
  FlowsheetSolution solution_;
  std::vector<unit_host::StreamState> computed_;  // tear streams as their producers computed them
  std::vector<bool> is_tear_;
  std::vector<std::vector<unit_host::StreamState>> inlet_scratch_;
  std::vector<std::vector<unit_host::StreamState>> outlet_scratch_;
};

}  // namespace

SolveOrder plan_flowsheet(const Flowsheet& flowsheet) {
  std::vector<GraphEdge> edges;
  std::vector<std::size_t> preferred;
  for (std::size_t s = 0; s < flowsheet.streams.size(); ++s) {
    const StreamNode& stream = flowsheet.streams[s];
    if (stream.source_unit && stream.sink_unit) edges.push_back({s, *stream.source_unit, *stream.sink_unit});
    if (stream.spec && flowsheet.input.streams[*stream.spec].estimate) preferred.push_back(s);
  }
  try {
    return plan_solve_order(flowsheet.units.size(), edges, preferred, flowsheet.tear_choice);
  } catch (const UnbrokenCycleError& error) {
    std::string cycle;
    for (const std::size_t unit : error.cycle()) cycle += flowsheet.units[unit].name + " → ";
    cycle += flowsheet.units[error.cycle().front()].name;
    throw InputError(flowsheet.input.solver.tear_streams.front().at,
                     fmt::format("the tear streams leave the recycle {} closed; name a stream of it in "
                                 "'tear_streams', or leave 'tear_streams' out and let protonflow choose",
                                 cycle));
  }
}

FlowsheetSolution solve_flowsheet(const Flowsheet& flowsheet, std::vector<unit_host::Instance>& instances,
                                  const SolveOrder& order) {
  return Runner(flowsheet, instances, order).run();
}

}  // namespace protonflow::host
