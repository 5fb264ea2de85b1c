// The result of one speciation, written as YAML (for programs and regression tests) or as a
// fixed-width table (for people). Field names and units: docs/solution-format.md.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "balance_closure.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"

namespace protonflow::host {

struct SoluteLabel {
  std::string name;
  int charge = 0;
};

struct SpeciationReport {
  std::string source;          // the input file
  std::string name;            // the solution's label, may be empty
  std::string activity_model;  // as written in the input
  std::string amounts_as;
  std::string precipitates;    // "fresh" or "aged": which form of a solid with two may precipitate
  std::vector<std::string> components;  // the slate
  std::vector<double> component_amounts;  // mol, as passed to the solver
  std::vector<SoluteLabel> solutes;     // in the order of speciation's vectors
  thermo::Speciation speciation;
  BalanceClosure closure;
  std::vector<std::string> warnings;  // model stretched beyond its range, and the like
  std::optional<double> enthalpy;     // J, where the data give every present species' enthalpy
  std::string enthalpy_unavailable;   // why not, otherwise
  std::vector<std::string> solids;       // in the order of speciation.solid_amount
  std::vector<std::string> open_gases;   // in the order of speciation.gas_uptake
  std::vector<std::string> phase_gases;  // in the order of speciation.gas_amount
};

std::string to_yaml(const SpeciationReport& report);
std::string to_table(const SpeciationReport& report);

}  // namespace protonflow::host
