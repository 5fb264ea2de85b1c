#include "flowsheet_model.hpp"

#include <algorithm>
#include <cmath>
#include <map>
#include <stdexcept>

#include <fmt/format.h>

#include "nearest_name.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/formula.hpp"
#include "protonflow/thermo/species.hpp"
#include "protonflow/thermo/tableau.hpp"

namespace protonflow::host {
namespace {

std::string direction_word(bool inlet) { return inlet ? "inlet" : "outlet"; }

std::string bound_text(double value) {
  if (std::isinf(value)) return value > 0 ? "inf" : "-inf";
  return fmt::format("{:g}", value);
}

std::vector<std::string_view> views(const std::vector<std::string>& names) {
  return {names.begin(), names.end()};
}

// "unknown X 'y'; did you mean 'z'?" or "...; known: a, b".
std::string unknown_with_choices(std::string_view what, std::string_view given, const std::vector<std::string>& known) {
  const std::vector<std::string_view> candidates = views(known);
  if (const auto suggestion = nearest_name(given, candidates)) {
    return fmt::format("unknown {} '{}'; did you mean '{}'?", what, given, *suggestion);
  }
  return fmt::format("unknown {} '{}'; known: {}", what, given, known.empty() ? std::string("none") : fmt::format("{}", fmt::join(known, ", ")));
}

class Binder {
 public:
  Binder(FlowsheetInput input, const UnitCatalog& catalog, const thermo::Database& database, const UnitConverter& units)
      : catalog_(catalog), database_(database), quantities_(units, input.gauge_reference) {
    flowsheet_.input = std::move(input);
  }

  Flowsheet bind() {
    for (std::size_t i = 0; i < flowsheet_.input.streams.size(); ++i) {
      const StreamInput& stream = flowsheet_.input.streams[i];
      StreamNode node;
      node.name = stream.name;
      node.at = stream.at;
      node.spec = i;
      flowsheet_.streams.push_back(std::move(node));
    }
    for (const UnitInput& unit : flowsheet_.input.units) bind_unit(unit);
    check_streams();
    build_slate();
    build_given_states();
    bind_tear_choice();
    return std::move(flowsheet_);
  }

 private:
  const FlowsheetInput& input() const { return flowsheet_.input; }

  void add_component(const std::string& formula, const SourcePosition& at) {
    if (std::ranges::find(flowsheet_.slate.components, formula) != flowsheet_.slate.components.end()) return;
    // Water is the solvent and the database's own species; every other formula must map onto the
    // basis, or no unit (and no pH) could be computed from it.
    if (formula != "H2O") {
      try {
        static_cast<void>(thermo::decompose(database_, formula));
      } catch (const thermo::ThermoError& error) {
        throw InputError(at, fmt::format("unknown species: component {}: {}", formula, error.what()));
      }
    }
    flowsheet_.slate.components.push_back(formula);
    flowsheet_.molar_masses.push_back(0.0);  // filled in below, from the reader's masses
  }

  void add_solid(const std::string& name, const SourcePosition& at) {
    if (std::ranges::find(flowsheet_.slate.solids, name) != flowsheet_.slate.solids.end()) return;
    const thermo::Species* species = database_.find(name);
    if (species == nullptr || species->phase != thermo::Phase::solid) {
      std::vector<std::string> solids;
      for (const thermo::Species& s : database_.species()) {
        if (s.phase == thermo::Phase::solid) solids.push_back(s.name);
      }
      throw InputError(at, unknown_with_choices("solid phase", name, solids) + " (solid phases are named as the "
                                                                                "species data names them)");
    }
    flowsheet_.slate.solids.push_back(name);
  }

  void build_slate() {
    for (const NamedAt& component : input().components) add_component(component.name, component.at);
    for (const NamedAt& solid : input().solids) add_solid(solid.name, solid.at);
    for (const StreamInput& stream : input().streams) {
      for (const PhaseInput& phase : stream.phases) {
        if (phase.kind == PhaseKind::solid) add_solid(phase.solid, phase.at);
        for (std::size_t k = 0; k < phase.flows.size(); ++k) add_component(phase.flows[k].formula, phase.flow_at[k]);
      }
    }
    if (flowsheet_.slate.components.empty()) {
      throw InputError(SourcePosition{input().file, 1, 1},
                       "the flowsheet names no component: give feed streams, or list them under 'components'");
    }
    for (std::size_t c = 0; c < flowsheet_.slate.components.size(); ++c) {
      const std::string& formula = flowsheet_.slate.components[c];
      // The reader has checked every formula already; the mass is the one it used.
      flowsheet_.molar_masses[c] = formula == "H2O" ? thermo::constants::water_molar_mass
                                                    : thermo::molar_mass(thermo::parse_formula(formula));
    }
  }

