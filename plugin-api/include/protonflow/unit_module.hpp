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
// A port that takes a list of streams (ABI 1.3) is declared with inlet_list or outlet_list; its
// streams arrive one after another in the port's place, and on_port(inlets, port_index(ports,
// "feed")) gives them. A class that fills series declares `static constexpr std::array series{...}`
// (unit::series) and may give `std::size_t series_length(std::size_t index) const` to fix, at
// create, how many points an instance fills (else up to max_points); solve fills them through
// results.series("name").add(x, y). A class that declares `static constexpr bool outlets_only_passes
// = true` (ABI 1.4) is told by results.outlets_only() when the host will read its outlets alone (a
// recycle's passes before the last) and may then skip its results, series and searches.
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
#include <memory>
#include <new>
#include <optional>
#include <span>
#include <stdexcept>
#include <string>
#include <string_view>
#include <type_traits>
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
  return {header_for<pfu_port>(), name, meaning, PFU_INLET, phases, flags, 0, 0};
}
constexpr pfu_port outlet(const char* name, std::uint32_t phases, const char* meaning, std::uint32_t flags = 0) {
  return {header_for<pfu_port>(), name, meaning, PFU_OUTLET, phases, flags, 0, 0};
}
// Ports that take from min_streams to max_streams streams (PFU_UNBOUNDED_STREAMS: no limit).
constexpr pfu_port inlet_list(const char* name, std::uint32_t phases, std::uint32_t min_streams, std::uint32_t max_streams,
                              const char* meaning) {
  return {header_for<pfu_port>(), name, meaning, PFU_INLET, phases, PFU_PORT_LIST, min_streams, max_streams};
}
constexpr pfu_port outlet_list(const char* name, std::uint32_t phases, std::uint32_t min_streams,
                               std::uint32_t max_streams, const char* meaning) {
  return {header_for<pfu_port>(), name, meaning, PFU_OUTLET, phases, PFU_PORT_LIST, min_streams, max_streams};
}
// A series of at most max_points points (x, y), each in its SI unit.
constexpr pfu_series series(const char* name, const char* x_name, const char* x_unit, const char* y_name,
                            const char* y_unit, std::uint32_t max_points, const char* meaning) {
  return {header_for<pfu_series>(), name, meaning, x_name, x_unit, y_name, y_unit, max_points};
}

// The index of the port called name among ports (a class's `ports` array); at compile time, a
// name that is not there does not compile.
template <class Ports>
constexpr std::size_t port_index(const Ports& ports, std::string_view name) {
  for (std::size_t i = 0; i < std::size(ports); ++i) {
    if (name == ports[i].name) return i;
  }
  throw std::logic_error("no such port");
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
  std::size_t port = 0;  // index in the class's ports of the port it came in by

  std::span<const double> phase(std::size_t row) const { return flows.subspan(row * component_count, component_count); }
  double flow(std::size_t row, std::size_t component) const { return flows[row * component_count + component]; }
};

// An outlet the unit fills: every field starts as NaN and must be set to a finite value.
struct OutletState {
  double temperature;  // K
  double pressure;     // Pa
  std::size_t component_count;
  std::span<double> flows;
  std::size_t port = 0;  // index in the class's ports of the port it leaves by

  std::span<double> phase(std::size_t row) const { return flows.subspan(row * component_count, component_count); }
  double& flow(std::size_t row, std::size_t component) const { return flows[row * component_count + component]; }
};

// The streams of one port: they come one after another in port order (a plain port has one).
template <class State>
std::span<State> on_port(std::span<State> streams, std::size_t port) {
  const auto first = std::ranges::find(streams, port, &std::remove_cv_t<State>::port);
  const auto last = std::find_if(first, streams.end(), [port](const auto& s) { return s.port != port; });
  return {first, last};
}

// One series a solve fills, point by point, into memory the host owns.
class Series {
 public:
  Series() = default;
  Series(const char* name, std::span<double> x, std::span<double> y) : name_(name), x_(x), y_(y) {}

