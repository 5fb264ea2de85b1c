#include "stream_properties.hpp"

#include <algorithm>
#include <cmath>

#include <fmt/format.h>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"
#include "protonflow/thermo/errors.hpp"

namespace protonflow::host {

// One system over the components an aqueous phase holds; the solver refers to the system, so both
// live here together.
struct StreamAnalyser::Speciator {
  Speciator(const thermo::Database& database, std::vector<std::string> components)
      : system(database, std::move(components), options()), solver(system) {}

  static thermo::SystemOptions options() {
    thermo::SystemOptions options;
    // Davies, the engine's default: the host reports an indicative pH of each stream; a unit that
    // needs another model computes its own.
    options.activity = thermo::ActivityModelKind::davies;
    return options;
  }

  thermo::ChemicalSystem system;
  thermo::EquilibriumSolver solver;
  thermo::Speciation speciation;
};

StreamAnalyser::StreamAnalyser(const thermo::Database& database, const unit_host::Slate& slate,
                               std::vector<double> molar_masses)
    : database_(database), slate_(slate), molar_masses_(std::move(molar_masses)) {}

StreamAnalyser::~StreamAnalyser() = default;

StreamSummary StreamAnalyser::summarise(const unit_host::StreamState& stream, std::size_t main_count) {
  StreamSummary summary;
  const std::size_t columns = slate_.components.size();
  const std::size_t rows = slate_.phase_count();
  std::vector<double> component_mass(columns, 0.0);
  summary.phase_mass_flow.assign(rows, 0.0);
  for (std::size_t row = 0; row < rows; ++row) {
    for (std::size_t c = 0; c < columns; ++c) {
      const double flow = stream.flows[row * columns + c];
      summary.molar_flow += flow;
      summary.phase_mass_flow[row] += flow * molar_masses_[c];
      component_mass[c] += flow * molar_masses_[c];
    }
    summary.mass_flow += summary.phase_mass_flow[row];
  }
  std::vector<std::size_t> order(columns);
  for (std::size_t c = 0; c < columns; ++c) order[c] = c;
  std::ranges::stable_sort(order, [&](std::size_t a, std::size_t b) { return component_mass[a] > component_mass[b]; });
  for (std::size_t k = 0; k < std::min(main_count, columns); ++k) {
    if (component_mass[order[k]] > 0.0 && summary.mass_flow > 0.0) {
      summary.main_components.emplace_back(slate_.components[order[k]], component_mass[order[k]] / summary.mass_flow);
    }
  }

  // pH of the aqueous phase, if it holds water.
  const auto water = std::ranges::find(slate_.components, "H2O");
  const double* aqueous = stream.flows.data() + PFU_AQUEOUS_ROW * columns;
  if (water == slate_.components.end() || aqueous[water - slate_.components.begin()] <= 0.0) {
    if (summary.phase_mass_flow[PFU_AQUEOUS_ROW] > 0.0) summary.ph_note = "no water in the aqueous phase";
    return summary;
  }
  std::vector<std::size_t> present;
  std::vector<std::string> names;
  std::vector<double> amounts;
  for (std::size_t c = 0; c < columns; ++c) {
    if (aqueous[c] > 0.0 || slate_.components[c] == "H2O") {
      present.push_back(c);
      names.push_back(slate_.components[c]);
      // Speciation is intensive: one second of the stream is a sample of it.
      amounts.push_back(aqueous[c]);
    }
  }
  try {
    auto& speciator = speciators_[present];
    if (!speciator) speciator = std::make_unique<Speciator>(database_, names);
    speciator->solver.solve(stream.temperature, stream.pressure, amounts, speciator->speciation);
    summary.ph = speciator->speciation.ph;
  } catch (const thermo::ThermoError& error) {
    summary.ph_note = error.what();
  }
  return summary;
}

}  // namespace protonflow::host
