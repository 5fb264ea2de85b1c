// Header-only helper for unit authors: one class per unit, one export line per module.
//
//   struct Heater {
//     static constexpr const char* type = "heater";
//     static constexpr const char* summary = "Heats a stream to a set temperature";
//     static constexpr std::array ports{protonflow::unit::inlet("feed", PFU_PHASE_AQUEOUS, "stream in"),
//                                       protonflow::unit::outlet("product", PFU_PHASE_AQUEOUS, "stream out")};
//     static constexpr std::array parameters{protonflow::unit::number("temperature", "K", 298.15, 273.15, 373.15, "outlet T")};
//     static constexpr std::array results{protonflow::unit::result("duty", "W", "heat added")};
//     Heater(const protonflow::unit::Parameters& parameters, const protonflow::unit::Slate& slate);
//     void solve(std::span<const protonflow::unit::InletState> inlets, std::span<protonflow::unit::OutletState> outlets,
//                protonflow::unit::Results& results, protonflow::unit::Warnings& warnings);
//   };
//   PROTONFLOW_EXPORT_UNITS("my-units", "0.1.0", Heater)
//
// The boundary checks parameters against their declarations (kind, bounds, choices, required)
// and inlets against their ports (shape, finite, positive T and P, non-negative flows, phases)
// before the unit sees them; it fills outlets and results with NaN and rejects an outlet the unit
// left unset. Every exception is caught and becomes a status code with its message: throw
// UnitError to choose the code. Nothing here writes to stdout or ends the process.
#pragma once

#include <protonflow/unit_abi.h>

#include <algorithm>
#include <array>
#include <charconv>
#include <cmath>
#include <concepts>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <exception>
#include <limits>
#include <new>
#include <optional>
#include <span>
#include <stdexcept>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace protonflow::unit {

// An error with the status code it should cross the boundary as.
class UnitError : public std::runtime_error {
 public:
  UnitError(pfu_status status, const std::string& message) : std::runtime_error(message), status_(status) {}
  pfu_status status() const noexcept { return status_; }

 private:
  pfu_status status_;
};

inline constexpr double unbounded = std::numeric_limits<double>::infinity();

// The header a struct of this build carries.
template <class T>
constexpr pfu_header header_for() {
  return {static_cast<std::uint16_t>(PFU_ABI_MAJOR), static_cast<std::uint16_t>(PFU_ABI_MINOR),
          static_cast<std::uint32_t>(sizeof(T))};
}

// Port, parameter and result declarations, for the static arrays of a unit class.
constexpr pfu_port inlet(const char* name, std::uint32_t phases, const char* meaning, std::uint32_t flags = 0) {
  return {header_for<pfu_port>(), name, meaning, PFU_INLET, phases, flags};
}
constexpr pfu_port outlet(const char* name, std::uint32_t phases, const char* meaning, std::uint32_t flags = 0) {
  return {header_for<pfu_port>(), name, meaning, PFU_OUTLET, phases, flags};
}
constexpr pfu_parameter number(const char* name, const char* unit, double default_value, double lower, double upper,
                               const char* meaning) {
  return {header_for<pfu_parameter>(), name, unit, meaning, PFU_NUMBER, default_value, lower, upper, nullptr, 0, nullptr};
}
// A number the host must always give.
constexpr pfu_parameter required_number(const char* name, const char* unit, double lower, double upper,
                                        const char* meaning) {
  return number(name, unit, std::numeric_limits<double>::quiet_NaN(), lower, upper, meaning);
}
// default_value nullptr: the host must give it.
constexpr pfu_parameter text(const char* name, const char* default_value, const char* meaning) {
  return {header_for<pfu_parameter>(), name, "", meaning, PFU_TEXT, 0.0, 0.0, 0.0, default_value, 0, nullptr};
}
// choices must have static storage (a static constexpr array).
constexpr pfu_parameter choice(const char* name, std::span<const char* const> choices, const char* default_value,
                               const char* meaning) {
  return {header_for<pfu_parameter>(), name,        "", meaning, PFU_CHOICE, 0.0, 0.0, 0.0, default_value,
          static_cast<std::uint32_t>(choices.size()), choices.data()};
}
constexpr pfu_result result(const char* name, const char* unit, const char* meaning) {
  return {header_for<pfu_result>(), name, unit, meaning};
}