  std::size_t stream_named(const NamedAt& named) {
    for (std::size_t i = 0; i < flowsheet_.streams.size(); ++i) {
      if (flowsheet_.streams[i].name == named.name) return i;
    }
    StreamNode node;
    node.name = named.name;
    node.at = named.at;
    flowsheet_.streams.push_back(std::move(node));
    return flowsheet_.streams.size() - 1;
  }

  unit_host::ParameterValue convert_parameter(const UnitInput& unit, const unit_host::ParameterInfo& declared,
                                              const ParameterInput& given, const unit_host::Module& module) const {
    const std::string what = fmt::format("parameter '{}' of unit '{}' ({})", declared.name, unit.name, unit.type);
    if (declared.kind == unit_host::ParameterKind::text) return {declared.name, given.text};
    if (declared.kind == unit_host::ParameterKind::choice) {
      if (std::ranges::find(declared.choices, given.text) == declared.choices.end()) {
        const std::vector<std::string_view> candidates = views(declared.choices);
        const auto suggestion = nearest_name(given.text, candidates);
        throw InputError(given.value_at, fmt::format("{} is '{}'; {}", what, given.text,
                                                     suggestion ? fmt::format("did you mean '{}'?", *suggestion)
                                                                : fmt::format("allowed: {}", list_choices(candidates))));
      }
      return {declared.name, given.text};
    }
    QuantityText written;
    try {
      written = split_quantity(given.text);
    } catch (const QuantityError&) {
      throw InputError(given.value_at, fmt::format("{} must be a number{}, not '{}'", what,
                                                   declared.unit == "1" ? "" : fmt::format(" with a unit convertible to {}", declared.unit),
                                                   given.text));
    }
    double value = written.value;
    const bool dimensionless = declared.unit == "1" || declared.unit.empty();
    if (written.unit.empty()) {
      if (!dimensionless) {
        throw InputError(given.value_at, fmt::format("{} '{}' needs a unit: the unit takes {} (e.g. '{} {}')", what,
                                                     given.text, declared.unit, written.value, declared.unit));
      }
    } else {
      // The descriptor's unit must be one UDUNITS-2 reads, or nothing can be converted to it.
      if (!quantities_.convertible(declared.unit, declared.unit)) {
        throw InputError(SourcePosition{module.file().string(), 0, 0},
                         fmt::format("unit '{}' declares parameter '{}' in '{}', which UDUNITS-2 cannot read", unit.type,
                                     declared.name, declared.unit));
      }
      try {
        value = quantities_.to_si(written, dimensionless ? "1" : declared.unit);
      } catch (const QuantityError& error) {
        throw InputError(given.value_at, fmt::format("{} '{}': {} (the unit takes {})", what, given.text, error.what(),
                                                     dimensionless ? std::string("a plain number") : declared.unit));
      }
    }
    if (!std::isfinite(value)) throw InputError(given.value_at, fmt::format("{} is not a finite number", what));
    if (value < declared.lower || value > declared.upper) {
      const std::string unit_suffix = dimensionless ? "" : " " + declared.unit;
      const std::string converted = written.unit.empty() ? "" : fmt::format(" ({:g}{})", value, unit_suffix);
      throw InputError(given.value_at, fmt::format("{} = {}{} is outside its bounds [{}, {}]{}", what, given.text,
                                                   converted, bound_text(declared.lower), bound_text(declared.upper),
                                                   unit_suffix));
    }
    return {declared.name, value};
  }