  // Appends a point; more points than the instance's length is a fault of the unit.
  void add(double x, double y) {
    if (count_ == x_.size()) {
      throw std::logic_error(std::string("series '") + name_ + "' is full at " + std::to_string(count_) + " points");
    }
    x_[count_] = x;
    y_[count_] = y;
    ++count_;
  }
  void clear() noexcept { count_ = 0; }
  // The i-th point filled so far (i < size()).
  double x(std::size_t i) const { return x_[i]; }
  double y(std::size_t i) const { return y_[i]; }
  std::size_t size() const noexcept { return count_; }
  std::size_t capacity() const noexcept { return x_.size(); }
  const char* name() const noexcept { return name_; }

 private:
  const char* name_ = "";
  std::span<double> x_;
  std::span<double> y_;
  std::size_t count_ = 0;
};

// The declared results of one solve, in declaration order; NaN marks one that does not apply.
class Results {
 public:
  Results(std::span<const pfu_result> declared, std::span<double> values, std::span<Series> series = {},
          bool outlets_only = false)
      : declared_(declared), values_(values), series_(series), outlets_only_(outlets_only) {}

  // True on a solve whose results, series and warnings the host will not read (PFU_SOLVE_OUTLETS_ONLY,
  // given only to a class that declares outlets_only_passes): what only they need may be skipped.
  bool outlets_only() const noexcept { return outlets_only_; }

