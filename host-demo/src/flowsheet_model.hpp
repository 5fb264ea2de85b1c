// A flowsheet bound to what it runs on: each unit to the module offering its type, its parameters
// converted to the SI units its descriptor declares, its ports to streams; the components and solid
// phases to the species data. Everything a user can get wrong is checked here, before any unit is
// created, and reported at the YAML line and column that caused it.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include <protonflow/unit_host.hpp>

#include "flowsheet_file.hpp"
#include "module_search.hpp"
#include "protonflow/thermo/database.hpp"

namespace protonflow::host {

struct StreamNode {
  std::string name;
  SourcePosition at;              // where it is first named: under 'streams', or at a port
  std::optional<std::size_t> spec;  // index into FlowsheetInput::streams, if given there
  std::optional<std::size_t> source_unit;  // the unit whose outlet produces it
  std::size_t source_port = 0;             // index among that unit's outlets
  SourcePosition source_at;
  std::optional<std::size_t> sink_unit;  // the unit whose inlet takes it
  std::size_t sink_port = 0;             // index among that unit's inlets
  SourcePosition sink_at;
  // An optional port (PFU_PORT_OPTIONAL, unit ABI 1.2) left unconnected gets a stream of its own,
  // named "unit.port" (a name no user stream can have), which is not reported: for an inlet an
  // empty one, for an outlet one that must stay empty (the unused outlets of a splitter, say).
  bool unconnected = false;

  bool is_feed() const noexcept { return !source_unit.has_value(); }
  bool is_product() const noexcept { return !sink_unit.has_value(); }
};

struct UnitNode {
  std::string name;
  std::string type;
  SourcePosition at;
  SourcePosition type_at;
  unit_host::Module module;
  unit_host::UnitClassInfo info;
  std::vector<unit_host::ParameterValue> parameters;  // SI, as the module takes them
  // Every stream of the unit, port by port in the descriptor's order; a list port (unit ABI 1.3)
  // contributes the streams of its list, in the order written, another port one stream.
  std::vector<std::string> inlet_ports;   // per stream: the name of its port
  std::vector<std::string> outlet_ports;
  std::vector<std::size_t> inlets;        // stream indices, parallel to inlet_ports
  std::vector<std::size_t> outlets;
  std::vector<std::uint32_t> inlet_counts;   // per inlet port: how many of inlets are its streams
  std::vector<std::uint32_t> outlet_counts;  // per outlet port
};

struct Flowsheet {
  FlowsheetInput input;
  unit_host::Slate slate;
  std::vector<double> molar_masses;  // kg/mol, per slate component
  std::vector<StreamNode> streams;   // named ones first in file order, then as ports name them
  std::vector<UnitNode> units;       // in file order
  std::vector<unit_host::StreamState> given;  // per stream: the state given under 'streams' (empty flows if none)
  std::vector<std::size_t> tear_choice;       // streams the user named as tears (solver.tear_streams)
  std::vector<std::string> notes;             // warnings about the flowsheet itself

  std::size_t stream_index(std::string_view name) const;  // throws std::out_of_range
  std::string port_label(std::size_t unit, bool inlet, std::size_t port) const;  // "unit.port"
};

// Checks input against the modules on the catalog and the species data and builds the flowsheet.
// Throws InputError naming the file, line and column.
Flowsheet bind_flowsheet(FlowsheetInput input, const UnitCatalog& catalog, const thermo::Database& database,
                         const UnitConverter& units);

// Creates one instance per unit, in order. Throws InputError at the unit whose module refused its
// parameters, with the module's message and file.
std::vector<unit_host::Instance> create_instances(const Flowsheet& flowsheet);

// The row of a phase in a stream's flows: aqueous, gas, then the slate's solids.
std::size_t phase_row(const unit_host::Slate& slate, PhaseKind kind, std::string_view solid);
// "aqueous", "gas" or the solid's name.
std::string phase_name(const unit_host::Slate& slate, std::size_t row);

}  // namespace protonflow::host