  void bind_unit(const UnitInput& unit) {
    const unit_host::Module* module = catalog_.module_for(unit.type);
    if (module == nullptr) {
      std::string message = unknown_with_choices("unit type", unit.type, catalog_.types());
      if (message.find("did you mean") != std::string::npos) {
        message += fmt::format(" (known types: {})", fmt::join(catalog_.types(), ", "));
      }
      std::vector<std::string> directories;
      for (const auto& directory : catalog_.search_path()) directories.push_back(directory.string());
      message += fmt::format("\nsearched: {}", directories.empty() ? std::string("(no directories)")
                                                                   : fmt::format("{}", fmt::join(directories, ", ")));
      for (const ModuleProblem& problem : catalog_.problems()) {
        message += fmt::format("\nnot loaded: {}", problem.message);
      }
      throw InputError(unit.type_at, message);
    }
    const unit_host::UnitClassInfo& info = *module->find(unit.type);
    UnitNode node{.name = unit.name, .type = unit.type, .at = unit.at, .type_at = unit.type_at, .module = *module,
                  .info = info, .parameters = {}, .inlet_ports = {}, .outlet_ports = {}, .inlets = {}, .outlets = {},
                  .inlet_counts = {}, .outlet_counts = {}};
    const std::string label = fmt::format("unit '{}' ({})", unit.name, unit.type);

    // Parameters: every given one must be declared; every required one must be given.
    std::vector<std::string> declared_names;
    for (const auto& p : info.parameters) declared_names.push_back(p.name);
    for (const ParameterInput& given : unit.parameters) {
      if (std::ranges::find(declared_names, given.name) == declared_names.end()) {
        throw InputError(given.key_at, fmt::format("{}: {}", label, unknown_with_choices("parameter", given.name, declared_names)));
      }
    }
    for (const unit_host::ParameterInfo& declared : info.parameters) {
      const auto given = std::ranges::find(unit.parameters, declared.name, &ParameterInput::name);
      if (given == unit.parameters.end()) {
        if (declared.required()) {
          throw InputError(unit.at, fmt::format("{} needs parameter '{}'{}: {}", label, declared.name,
                                                declared.unit.empty() || declared.unit == "1" ? ""
                                                                                              : fmt::format(" ({})", declared.unit),
                                                declared.meaning));
        }
        continue;
      }
      node.parameters.push_back(convert_parameter(unit, declared, *given, *module));
    }

    // Ports: every port of the descriptor connected once; no port it does not have.
    std::vector<std::string> port_names;
    for (const auto& port : info.ports) port_names.push_back(port.name);
    for (const PortConnection& connection : unit.ports) {
      if (std::ranges::find(port_names, connection.port) == port_names.end()) {
        throw InputError(connection.port_at, fmt::format("{}: {}", label, unknown_with_choices("port", connection.port, port_names)));
      }
    }
    const std::size_t unit_index = flowsheet_.units.size();
    pending_ = &node;
    for (const unit_host::PortInfo& port : info.ports) {
      const auto connection = std::ranges::find(unit.ports, port.name, &PortConnection::port);
      (port.inlet ? node.inlet_counts : node.outlet_counts).push_back(1);
      if (port.list) {
        // A list port takes the streams of its list (or one stream written plainly), within its bounds.
        const std::size_t count = connection == unit.ports.end() ? 0 : connection->streams.size();
        if (count < port.min_streams || count > port.max_streams) {
          const std::string bounds =
              port.max_streams == PFU_UNBOUNDED_STREAMS ? fmt::format("at least {}", port.min_streams)
              : port.min_streams == port.max_streams    ? fmt::format("{}", port.min_streams)
                                                        : fmt::format("{} to {}", port.min_streams, port.max_streams);
          throw InputError(connection == unit.ports.end() ? unit.at : connection->port_at,
                           fmt::format("{}: port '{}' ({}: {}) takes {} stream{}, as a list such as '{}: [a, b]'; {} {} given",
                                       label, port.name, direction_word(port.inlet), port.meaning, bounds,
                                       port.max_streams == 1 ? "" : "s", port.name, count, count == 1 ? "is" : "are"));
        }
        (port.inlet ? node.inlet_counts : node.outlet_counts).back() = static_cast<std::uint32_t>(count);
        if (connection != unit.ports.end()) {
          for (const NamedAt& stream : connection->streams) connect(port, stream, unit, node, unit_index);
        }
        continue;
      }
      if (connection != unit.ports.end() && (connection->list || connection->streams.size() != 1)) {
        throw InputError(connection->port_at,
                         fmt::format("{}: port '{}' takes one stream, not a list; name one stream, or join the streams "
                                     "first with a mixing unit",
                                     label, port.name));
      }
      if (connection == unit.ports.end() && port.optional) {
        StreamNode hidden;
        hidden.name = fmt::format("{}.{}", unit.name, port.name);
        hidden.at = unit.at;
        hidden.unconnected = true;
        if (port.inlet) {
          hidden.sink_unit = unit_index;
          hidden.sink_port = node.inlets.size();
          hidden.sink_at = unit.at;
        } else {
          hidden.source_unit = unit_index;
          hidden.source_port = node.outlets.size();
          hidden.source_at = unit.at;
        }
        flowsheet_.streams.push_back(std::move(hidden));
        (port.inlet ? node.inlet_ports : node.outlet_ports).push_back(port.name);
        (port.inlet ? node.inlets : node.outlets).push_back(flowsheet_.streams.size() - 1);
        continue;
      }
      if (connection == unit.ports.end()) {
        throw InputError(unit.at, fmt::format("{}: port '{}' ({}: {}) is not connected; name its stream under "
                                              "'ports' (only ports the unit marks optional may be left out)",
                                              label, port.name, direction_word(port.inlet), port.meaning));
      }
      connect(port, connection->streams.front(), unit, node, unit_index);
    }
    flowsheet_.units.push_back(std::move(node));
  }