  // A declared series by name; throws std::logic_error for an undeclared one.
  Series& series(std::string_view name) const {
    for (Series& s : series_) {
      if (name == s.name()) return s;
    }
    throw std::logic_error("the unit asked for an undeclared series '" + std::string(name) + "'");
  }

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
  std::span<Series> series_;
  bool outlets_only_ = false;
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

// Whether the class honours PFU_SOLVE_OUTLETS_ONLY (ABI 1.4).
template <class T>
constexpr bool declares_outlets_only() {
  if constexpr (requires { { T::outlets_only_passes } -> std::convertible_to<bool>; }) {
    return T::outlets_only_passes;
  } else {
    return false;
  }
}

template <class T>
constexpr std::span<const pfu_series> declared_series() {
  if constexpr (requires { std::span<const pfu_series>(T::series); }) {
    return T::series;
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
  std::vector<std::uint32_t> series_lengths;  // points per declared series, fixed at create
  std::vector<Series> series;                 // the writers of the solve under way
  std::vector<double> series_scratch;         // where series go when the caller asks for none
};

template <class T>
constexpr std::size_t port_count(std::uint32_t direction) {
  return static_cast<std::size_t>(std::ranges::count(T::ports, direction, &pfu_port::direction));
}

// Points an instance fills in series index: what the unit says (series_length), or max_points.
template <class T>
std::uint32_t series_length_of(const T& unit, std::size_t index) {
  const pfu_series& declared = declared_series<T>()[index];
  std::size_t length = declared.max_points;
  if constexpr (requires { { unit.series_length(index) } -> std::convertible_to<std::size_t>; }) {
    length = unit.series_length(index);
  }
  if (length > declared.max_points) {
    throw UnitError(PFU_INTERNAL_ERROR, std::string("unit '") + T::type + "' asks for " + std::to_string(length) +
                                            " points in series '" + declared.name + "', declared with at most " +
                                            std::to_string(declared.max_points));
  }
  return static_cast<std::uint32_t>(length);
}

template <Unit T>
pfu_instance* create(const pfu_parameter_value* const* values, std::uint32_t value_count, const pfu_slate* slate,
                     char* message, std::size_t message_capacity) noexcept {
  Instance<T>* instance = nullptr;
  write_text(message, message_capacity, {});
  guarded(T::type, message, message_capacity, [&] {
    Slate copy = copy_slate(slate);
    const Parameters parameters = resolve_parameters(T::type, declared_parameters<T>(), values, value_count);
    auto made = std::make_unique<Instance<T>>(Instance<T>{copy, T(parameters, copy), {}, {}, {}, {}, {}, {}});
    constexpr std::span<const pfu_series> declared = declared_series<T>();
    std::size_t points = 0;
    for (std::size_t i = 0; i < declared.size(); ++i) {
      made->series_lengths.push_back(series_length_of(made->unit, i));
      points += made->series_lengths.back();
    }
    made->series.resize(declared.size());
    made->series_scratch.resize(2 * points);
    instance = made.release();
  });
  return reinterpret_cast<pfu_instance*>(instance);
}

// How many streams a port of this class is given, checked against what it takes. counts is one
// per port of the direction, or null for the solve of ABI 1.2, which passes one stream per port.
template <class T>
std::uint32_t streams_on_port(const pfu_port& port, const std::uint32_t* counts, std::size_t index) {
  const std::uint32_t given = counts == nullptr ? 1 : counts[index];
  const bool list = (port.flags & PFU_PORT_LIST) != 0;
  const std::uint32_t low = list ? port.min_streams : 1;
  const std::uint32_t high = list ? port.max_streams : 1;
  if (given < low || given > high) {
    std::string text = std::string("unit '") + T::type + "': port '" + port.name + "' takes ";
    text += low == high ? std::to_string(low) : std::to_string(low) + " to " + (high == PFU_UNBOUNDED_STREAMS ? "any number of" : std::to_string(high));
    text += " streams; solve was given " + std::to_string(given);
    if (counts == nullptr) text += " (the solve of unit ABI 1.2 passes one per port; a list port needs a host of ABI 1.3 or later)";
    throw UnitError(PFU_INVALID_ARGUMENT, text);
  }
  return given;
}

// Everything both solves share, once their arguments are read. Streams come port by port; counts
// (per port of each direction) may be null: one per port. series may be null: the caller wants none.
template <Unit T>
void solve_streams(Instance<T>& instance, const pfu_stream_state* const* inlets, std::uint32_t inlet_count,
                   const std::uint32_t* inlet_counts, pfu_stream_state* const* outlets, std::uint32_t outlet_count,
                   const std::uint32_t* outlet_counts, double* results, std::uint32_t result_count,
                   pfu_series_buffer* const* series, std::uint32_t series_count, char* warnings,
                   std::size_t warnings_capacity, bool outlets_only = false) {
  constexpr std::span<const pfu_result> declared = declared_results<T>();
  constexpr std::span<const pfu_series> declared_curves = declared_series<T>();
  if (result_count != declared.size() || (series_count != 0 && series_count != declared_curves.size())) {
    throw UnitError(PFU_INVALID_ARGUMENT, std::string("unit '") + T::type + "' has " + std::to_string(declared.size()) +
                                              " results and " + std::to_string(declared_curves.size()) +
                                              " series; solve was given " + std::to_string(result_count) + " and " +
                                              std::to_string(series_count));
  }
  if ((inlet_count > 0 && inlets == nullptr) || (outlet_count > 0 && outlets == nullptr) ||
      (result_count > 0 && results == nullptr) || (series_count > 0 && series == nullptr)) {
    throw UnitError(PFU_INVALID_ARGUMENT, "solve was given a null inlet, outlet, result or series array");
  }
  instance.inlets.clear();
  instance.outlets.clear();
  instance.warnings.clear();
  std::size_t next = 0;
  std::size_t port_number = 0;
  for (std::size_t p = 0; p < std::size(T::ports); ++p) {
    const pfu_port& port = T::ports[p];
    if (port.direction != PFU_INLET) continue;
    const std::uint32_t count = streams_on_port<T>(port, inlet_counts, port_number++);
    for (std::uint32_t k = 0; k < count; ++k, ++next) {
      if (next >= inlet_count) break;
      if (inlets[next] == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, std::string("inlet '") + port.name + "' is null");
      instance.inlets.push_back(read_inlet(*inlets[next], port, instance.slate));
      instance.inlets.back().port = p;
    }
  }
  if (next != inlet_count || instance.inlets.size() != inlet_count) {
    throw UnitError(PFU_INVALID_ARGUMENT, std::string("unit '") + T::type + "': the inlet ports' counts add up to " +
                                              std::to_string(next) + " streams; solve was given " + std::to_string(inlet_count));
  }
  next = 0;
  port_number = 0;
  for (std::size_t p = 0; p < std::size(T::ports); ++p) {
    const pfu_port& port = T::ports[p];
    if (port.direction != PFU_OUTLET) continue;
    const std::uint32_t count = streams_on_port<T>(port, outlet_counts, port_number++);
    for (std::uint32_t k = 0; k < count; ++k, ++next) {
      if (next >= outlet_count) break;
      pfu_stream_state* state = outlets[next];
      if (state == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, std::string("outlet '") + port.name + "' is null");
      check_shape(*state, instance.slate, [&] { return std::string("outlet '") + port.name + "'"; });
      const std::span<double> flows(state->flows, instance.slate.phase_count() * instance.slate.components.size());
      std::ranges::fill(flows, std::numeric_limits<double>::quiet_NaN());
      instance.outlets.push_back({std::numeric_limits<double>::quiet_NaN(), std::numeric_limits<double>::quiet_NaN(),
                                  instance.slate.components.size(), flows, p});
    }
  }
  if (next != outlet_count || instance.outlets.size() != outlet_count) {
    throw UnitError(PFU_INVALID_ARGUMENT, std::string("unit '") + T::type + "': the outlet ports' counts add up to " +
                                              std::to_string(next) + " streams; solve was given " + std::to_string(outlet_count));
  }
  const std::span<double> values(results, result_count);
  std::ranges::fill(values, std::numeric_limits<double>::quiet_NaN());
  std::size_t scratch = 0;
  for (std::size_t i = 0; i < declared_curves.size(); ++i) {
    const std::size_t length = instance.series_lengths[i];
    if (series_count == 0) {
      const std::span<double> room(instance.series_scratch);
      instance.series[i] = Series(declared_curves[i].name, room.subspan(scratch, length), room.subspan(scratch + length, length));
      scratch += 2 * length;
      continue;
    }
    pfu_series_buffer* buffer = series[i];
    const auto where = [&] { return std::string("the buffer of series '") + declared_curves[i].name + "'"; };
    if (buffer == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, where() + " is null");
    check_header(buffer->header, sizeof(pfu_series_buffer), where());
    if (buffer->capacity < length || (length > 0 && (buffer->x == nullptr || buffer->y == nullptr))) {
      throw UnitError(PFU_INVALID_ARGUMENT, where() + " holds " + std::to_string(buffer->capacity) +
                                                " points; this instance fills " + std::to_string(length));
    }
    buffer->count = 0;
    instance.series[i] = Series(declared_curves[i].name, std::span<double>(buffer->x, length), std::span<double>(buffer->y, length));
  }
  Results named(declared, values, std::span<Series>(instance.series), outlets_only && declares_outlets_only<T>());

  instance.unit.solve(std::span<const InletState>(instance.inlets), std::span<OutletState>(instance.outlets), named,
                      instance.warnings);

  for (std::size_t k = 0; k < instance.outlets.size(); ++k) {
    const OutletState& state = instance.outlets[k];
    check_outlet(state, T::ports[state.port], instance.slate, T::type);
    outlets[k]->temperature = state.temperature;
    outlets[k]->pressure = state.pressure;
  }
  for (std::size_t i = 0; i < series_count; ++i) series[i]->count = static_cast<std::uint32_t>(instance.series[i].size());

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
}

// The solve of ABI 1.0 to 1.2: one stream per port, no series.
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
    solve_streams(*reinterpret_cast<Instance<T>*>(handle), inlets, inlet_count, nullptr, outlets, outlet_count, nullptr,
                  results, result_count, nullptr, 0, warnings, warnings_capacity);
  });
}