// The components and solid phases of every stream of an instance; copied at create.
struct Slate {
  std::vector<std::string> components;
  std::vector<std::string> solids;

  std::size_t phase_count() const noexcept { return PFU_FIRST_SOLID_ROW + solids.size(); }
  std::optional<std::size_t> find_component(std::string_view formula) const {
    const auto found = std::ranges::find(components, formula);
    return found == components.end() ? std::nullopt : std::optional<std::size_t>(found - components.begin());
  }
};

// Parameter values after the boundary checked them and applied the defaults.
class Parameters {
 public:
  struct Entry {
    std::string name;
    std::uint32_t kind;
    double number;
    std::string text;
    bool given;  // set by the host rather than defaulted
  };

  explicit Parameters(std::vector<Entry> entries) : entries_(std::move(entries)) {}

  // The number of a declared number parameter; throws std::logic_error for any other name.
  double number(std::string_view name) const { return entry(name, PFU_NUMBER).number; }
  // The value of a declared text or choice parameter; throws std::logic_error for any other name.
  const std::string& text(std::string_view name) const {
    const Entry& found = entry(name, PFU_TEXT);
    return found.text;
  }
  // Whether the host set it (true) or it took its default (false).
  bool given(std::string_view name) const {
    const auto found = std::ranges::find(entries_, name, &Entry::name);
    return found != entries_.end() && found->given;
  }

 private:
  const Entry& entry(std::string_view name, std::uint32_t kind) const {
    const auto found = std::ranges::find(entries_, name, &Entry::name);
    const bool textual = found != entries_.end() && (found->kind == PFU_TEXT || found->kind == PFU_CHOICE);
    if (found == entries_.end() || (kind == PFU_NUMBER ? found->kind != PFU_NUMBER : !textual)) {
      throw std::logic_error("the unit asked for an undeclared " + std::string(kind == PFU_NUMBER ? "number" : "text") +
                             " parameter '" + std::string(name) + "'");
    }
    return *found;
  }

  std::vector<Entry> entries_;
};

// An inlet as the unit sees it; flows in mol/s, row by phase (PFU_*_ROW), column by component.
struct InletState {
  double temperature;  // K
  double pressure;     // Pa
  std::size_t component_count;
  std::span<const double> flows;

  std::span<const double> phase(std::size_t row) const { return flows.subspan(row * component_count, component_count); }
  double flow(std::size_t row, std::size_t component) const { return flows[row * component_count + component]; }
};

// An outlet the unit fills: every field starts as NaN and must be set to a finite value.
struct OutletState {
  double temperature;  // K
  double pressure;     // Pa
  std::size_t component_count;
  std::span<double> flows;

  std::span<double> phase(std::size_t row) const { return flows.subspan(row * component_count, component_count); }
  double& flow(std::size_t row, std::size_t component) const { return flows[row * component_count + component]; }
};

// The declared results of one solve, in declaration order; NaN marks one that does not apply.
class Results {
 public:
  Results(std::span<const pfu_result> declared, std::span<double> values) : declared_(declared), values_(values) {}

  double& operator[](std::size_t index) const { return values_[index]; }
  // Sets a result by its declared name; throws std::logic_error for an undeclared one.
  void set(std::string_view name, double value) const {
    for (std::size_t i = 0; i < declared_.size(); ++i) {
      if (name == declared_[i].name) {
        values_[i] = value;
        return;
      }
    }
    throw std::logic_error("the unit set an undeclared result '" + std::string(name) + "'");
  }

 private:
  std::span<const pfu_result> declared_;
  std::span<double> values_;
};

// Warnings of one solve, one line each: what the host prints for an engineer to review.
class Warnings {
 public:
  // Adds one warning; a newline inside it would split it, so it becomes a space.
  void add(std::string line) {
    std::ranges::replace(line, '\n', ' ');
    lines_.push_back(std::move(line));
  }
  const std::vector<std::string>& lines() const noexcept { return lines_; }
  void clear() noexcept { lines_.clear(); }

 private:
  std::vector<std::string> lines_;
};