  // Connects one stream to a port of the unit being bound.
  void connect(const unit_host::PortInfo& port, const NamedAt& named,
               const UnitInput& unit, UnitNode& node, std::size_t unit_index) {
    const std::size_t stream = stream_named(named);
    StreamNode& node_stream = flowsheet_.streams[stream];
    if (port.inlet) {
      if (node_stream.sink_unit) {
        throw InputError(named.at,
                         fmt::format("stream '{}' already feeds {} (line {}); a stream goes to one inlet: split it "
                                     "with a splitter to feed two",
                                     node_stream.name, sink_label(node_stream), node_stream.sink_at.line));
      }
      node_stream.sink_unit = unit_index;
      node_stream.sink_port = node.inlets.size();
      node_stream.sink_at = named.at;
      node.inlet_ports.push_back(port.name);
      node.inlets.push_back(stream);
    } else {
      if (node_stream.source_unit) {
        throw InputError(named.at,
                         fmt::format("stream '{}' is already produced by {} (line {}); a stream comes from one "
                                     "outlet: give this outlet a stream of its own",
                                     node_stream.name, source_label(node_stream), node_stream.source_at.line));
      }
      if (node_stream.spec && !input().streams[*node_stream.spec].estimate) {
        throw InputError(named.at,
                         fmt::format("stream '{}' is given under 'streams' (line {}) as a feed, but {}.{} produces "
                                     "it; remove it from 'streams', or mark it 'estimate: true' if it is a starting "
                                     "estimate for a recycle",
                                     node_stream.name, node_stream.at.line, unit.name, port.name));
      }
      node_stream.source_unit = unit_index;
      node_stream.source_port = node.outlets.size();
      node_stream.source_at = named.at;
      node.outlet_ports.push_back(port.name);
      node.outlets.push_back(stream);
    }
  }

  // The unit an index names: a bound one, or the one being bound (a stream on two of its own ports).
  const UnitNode& unit_at(std::size_t index) const {
    return index < flowsheet_.units.size() ? flowsheet_.units[index] : *pending_;
  }
  std::string sink_label(const StreamNode& stream) const {
    const UnitNode& unit = unit_at(*stream.sink_unit);
    return fmt::format("{}.{}", unit.name, unit.inlet_ports[stream.sink_port]);
  }
  std::string source_label(const StreamNode& stream) const {
    const UnitNode& unit = unit_at(*stream.source_unit);
    return fmt::format("{}.{}", unit.name, unit.outlet_ports[stream.source_port]);
  }

  void check_streams() {
    for (StreamNode& stream : flowsheet_.streams) {
      if (stream.unconnected) continue;
      const StreamInput* spec = stream.spec ? &input().streams[*stream.spec] : nullptr;
      if (stream.source_unit == std::nullopt && stream.sink_unit == std::nullopt) {
        throw InputError(stream.at, fmt::format("stream '{}' is given, but no unit's port names it; connect it under "
                                                "a unit's 'ports' or remove it",
                                                stream.name));
      }
      if (stream.is_feed()) {
        if (spec == nullptr) {
          throw InputError(stream.sink_at, fmt::format("stream '{}' feeds {}, but no unit produces it and it is not "
                                                       "given under 'streams'; give its state there, or connect it to "
                                                       "an outlet",
                                                       stream.name, sink_label(stream)));
        }
        if (spec->estimate) {
          throw InputError(spec->at, fmt::format("stream '{}' is marked 'estimate: true', but no unit produces it: it "
                                                 "is a feed; remove 'estimate'",
                                                 stream.name));
        }
      }
    }
  }