// The size of a solve call of ABI 1.3, the first minor that had one: it ends before flags.
inline constexpr std::size_t solve_call_size_1_3 = offsetof(pfu_solve_call, flags);

// The solve of ABI 1.3 on: list ports and series, arguments in one extensible struct; the flags
// of 1.4 where the caller's struct has them.
template <Unit T>
pfu_status solve_call(pfu_instance* handle, const pfu_solve_call* call) noexcept {
  if (call == nullptr || call->header.abi_major != PFU_ABI_MAJOR || call->header.struct_size < solve_call_size_1_3) {
    return PFU_INVALID_ARGUMENT;  // nowhere to say why: the message buffer is in the call
  }
  write_text(call->message, call->message_capacity, {});
  write_text(call->warnings, call->warnings_capacity, {});
  return guarded(T::type, call->message, call->message_capacity, [&] {
    if (handle == nullptr) throw UnitError(PFU_INVALID_ARGUMENT, "solve was given no instance");
    if (call->inlet_counts == nullptr || call->outlet_counts == nullptr) {
      throw UnitError(PFU_INVALID_ARGUMENT, "solve was given no stream counts per port");
    }
    const std::uint32_t flags = call->header.struct_size >= offsetof(pfu_solve_call, flags) + sizeof(call->flags) ? call->flags : 0;
    if ((flags & ~static_cast<std::uint32_t>(PFU_SOLVE_KNOWN_FLAGS)) != 0) {
      char hex[16] = {};
      std::to_chars(hex, hex + sizeof hex - 1, flags & ~static_cast<std::uint32_t>(PFU_SOLVE_KNOWN_FLAGS), 16);
      throw UnitError(PFU_INVALID_ARGUMENT, std::string("unit '") + T::type + "': solve flags 0x" + hex + " are unknown to unit ABI " +
                                                std::to_string(PFU_ABI_MAJOR) + "." + std::to_string(PFU_ABI_MINOR) +
                                                "; the module needs rebuilding against a newer header");
    }
    solve_streams(*reinterpret_cast<Instance<T>*>(handle), call->inlets, call->inlet_count, call->inlet_counts,
                  call->outlets, call->outlet_count, call->outlet_counts, call->results, call->result_count,
                  call->series, call->series_count, call->warnings, call->warnings_capacity,
                  (flags & PFU_SOLVE_OUTLETS_ONLY) != 0);
  });
}

