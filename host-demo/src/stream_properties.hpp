// What the reports say about a stream beyond its state: mass flows, phase split, main components
// and, for an aqueous phase, the pH — recomputed from the formula amounts by the equilibrium
// engine, as every consumer of a stream does.
#pragma once

#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include <protonflow/unit_host.hpp>

#include "protonflow/thermo/database.hpp"

namespace protonflow::host {

struct StreamSummary {
  double molar_flow = 0.0;  // mol/s, all phases
  double mass_flow = 0.0;   // kg/s, all phases
  std::vector<double> phase_mass_flow;  // kg/s per row (aqueous, gas, solids)
  std::optional<double> ph;             // of the aqueous phase, if it has water and the engine solved it
  std::string ph_note;                  // why there is no pH, when there is an aqueous phase without one
  std::vector<std::pair<std::string, double>> main_components;  // formula and mass fraction of the stream, largest first
};

// Speciates aqueous phases; keeps one chemical system and solver per set of components, so the
// streams of a flowsheet (which mostly share one) pay for one build.
class StreamAnalyser {
 public:
  StreamAnalyser(const thermo::Database& database, const unit_host::Slate& slate, std::vector<double> molar_masses);
  ~StreamAnalyser();
  StreamAnalyser(const StreamAnalyser&) = delete;
  StreamAnalyser& operator=(const StreamAnalyser&) = delete;

  // main_count: how many components to list.
  StreamSummary summarise(const unit_host::StreamState& stream, std::size_t main_count = 3);

 private:
  struct Speciator;
  const thermo::Database& database_;
  unit_host::Slate slate_;
  std::vector<double> molar_masses_;
  std::map<std::vector<std::size_t>, std::unique_ptr<Speciator>> speciators_;  // by the aqueous components present
};

}  // namespace protonflow::host