// What a unit class must provide; parameters and results may be left out when there are none.
template <class T>
concept Unit = requires(T& unit, std::span<const InletState> inlets, std::span<OutletState> outlets, Results& results,
                        Warnings& warnings) {
  { T::type } -> std::convertible_to<const char*>;
  { T::summary } -> std::convertible_to<const char*>;
  { std::span<const pfu_port>(T::ports) };
  unit.solve(inlets, outlets, results, warnings);
} && std::constructible_from<T, const Parameters&, const Slate&>;

namespace detail {

template <class T>
constexpr std::span<const pfu_parameter> declared_parameters() {
  if constexpr (requires { std::span<const pfu_parameter>(T::parameters); }) {
    return T::parameters;
  } else {
    return {};
  }
}

template <class T>
constexpr std::span<const pfu_result> declared_results() {
  if constexpr (requires { std::span<const pfu_result>(T::results); }) {
    return T::results;
  } else {
    return {};
  }
}

// Writes as much of the pieces as fits, always NUL-terminated; never allocates, never throws.
inline void write_text(char* buffer, std::size_t capacity, std::initializer_list<std::string_view> pieces) noexcept {
  if (buffer == nullptr || capacity == 0) return;
  std::size_t used = 0;
  for (const std::string_view piece : pieces) {
    const std::size_t n = std::min(piece.size(), capacity - 1 - used);
    std::memcpy(buffer + used, piece.data(), n);
    used += n;
  }
  buffer[used] = '\0';
}

// Runs work and turns every exception into a status code and a message.
template <class Work>
pfu_status guarded(const char* type, char* message, std::size_t capacity, Work&& work) noexcept {
  try {
    work();
    return PFU_OK;
  } catch (const UnitError& error) {
    write_text(message, capacity, {error.what()});
    return error.status();
  } catch (const std::bad_alloc&) {
    write_text(message, capacity, {"unit '", type, "' ran out of memory"});
    return PFU_OUT_OF_MEMORY;
  } catch (const std::exception& error) {
    write_text(message, capacity, {"internal error in unit '", type, "': ", error.what()});
    return PFU_INTERNAL_ERROR;
  } catch (...) {
    write_text(message, capacity, {"internal error in unit '", type, "': an exception of unknown type"});
    return PFU_INTERNAL_ERROR;
  }
}

// Shortest text that reads back as the same double.
inline std::string format_number(double value) {
  std::array<char, 32> text{};
  const auto written = std::to_chars(text.data(), text.data() + text.size(), value);
  return std::string(text.data(), written.ptr);
}

inline void check_header(const pfu_header& header, std::size_t minimum, std::string_view what) {
  if (header.abi_major != PFU_ABI_MAJOR || header.struct_size < minimum) {
    throw UnitError(PFU_INVALID_ARGUMENT, std::string(what) + " has ABI " + std::to_string(header.abi_major) + "." +
                                              std::to_string(header.abi_minor) + " and " +
                                              std::to_string(header.struct_size) + " bytes; this module needs ABI " +
                                              std::to_string(PFU_ABI_MAJOR) + ".x and at least " +
                                              std::to_string(minimum) + " bytes");
  }
}

inline Slate copy_slate(const pfu_slate* slate) {
  if (slate == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, "create was given no slate");
  check_header(slate->header, sizeof(pfu_slate), "the slate");
  if (slate->component_count == 0) throw UnitError(PFU_INVALID_ARGUMENT, "the slate has no components");
  if (slate->components == nullptr || (slate->solid_count > 0 && slate->solids == nullptr)) {
    throw UnitError(PFU_INVALID_ARGUMENT, "the slate's component or solid list is null");
  }
  Slate copy;
  for (std::uint32_t i = 0; i < slate->component_count; ++i) {
    if (slate->components[i] == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, "a slate component is null");
    copy.components.emplace_back(slate->components[i]);
  }
  for (std::uint32_t i = 0; i < slate->solid_count; ++i) {
    if (slate->solids[i] == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, "a slate solid phase is null");
    copy.solids.emplace_back(slate->solids[i]);
  }
  return copy;
}

inline std::string list_names(std::span<const pfu_parameter> declared) {
  std::string names;
  for (const pfu_parameter& parameter : declared) {
    names += names.empty() ? "" : ", ";
    names += parameter.name;
  }
  return names.empty() ? "none" : names;
}

// Checks the host's values against the declarations and applies the defaults.
inline Parameters resolve_parameters(const char* type, std::span<const pfu_parameter> declared,
                                     const pfu_parameter_value* const* values, std::uint32_t value_count) {
  if (value_count > 0 && values == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, "create was given no parameter list");
  const std::string unit = std::string("unit '") + type + "': ";
  std::vector<const pfu_parameter_value*> given(declared.size(), nullptr);
  for (std::uint32_t i = 0; i < value_count; ++i) {
    const pfu_parameter_value* value = values[i];
    if (value == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, "create was given a null parameter value");
    check_header(value->header, sizeof(pfu_parameter_value), "a parameter value");
    if (value->name == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, "a parameter value has no name");
    const auto found = std::ranges::find_if(declared, [&](const pfu_parameter& p) { return std::strcmp(p.name, value->name) == 0; });
    if (found == declared.end()) {
      throw UnitError(PFU_INVALID_PARAMETER, unit + "unknown parameter '" + value->name + "' (known: " + list_names(declared) + ")");
    }
    const auto index = static_cast<std::size_t>(found - declared.begin());
    if (given[index] != nullptr) throw UnitError(PFU_INVALID_PARAMETER, unit + "parameter '" + value->name + "' is given twice");
    given[index] = value;
  }

  std::vector<Parameters::Entry> entries;
  entries.reserve(declared.size());
  for (std::size_t i = 0; i < declared.size(); ++i) {
    const pfu_parameter& parameter = declared[i];
    const pfu_parameter_value* value = given[i];
    const std::string name = std::string("parameter '") + parameter.name + "'";
    Parameters::Entry entry{parameter.name, parameter.kind, 0.0, {}, value != nullptr};
    if (parameter.kind == PFU_NUMBER) {
      if (value != nullptr && value->kind != PFU_NUMBER) throw UnitError(PFU_INVALID_PARAMETER, unit + name + " is a number, not text");
      entry.number = value != nullptr ? value->number : parameter.default_number;
      if (value == nullptr && std::isnan(entry.number)) throw UnitError(PFU_INVALID_PARAMETER, unit + name + " must be given");
      if (!std::isfinite(entry.number)) throw UnitError(PFU_INVALID_PARAMETER, unit + name + " is not a finite number");
      if (entry.number < parameter.lower || entry.number > parameter.upper) {
        throw UnitError(PFU_INVALID_PARAMETER, unit + name + " = " + format_number(entry.number) + " " + parameter.unit +
                                                   " is outside [" + format_number(parameter.lower) + ", " +
                                                   format_number(parameter.upper) + "] " + parameter.unit);
      }
    } else {
      if (value != nullptr && value->kind != PFU_TEXT && value->kind != PFU_CHOICE) {
        throw UnitError(PFU_INVALID_PARAMETER, unit + name + " is text, not a number");
      }
      const char* text = value != nullptr ? value->text : parameter.default_text;
      if (text == nullptr) throw UnitError(PFU_INVALID_PARAMETER, unit + name + " must be given");
      entry.text = text;
      if (parameter.kind == PFU_CHOICE) {
        const std::span<const char* const> choices(parameter.choices, parameter.choice_count);
        if (std::ranges::find(choices, entry.text) == choices.end()) {
          std::string allowed;
          for (const char* c : choices) allowed += (allowed.empty() ? "'" : ", '") + std::string(c) + "'";
          throw UnitError(PFU_INVALID_PARAMETER, unit + name + " is '" + entry.text + "'; allowed: " + allowed);
        }
      }
    }
    entries.push_back(std::move(entry));
  }
  return Parameters(std::move(entries));
}

inline const char* phase_name(std::size_t row, const Slate& slate) {
  if (row == PFU_AQUEOUS_ROW) return "aqueous";
  if (row == PFU_GAS_ROW) return "gas";
  return slate.solids[row - PFU_FIRST_SOLID_ROW].c_str();
}

inline std::uint32_t phase_bit(std::size_t row) {
  return row == PFU_AQUEOUS_ROW ? PFU_PHASE_AQUEOUS : row == PFU_GAS_ROW ? PFU_PHASE_GAS : PFU_PHASE_SOLID;
}

// where() names the stream; it is called only to word an error, so a good call allocates nothing.
template <class Where>
void check_shape(const pfu_stream_state& state, const Slate& slate, Where where) {
  if (state.header.abi_major != PFU_ABI_MAJOR || state.header.struct_size < sizeof(pfu_stream_state)) {
    check_header(state.header, sizeof(pfu_stream_state), where());  // throws, with the details
  }
  if (state.phase_count != slate.phase_count() || state.component_count != slate.components.size() ||
      state.flows == nullptr) {
    throw UnitError(PFU_INVALID_ARGUMENT, where() + " has " + std::to_string(state.phase_count) + " phases x " +
                                              std::to_string(state.component_count) +
                                              " components; the slate has " + std::to_string(slate.phase_count()) +
                                              " x " + std::to_string(slate.components.size()));
  }
}

// Rejects what no unit should compute from: a state that is not physical or a phase the port refuses.
inline InletState read_inlet(const pfu_stream_state& state, const pfu_port& port, const Slate& slate) {
  const auto where = [&] { return std::string("inlet '") + port.name + "'"; };
  check_shape(state, slate, where);
  if (!(std::isfinite(state.temperature) && state.temperature > 0.0)) {
    throw UnitError(PFU_BAD_INLET, where() + " has temperature " + format_number(state.temperature) + " K");
  }
  if (!(std::isfinite(state.pressure) && state.pressure > 0.0)) {
    throw UnitError(PFU_BAD_INLET, where() + " has pressure " + format_number(state.pressure) + " Pa");
  }
  const std::size_t columns = slate.components.size();
  const std::span<const double> flows(state.flows, slate.phase_count() * columns);
  const auto cell = [&](std::size_t k) {
    return std::string(phase_name(k / columns, slate)) + " " + slate.components[k % columns];
  };
  for (std::size_t k = 0; k < flows.size(); ++k) {
    if (!(std::isfinite(flows[k]) && flows[k] >= 0.0)) {
      throw UnitError(PFU_BAD_INLET, where() + " has flow " + format_number(flows[k]) + " mol/s of " + cell(k));
    }
    if (flows[k] > 0.0 && (port.phases & phase_bit(k / columns)) == 0) {
      throw UnitError(PFU_BAD_INLET, where() + " carries " + cell(k) + " but does not accept that phase");
    }
  }
  return {state.temperature, state.pressure, columns, flows};
}

// Rejects an outlet the unit left unset or made unphysical: a fault of the unit, not of the host.
inline void check_outlet(const OutletState& state, const pfu_port& port, const Slate& slate, const char* type) {
  const auto where = [&] { return std::string("unit '") + type + "' left outlet '" + port.name + "'"; };
  if (!(std::isfinite(state.temperature) && state.temperature > 0.0)) {
    throw UnitError(PFU_INTERNAL_ERROR, where() + " with temperature " + format_number(state.temperature) + " K");
  }
  if (!(std::isfinite(state.pressure) && state.pressure > 0.0)) {
    throw UnitError(PFU_INTERNAL_ERROR, where() + " with pressure " + format_number(state.pressure) + " Pa");
  }
  for (std::size_t k = 0; k < state.flows.size(); ++k) {
    if (!(std::isfinite(state.flows[k]) && state.flows[k] >= 0.0)) {
      throw UnitError(PFU_INTERNAL_ERROR, where() + " with flow " + format_number(state.flows[k]) + " mol/s of " +
                                              phase_name(k / state.component_count, slate) + " " +
                                              slate.components[k % state.component_count]);
    }
  }
}

// What the opaque instance pointer points to; scratch vectors are reused so a solve does not allocate.
template <class T>
struct Instance {
  Slate slate;
  T unit;
  std::vector<InletState> inlets;
  std::vector<OutletState> outlets;
  Warnings warnings;
};

template <class T>
constexpr std::size_t port_count(std::uint32_t direction) {
  return static_cast<std::size_t>(std::ranges::count(T::ports, direction, &pfu_port::direction));
}

template <Unit T>
pfu_instance* create(const pfu_parameter_value* const* values, std::uint32_t value_count, const pfu_slate* slate,
                     char* message, std::size_t message_capacity) noexcept {
  Instance<T>* instance = nullptr;
  write_text(message, message_capacity, {});
  guarded(T::type, message, message_capacity, [&] {
    Slate copy = copy_slate(slate);
    const Parameters parameters = resolve_parameters(T::type, declared_parameters<T>(), values, value_count);
    instance = new Instance<T>{copy, T(parameters, copy), {}, {}, {}};
  });
  return reinterpret_cast<pfu_instance*>(instance);
}

template <Unit T>
pfu_status solve(pfu_instance* handle, const pfu_stream_state* const* inlets, std::uint32_t inlet_count,
                 pfu_stream_state* const* outlets, std::uint32_t outlet_count, double* results,
                 std::uint32_t result_count, char* warnings, std::size_t warnings_capacity, char* message,
                 std::size_t message_capacity) noexcept {
  write_text(message, message_capacity, {});
  write_text(warnings, warnings_capacity, {});
  return guarded(T::type, message, message_capacity, [&] {
    constexpr std::size_t inlet_ports = port_count<T>(PFU_INLET);
    constexpr std::size_t outlet_ports = port_count<T>(PFU_OUTLET);
    constexpr std::span<const pfu_result> declared = declared_results<T>();
    if (handle == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, "solve was given no instance");
    if (inlet_count != inlet_ports || outlet_count != outlet_ports || result_count != declared.size()) {
      throw UnitError(PFU_INVALID_ARGUMENT, std::string("unit '") + T::type + "' takes " + std::to_string(inlet_ports) +
                                                " inlets, " + std::to_string(outlet_ports) + " outlets and " +
                                                std::to_string(declared.size()) + " results; solve was given " +
                                                std::to_string(inlet_count) + ", " + std::to_string(outlet_count) +
                                                " and " + std::to_string(result_count));
    }
    if ((inlet_count > 0 && inlets == nullptr) || (outlet_count > 0 && outlets == nullptr) ||
        (result_count > 0 && results == nullptr)) {
      throw UnitError(PFU_INVALID_ARGUMENT, "solve was given a null inlet, outlet or result array");
    }
    auto& instance = *reinterpret_cast<Instance<T>*>(handle);
    instance.inlets.clear();
    instance.outlets.clear();
    instance.warnings.clear();
    std::size_t next = 0;
    for (const pfu_port& port : T::ports) {
      if (port.direction != PFU_INLET) continue;
      if (inlets[next] == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, std::string("inlet '") + port.name + "' is null");
      instance.inlets.push_back(read_inlet(*inlets[next++], port, instance.slate));
    }
    next = 0;
    for (const pfu_port& port : T::ports) {
      if (port.direction != PFU_OUTLET) continue;
      pfu_stream_state* state = outlets[next++];
      if (state == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, std::string("outlet '") + port.name + "' is null");
      check_shape(*state, instance.slate, [&] { return std::string("outlet '") + port.name + "'"; });
      const std::span<double> flows(state->flows, instance.slate.phase_count() * instance.slate.components.size());
      std::ranges::fill(flows, std::numeric_limits<double>::quiet_NaN());
      instance.outlets.push_back({std::numeric_limits<double>::quiet_NaN(), std::numeric_limits<double>::quiet_NaN(),
                                  instance.slate.components.size(), flows});
    }
    const std::span<double> values(results, result_count);
    std::ranges::fill(values, std::numeric_limits<double>::quiet_NaN());
    Results named(declared, values);

    instance.unit.solve(std::span<const InletState>(instance.inlets), std::span<OutletState>(instance.outlets), named,
                        instance.warnings);

    next = 0;
    for (const pfu_port& port : T::ports) {
      if (port.direction != PFU_OUTLET) continue;
      const OutletState& state = instance.outlets[next];
      check_outlet(state, port, instance.slate, T::type);
      outlets[next]->temperature = state.temperature;
      outlets[next]->pressure = state.pressure;
      ++next;
    }

    std::size_t needed = 1;  // the terminating NUL
    for (const std::string& line : instance.warnings.lines()) needed += line.size() + 1;
    if (needed == 1) return;  // no warnings: the buffer, if any, already holds ""
    if (warnings == nullptr || needed > warnings_capacity) {
      throw UnitError(PFU_BUFFER_TOO_SMALL, std::string("unit '") + T::type + "': the warnings need " +
                                                std::to_string(needed) + " bytes; the buffer holds " +
                                                std::to_string(warnings == nullptr ? 0 : warnings_capacity));
    }
    std::size_t used = 0;
    for (const std::string& line : instance.warnings.lines()) {
      std::memcpy(warnings + used, line.data(), line.size());
      used += line.size();
      warnings[used++] = '\n';
    }
    warnings[used] = '\0';
  });
}

template <Unit T>
void destroy(pfu_instance* handle) noexcept {
  delete reinterpret_cast<Instance<T>*>(handle);
}

constexpr bool same_name(const char* a, const char* b) { return std::string_view(a) == std::string_view(b); }

template <class Array>
constexpr bool names_unique(const Array& items) {
  for (std::size_t i = 0; i < items.size(); ++i) {
    if (items[i].name == nullptr || *items[i].name == '\0') return false;
    for (std::size_t j = 0; j < i; ++j) {
      if (same_name(items[i].name, items[j].name)) return false;
    }
  }
  return true;
}

// Catches a bad declaration when the module compiles rather than when a host loads it.
template <class T>
constexpr bool declarations_valid() {
  for (const pfu_port& p : T::ports) {
    if (p.meaning == nullptr || (p.direction != PFU_INLET && p.direction != PFU_OUTLET)) return false;
  }
  for (const pfu_result& r : declared_results<T>()) {
    if (r.meaning == nullptr || r.unit == nullptr) return false;
  }
  for (const pfu_parameter& p : declared_parameters<T>()) {
    if (p.meaning == nullptr || p.unit == nullptr) return false;
    if (p.kind == PFU_NUMBER && !(p.lower <= p.upper)) return false;
    if (p.kind == PFU_NUMBER && p.default_number == p.default_number &&  // NaN marks "required"
        !(p.lower <= p.default_number && p.default_number <= p.upper)) {
      return false;
    }
    if (p.kind == PFU_CHOICE && p.default_text != nullptr) {
      bool listed = false;
      for (std::uint32_t i = 0; i < p.choice_count; ++i) listed = listed || same_name(p.choices[i], p.default_text);
      if (!listed) return false;
    }
  }
  return names_unique(T::ports) && names_unique(declared_parameters<T>()) && names_unique(declared_results<T>());
}

template <Unit T>
constexpr pfu_unit_class describe() {
  static_assert(declarations_valid<T>(),
                "a port, parameter or result name is empty or repeated, or a default lies outside its bounds or choices");
  constexpr std::span<const pfu_parameter> parameters = declared_parameters<T>();
  constexpr std::span<const pfu_result> results = declared_results<T>();
  return {header_for<pfu_unit_class>(),
          T::type,
          T::summary,
          static_cast<std::uint32_t>(std::size(T::ports)),
          static_cast<std::uint32_t>(parameters.size()),
          static_cast<std::uint32_t>(results.size()),
          std::data(T::ports),
          parameters.data(),
          results.data(),
          &create<T>,
          &solve<T>,
          &destroy<T>};
}

}  // namespace detail

// The class table of a module, in the order given.
template <Unit... Units>
constexpr std::array<pfu_unit_class, sizeof...(Units)> class_table() {
  return {detail::describe<Units>()...};
}

// The module table; classes must have static storage.
constexpr pfu_module module_table(const char* name, const char* version, std::span<const pfu_unit_class> classes) {
  return {header_for<pfu_module>(), name, version, static_cast<std::uint32_t>(classes.size()), classes.data()};
}

}  // namespace protonflow::unit

// Defines the module's entry symbol over the given unit classes; use once per module.
#define PROTONFLOW_EXPORT_UNITS(MODULE_NAME, MODULE_VERSION, ...)                                                 \
  extern "C" __attribute__((visibility("default"))) const pfu_module* protonflow_unit_module(void) {              \
    static constexpr auto protonflow_classes = ::protonflow::unit::class_table<__VA_ARGS__>();                   \
    static constexpr pfu_module protonflow_table =                                                                 \
        ::protonflow::unit::module_table(MODULE_NAME, MODULE_VERSION, protonflow_classes);                         \
    return &protonflow_table;                                                                                      \
  }