  void build_given_states() {
    const unit_host::Slate& slate = flowsheet_.slate;
    for (const StreamNode& stream : flowsheet_.streams) {
      unit_host::StreamState state;
      if (stream.spec) {
        const StreamInput& spec = input().streams[*stream.spec];
        state = unit_host::empty_stream(slate);
        state.temperature = spec.temperature;
        state.pressure = spec.pressure;
        for (const PhaseInput& phase : spec.phases) {
          const std::size_t row = phase_row(slate, phase.kind, phase.solid);
          for (const ComponentFlow& flow : phase.flows) {
            const auto column = static_cast<std::size_t>(std::ranges::find(slate.components, flow.formula) -
                                                         slate.components.begin());
            state.flows[row * slate.components.size() + column] += flow.flow;
          }
        }
      }
      flowsheet_.given.push_back(std::move(state));
    }
  }

  void bind_tear_choice() {
    for (const NamedAt& tear : input().solver.tear_streams) {
      const auto found = std::ranges::find(flowsheet_.streams, tear.name, &StreamNode::name);
      if (found == flowsheet_.streams.end()) {
        std::vector<std::string> names;
        for (const StreamNode& s : flowsheet_.streams) {
          if (!s.is_feed() && !s.is_product()) names.push_back(s.name);
        }
        throw InputError(tear.at, fmt::format("tear_streams: {}", unknown_with_choices("stream", tear.name, names)));
      }
      if (found->is_feed() || found->is_product()) {
        throw InputError(tear.at, fmt::format("tear_streams: stream '{}' is a {}; a tear stream runs from one unit to "
                                              "another inside a recycle",
                                              tear.name, found->is_feed() ? "feed" : "product"));
      }
      flowsheet_.tear_choice.push_back(static_cast<std::size_t>(found - flowsheet_.streams.begin()));
    }
  }

  Flowsheet flowsheet_;
  const UnitCatalog& catalog_;
  const thermo::Database& database_;
  QuantityReader quantities_;
  const UnitNode* pending_ = nullptr;
};

}  // namespace

std::size_t Flowsheet::stream_index(std::string_view name) const {
  for (std::size_t i = 0; i < streams.size(); ++i) {
    if (streams[i].name == name) return i;
  }
  throw std::out_of_range(fmt::format("no stream '{}'", name));
}

std::string Flowsheet::port_label(std::size_t unit, bool inlet, std::size_t port) const {
  return fmt::format("{}.{}", units[unit].name, inlet ? units[unit].inlet_ports[port] : units[unit].outlet_ports[port]);
}

std::size_t phase_row(const unit_host::Slate& slate, PhaseKind kind, std::string_view solid) {
  switch (kind) {
    case PhaseKind::aqueous: return PFU_AQUEOUS_ROW;
    case PhaseKind::gas: return PFU_GAS_ROW;
    case PhaseKind::solid: break;
  }
  const auto found = std::ranges::find(slate.solids, solid);
  if (found == slate.solids.end()) throw std::out_of_range(fmt::format("no solid phase '{}' in the slate", solid));
  return PFU_FIRST_SOLID_ROW + static_cast<std::size_t>(found - slate.solids.begin());
}

std::string phase_name(const unit_host::Slate& slate, std::size_t row) {
  if (row == PFU_AQUEOUS_ROW) return "aqueous";
  if (row == PFU_GAS_ROW) return "gas";
  return slate.solids.at(row - PFU_FIRST_SOLID_ROW);
}

Flowsheet bind_flowsheet(FlowsheetInput input, const UnitCatalog& catalog, const thermo::Database& database,
                         const UnitConverter& units) {
  return Binder(std::move(input), catalog, database, units).bind();
}

std::vector<unit_host::Instance> create_instances(const Flowsheet& flowsheet) {
  std::vector<unit_host::Instance> instances;
  instances.reserve(flowsheet.units.size());
  for (const UnitNode& unit : flowsheet.units) {
    try {
      instances.push_back(unit.module.create(unit.type, unit.parameters, flowsheet.slate));
    } catch (const unit_host::CreateError& error) {
      throw InputError(unit.at, fmt::format("unit '{}' ({}, module {}) refused to be created: {}", unit.name, unit.type,
                                            unit.module.file().string(), error.what()));
    }
  }
  return instances;
}

}  // namespace protonflow::host