template <Unit T>
std::uint32_t series_length(const pfu_instance* handle, std::uint32_t index) noexcept {
  const auto* instance = reinterpret_cast<const Instance<T>*>(handle);
  return instance == nullptr || index >= instance->series_lengths.size() ? 0 : instance->series_lengths[index];
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
    if ((p.flags & ~static_cast<std::uint32_t>(PFU_PORT_KNOWN_FLAGS)) != 0) return false;
    if ((p.flags & PFU_PORT_LIST) != 0 && (p.max_streams < p.min_streams || p.max_streams < 1 ||
                                           p.max_streams > PFU_UNBOUNDED_STREAMS || (p.flags & PFU_PORT_OPTIONAL) != 0)) {
      return false;
    }
  }
  for (const pfu_series& s : declared_series<T>()) {
    if (s.meaning == nullptr || s.x_name == nullptr || s.x_unit == nullptr || s.y_name == nullptr ||
        s.y_unit == nullptr || s.max_points < 1) {
      return false;
    }
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
  return names_unique(T::ports) && names_unique(declared_parameters<T>()) && names_unique(declared_results<T>()) &&
         names_unique(declared_series<T>());
}

// The capabilities a class publishes: static, so the class table can point at them.
template <Unit T>
struct Capabilities {
  static constexpr std::span<const pfu_series> series = declared_series<T>();
  static constexpr pfu_series_capability series_capability{
      {header_for<pfu_series_capability>(), PFU_CAPABILITY_SERIES, 0, "series"},
      static_cast<std::uint32_t>(series.size()),
      series.data(),
      &series_length<T>};
  static constexpr pfu_capability outlets_only_capability{header_for<pfu_capability>(), PFU_CAPABILITY_OUTLETS_ONLY, 0,
                                                         "outlets only"};
  static constexpr std::array<const pfu_capability*, 2> both{&series_capability.capability, &outlets_only_capability};
  static constexpr std::array<const pfu_capability*, 1> outlets_only{&outlets_only_capability};
  static constexpr std::uint32_t count = (series.empty() ? 0 : 1) + (declares_outlets_only<T>() ? 1 : 0);
  static constexpr const pfu_capability* const* list = series.empty() ? outlets_only.data() : both.data();
};

template <Unit T>
constexpr pfu_unit_class describe() {
  static_assert(declarations_valid<T>(),
                "a port, parameter, result or series name is empty or repeated, a default lies outside its bounds or "
                "choices, or a list port's bounds or a series' declaration are invalid");
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
          &destroy<T>,
          &solve_call<T>,
          Capabilities<T>::count,
          Capabilities<T>::count == 0 ? nullptr : Capabilities<T>::list};
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
