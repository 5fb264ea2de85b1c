#include "stream_solution.hpp"

#include <fmt/format.h>

#include "flowsheet_file.hpp"

namespace protonflow::host {

SolutionInput read_stream_solution(const std::string& file, const std::string& stream, const UnitConverter& units) {
  const FlowsheetInput flowsheet = read_flowsheet_file(file, units);
  const StreamInput* found = nullptr;
  std::string known;
  for (const StreamInput& s : flowsheet.streams) {
    if (s.name == stream) found = &s;
    known += (known.empty() ? "" : ", ") + s.name;
  }
  if (found == nullptr) {
    throw InputError(SourcePosition{file, 0, 0},
                     fmt::format("no stream '{}' in this flowsheet; its streams with a given state are: {}", stream,
                                 known.empty() ? "none" : known));
  }
  SolutionInput input;
  input.file = file;
  input.name = fmt::format("stream {} of {}", found->name, flowsheet.name.empty() ? file : flowsheet.name);
  input.temperature = found->temperature;
  input.pressure = found->pressure;
  input.temperature_at = found->temperature_at;
  input.pressure_at = found->pressure_at;
  input.solution_at = found->at;
  input.components_at = found->at;
  input.basis = AmountBasis::moles;  // mol/s over one second
  input.all_solids = true;
  input.gas_phase = true;
  for (const PhaseInput& phase : found->phases) {
    for (std::size_t k = 0; k < phase.flows.size(); ++k) {
      const ComponentFlow& flow = phase.flows[k];
      const SourcePosition at = k < phase.flow_at.size() ? phase.flow_at[k] : phase.at;
      bool merged = false;
      for (ComponentEntry& entry : input.components) {
        if (entry.formula == flow.formula) {
          entry.amount += flow.flow;
          merged = true;
        }
      }
      if (!merged) input.components.push_back(ComponentEntry{flow.formula, flow.flow, at, at});
    }
  }
  if (input.components.empty()) throw InputError(found->at, fmt::format("stream '{}' carries no flow to speciate", stream));
  return input;
}

}  // namespace protonflow::host
