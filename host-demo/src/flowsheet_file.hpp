// Reading a flowsheet from YAML (format: docs/flowsheet-format.md). Everything that can be checked
// without the unit modules and the species data is checked here, with the file, line and column of
// the cause; quantities are converted to SI, and each phase's composition to molar flows. Unit
// parameters stay text until the unit's descriptor says which SI unit they need
// (flowsheet_model.hpp).
#pragma once

#include <string>
#include <vector>

#include "flowsheet_quantity.hpp"
#include "input_error.hpp"
#include "stream_composition.hpp"

namespace protonflow::host {

struct NamedAt {
  std::string name;
  SourcePosition at;
};

struct PhaseInput {
  PhaseKind kind = PhaseKind::aqueous;
  std::string solid;  // the solid phase's database name, for kind == solid
  SourcePosition at;  // the phase's key
  CompositionBasis basis = CompositionBasis::flows;
  std::vector<ComponentFlow> flows;     // mol/s; water appended where it is the solvent
  std::vector<SourcePosition> flow_at;  // where each was written (the phase's key for appended water)
};

struct StreamInput {
  std::string name;
  SourcePosition at;  // the stream's key under 'streams'
  double temperature = 0.0;  // K
  double pressure = 0.0;     // Pa, absolute
  SourcePosition temperature_at;
  SourcePosition pressure_at;
  bool estimate = false;  // a starting estimate for a recycle, not a feed
  std::vector<PhaseInput> phases;
};

struct ParameterInput {
  std::string name;
  std::string text;     // the value as written
  bool quoted = false;  // written in quotes, so meant as text
  SourcePosition key_at;
  SourcePosition value_at;
};

// A port and what it is connected to: one stream ('feed: raw') or, for a port that takes a list
// (unit ABI 1.3), a list of them ('feed: [acid, water, rinse]').
struct PortConnection {
  std::string port;
  SourcePosition port_at;
  std::vector<NamedAt> streams;  // in the order written
  bool list = false;             // written as a YAML sequence
};

struct UnitInput {
  std::string name;
  SourcePosition at;  // the unit's key under 'units'
  std::string type;
  SourcePosition type_at;
  std::vector<ParameterInput> parameters;
  std::vector<PortConnection> ports;
};

struct SolverInput {
  double tolerance = 1e-9;      // largest relative change of any tear variable between iterations
  long max_iterations = 100;    // flowsheet passes through the recycle
  long acceleration_depth = 5;  // Anderson: how many earlier iterates; 0 is plain substitution
  double damping = 1.0;         // 1: no damping
  std::vector<NamedAt> tear_streams;  // chosen by the user; empty: the host chooses
  SourcePosition at;                  // the 'solver' key, or the file when absent
};

struct FlowsheetInput {
  std::string file;
  std::string name;  // optional label
  std::vector<NamedAt> components;  // the 'components' list, if given
  std::vector<NamedAt> solids;      // the 'solids' list, if given
  double gauge_reference = standard_atmosphere_pressure;  // Pa
  std::vector<StreamInput> streams;  // in file order
  std::vector<UnitInput> units;      // in file order
  SolverInput solver;
};

// Reads and checks file. Throws InputError naming the file, line and column.
FlowsheetInput read_flowsheet_file(const std::string& file, const UnitConverter& units);

// The same from text already in memory; file names it in messages.
FlowsheetInput parse_flowsheet(const std::string& text, const std::string& file, const UnitConverter& units);

// Whether a name is usable for a stream or a unit: letters, digits, '_' and '-', so that
// "unit.port" and "streams.NAME.temperature" can never be misread.
bool valid_name(std::string_view name) noexcept;

}  // namespace protonflow::host
