// Host side of the unit ABI: load a module with Boost.DLL, check it, read its self-description
// into value types, and create instances that destroy themselves.
//
//   const protonflow::unit_host::Module module("units/libplain.so");   // throws LoadError
//   for (const auto& unit_class : module.classes()) std::cout << unit_class.type << "\n";
//   auto instance = module.create("heater", {{"temperature", 320.0}}, slate);  // throws CreateError
//   auto solution = instance.solve(inlets, outlets);                         // throws SolveError
//   auto listed = instance.solve(inlets, {3, 1}, outlets, {1});   // list ports: streams per port
//
// A Module is a cheap shared handle; the library stays loaded while a Module or an Instance made
// from it lives. Copying descriptors into strings means nothing here points into the module but
// its three functions. Link Boost::filesystem and ${CMAKE_DL_LIBS} (target protonflow_unit_host).
#pragma once

#include <protonflow/unit_abi.h>

#include <boost/dll/shared_library.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <filesystem>
#include <limits>
#include <memory>
#include <span>
#include <stdexcept>
#include <string>
#include <string_view>
#include <type_traits>
#include <utility>
#include <variant>
#include <vector>

namespace protonflow::unit_host {

// A module file that cannot be used: not loadable, not a unit module, or incompatible.
class LoadError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// An instance the module refused to create; what() is the module's message.
class CreateError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// A solve that returned a status other than PFU_OK; what() is the module's message.
class SolveError : public std::runtime_error {
 public:
  SolveError(pfu_status status, const std::string& message) : std::runtime_error(message), status_(status) {}
  pfu_status status() const noexcept { return status_; }

 private:
  pfu_status status_;
};

enum class ParameterKind { number = PFU_NUMBER, text = PFU_TEXT, choice = PFU_CHOICE };

struct PortInfo {
  std::string name;
  std::string meaning;
  bool inlet;
  std::uint32_t phases;  // PFU_PHASE_* bits
  bool optional = false; // may be left unconnected (ABI 1.2; false for older modules)
  bool list = false;     // takes min_streams to max_streams streams (ABI 1.3; false for older modules)
  std::uint32_t min_streams = 1;
  std::uint32_t max_streams = 1;  // PFU_UNBOUNDED_STREAMS: no limit
};

// A series a class fills at each solve (ABI 1.3).
struct SeriesInfo {
  std::string name;
  std::string meaning;
  std::string x_name;
  std::string x_unit;  // UDUNITS-2, SI
  std::string y_name;
  std::string y_unit;
  std::uint32_t max_points = 0;
};

struct ParameterInfo {
  std::string name;
  std::string unit;  // UDUNITS-2, SI; empty unless a number
  std::string meaning;
  ParameterKind kind;
  double default_number;  // NaN: required
  double lower;
  double upper;
  bool has_default_text;
  std::string default_text;
  std::vector<std::string> choices;

  bool required() const noexcept {
    return kind == ParameterKind::number ? std::isnan(default_number) : !has_default_text;
  }
};

struct ResultInfo {
  std::string name;
  std::string unit;
  std::string meaning;
};

// One unit class as its module describes it, copied into value types.
struct UnitClassInfo {
  std::string type;
  std::string summary;
  std::vector<PortInfo> ports;
  std::vector<ParameterInfo> parameters;
  std::vector<ResultInfo> results;
  std::vector<SeriesInfo> series;  // empty for modules older than ABI 1.3
  bool outlets_only = false;       // honours PFU_SOLVE_OUTLETS_ONLY (ABI 1.4 capability)

  // Ports of each direction, not streams: a list port counts once.
  std::size_t inlet_count() const { return static_cast<std::size_t>(std::ranges::count(ports, true, &PortInfo::inlet)); }
  std::size_t outlet_count() const { return ports.size() - inlet_count(); }
};

// The components and solid phases every stream of an instance carries.
struct Slate {
  std::vector<std::string> components;
  std::vector<std::string> solids;

  std::size_t phase_count() const noexcept { return PFU_FIRST_SOLID_ROW + solids.size(); }
  std::size_t flow_count() const noexcept { return phase_count() * components.size(); }
};

// A stream state; flows in mol/s as flows[row * components + component].
struct StreamState {
  double temperature = std::numeric_limits<double>::quiet_NaN();  // K
  double pressure = std::numeric_limits<double>::quiet_NaN();     // Pa
  std::vector<double> flows;
};

// A stream of the slate's shape with zero flows and T, P not yet set.
inline StreamState empty_stream(const Slate& slate) { return {.flows = std::vector<double>(slate.flow_count(), 0.0)}; }

struct ParameterValue {
  std::string name;
  std::variant<double, std::string> value;
};

// One series as a solve filled it.
struct SeriesValues {
  std::vector<double> x;
  std::vector<double> y;
};

// What one solve reports besides its outlets.
struct Solution {
  std::vector<double> results;        // in the class's declared order
  std::vector<std::string> warnings;  // one line each
  std::vector<SeriesValues> series;   // in the class's declared order
};

namespace detail {

inline std::string version_text(unsigned major, unsigned minor) {
  return std::to_string(major) + "." + std::to_string(minor);
}

inline std::string hex_text(std::uint32_t value) {
  std::array<char, 8> digits{};
  std::size_t first = digits.size();
  do {
    digits[--first] = "0123456789abcdef"[value % 16];
    value /= 16;
  } while (value != 0 && first > 0);
  return std::string(digits.data() + first, digits.size() - first);
}

// Bytes this host must be able to read from a struct whose header says minor: the whole struct,
// except where an older minor's layout ended earlier.
template <class T>
constexpr std::size_t minimum_size(unsigned minor) {
  if constexpr (std::is_same_v<T, pfu_parameter>) {
    if (minor < 1) return offsetof(pfu_parameter, choice_count);
  }
  if constexpr (std::is_same_v<T, pfu_port>) {
    if (minor < 2) return offsetof(pfu_port, flags);
    if (minor < 3) return offsetof(pfu_port, min_streams);
  }
  if constexpr (std::is_same_v<T, pfu_unit_class>) {
    if (minor < 3) return offsetof(pfu_unit_class, solve_call);
  }
  return sizeof(T);
}

// Zeroes the fields a struct of an earlier minor did not have (what a copy of its struct_size
// bytes put there is padding, or nothing).
template <class T>
void clear_later_fields(T& value, unsigned minor) {
  if constexpr (std::is_same_v<T, pfu_parameter>) {
    if (minor < 1) {
      value.choice_count = 0;
      value.choices = nullptr;
    }
  }
  if constexpr (std::is_same_v<T, pfu_port>) {
    if (minor < 2) value.flags = 0;
    if (minor < 3) value.min_streams = value.max_streams = 0;
  }
  if constexpr (std::is_same_v<T, pfu_unit_class>) {
    if (minor < 3) {
      value.solve_call = nullptr;
      value.capability_count = 0;
      value.capabilities = nullptr;
    }
  }
}

// Reads a struct of any minor of our major: the fields both sides know, zero for the rest.
template <class T>
T read_struct(const void* address, const std::string& file, const std::string& what) {
  pfu_header header;
  std::memcpy(&header, address, sizeof header);
  if (header.abi_major != PFU_ABI_MAJOR) {
    throw LoadError(file + ": " + what + " was built for unit ABI " + version_text(header.abi_major, header.abi_minor) +
                    "; this host speaks unit ABI " + version_text(PFU_ABI_MAJOR, PFU_ABI_MINOR) +
                    " and loads only modules of major version " + std::to_string(PFU_ABI_MAJOR));
  }
  const std::size_t minimum = minimum_size<T>(std::min<unsigned>(header.abi_minor, PFU_ABI_MINOR));
  if (header.struct_size < minimum) {
    throw LoadError(file + ": " + what + " is truncated: its struct_size is " + std::to_string(header.struct_size) +
                    " bytes, and unit ABI " + version_text(header.abi_major, header.abi_minor) + " needs at least " +
                    std::to_string(minimum));
  }
  T value{};
  std::memcpy(&value, address, std::min<std::size_t>(header.struct_size, sizeof(T)));
  clear_later_fields(value, header.abi_minor);
  return value;
}

// Reads an array whose elements are stepped through by the first element's struct_size.
template <class T>
std::vector<T> read_array(const T* first, std::uint32_t count, const std::string& file, const std::string& what) {
  std::vector<T> values;
  if (count == 0) return values;
  if (first == nullptr) throw LoadError(file + ": " + what + " has " + std::to_string(count) + " entries at a null address");
  const auto* bytes = reinterpret_cast<const unsigned char*>(first);
  const T head = read_struct<T>(bytes, file, what + " 1");
  const std::size_t stride = head.header.struct_size;
  values.push_back(head);
  for (std::uint32_t i = 1; i < count; ++i) {
    const std::string item = what + " " + std::to_string(i + 1);
    values.push_back(read_struct<T>(bytes + i * stride, file, item));
    if (values.back().header.struct_size != stride) {
      throw LoadError(file + ": " + item + " has struct_size " + std::to_string(values.back().header.struct_size) +
                      " but the first has " + std::to_string(stride) + "; an array's elements must be one size");
    }
  }
  return values;
}

inline std::string required_text(const char* text, const std::string& file, const std::string& what) {
  if (text == nullptr) throw LoadError(file + ": " + what + " is null");
  return text;
}

inline PortInfo read_port(const pfu_port& port, const std::string& file, const std::string& where) {
  PortInfo info{required_text(port.name, file, where + " port name"), "", port.direction == PFU_INLET, port.phases,
                (port.flags & PFU_PORT_OPTIONAL) != 0};
  const std::string what = where + " port '" + info.name + "'";
  info.meaning = required_text(port.meaning, file, what + " meaning");
  if (port.direction != PFU_INLET && port.direction != PFU_OUTLET) {
    throw LoadError(file + ": " + what + " has direction " + std::to_string(port.direction) + ", neither inlet nor outlet");
  }
  // A flag of a later minor asks something of the host that this host cannot guess: refuse it.
  const std::uint32_t unknown = port.flags & ~static_cast<std::uint32_t>(PFU_PORT_KNOWN_FLAGS);
  if (unknown != 0) {
    throw LoadError(file + ": " + what + " has port flags 0x" + hex_text(unknown) + " unknown to unit ABI " +
                    version_text(PFU_ABI_MAJOR, PFU_ABI_MINOR) + "; it needs a newer host");
  }
  if ((port.flags & PFU_PORT_LIST) != 0) {
    info.list = true;
    info.min_streams = port.min_streams;
    info.max_streams = port.max_streams;
    if (info.optional) {
      throw LoadError(file + ": " + what + " is both optional and a list; a list port says by min_streams 0 that it may stay unconnected");
    }
    if (port.max_streams < 1 || port.max_streams < port.min_streams || port.max_streams > PFU_UNBOUNDED_STREAMS) {
      throw LoadError(file + ": " + what + " is a list port of " + std::to_string(port.min_streams) + " to " +
                      std::to_string(port.max_streams) + " streams; max_streams must be at least 1 and min_streams");
    }
  }
  return info;
}

inline SeriesInfo read_series(const pfu_series& series, const std::string& file, const std::string& where) {
  SeriesInfo info;
  info.name = required_text(series.name, file, where + " series name");
  const std::string what = where + " series '" + info.name + "'";
  info.meaning = required_text(series.meaning, file, what + " meaning");
  info.x_name = required_text(series.x_name, file, what + " x name");
  info.x_unit = required_text(series.x_unit, file, what + " x unit");
  info.y_name = required_text(series.y_name, file, what + " y name");
  info.y_unit = required_text(series.y_unit, file, what + " y unit");
  info.max_points = series.max_points;
  if (info.max_points < 1) throw LoadError(file + ": " + what + " has max_points 0");
  return info;
}

inline ParameterInfo read_parameter(const pfu_parameter& parameter, const std::string& file, const std::string& where) {
  ParameterInfo info{};
  info.name = required_text(parameter.name, file, where + " parameter name");
  const std::string what = where + " parameter '" + info.name + "'";
  info.unit = required_text(parameter.unit, file, what + " unit");
  info.meaning = required_text(parameter.meaning, file, what + " meaning");
  info.default_number = parameter.default_number;
  info.lower = parameter.lower;
  info.upper = parameter.upper;
  info.has_default_text = parameter.default_text != nullptr;
  info.default_text = info.has_default_text ? parameter.default_text : "";
  switch (parameter.kind) {
    case PFU_NUMBER:
      info.kind = ParameterKind::number;
      if (!(parameter.lower <= parameter.upper)) {
        throw LoadError(file + ": " + what + " has lower bound above upper bound");
      }
      break;
    case PFU_TEXT: info.kind = ParameterKind::text; break;
    case PFU_CHOICE:
      info.kind = ParameterKind::choice;
      if (parameter.choice_count == 0 || parameter.choices == nullptr) {
        throw LoadError(file + ": " + what + " is a choice without a list of choices");
      }
      for (std::uint32_t i = 0; i < parameter.choice_count; ++i) {
        info.choices.push_back(required_text(parameter.choices[i], file, what + " choice"));
      }
      break;
    default:
      throw LoadError(file + ": " + what + " has kind " + std::to_string(parameter.kind) + ", unknown to unit ABI " +
                      version_text(PFU_ABI_MAJOR, PFU_ABI_MINOR));
  }
  return info;
}

// A loaded module: the library, its checked self-description and its functions.
struct LoadedModule {
  struct Functions {
    pfu_create_fn create;
    pfu_solve_fn solve;
    pfu_destroy_fn destroy;
    pfu_solve_call_fn solve_call;          // ABI 1.3; null for older modules
    pfu_series_length_fn series_length;    // null: every series up to its max_points
  };

  boost::dll::shared_library library;  // first member, so it is unloaded last
  std::filesystem::path file;
  std::string name;
  std::string version;
  unsigned abi_major;
  unsigned abi_minor;
  std::vector<UnitClassInfo> classes;
  std::vector<Functions> functions;  // parallel to classes
};

// Boost.DLL puts dlerror's text inside its own; the host wants only dlerror's.
inline std::string loader_reason(const std::string& text) {
  const std::string_view marker = "(dlerror system message: ";
  const std::size_t start = text.find(marker);
  const std::size_t end = text.rfind(')');
  if (start == std::string::npos || end == std::string::npos || end < start) return text;
  return text.substr(start + marker.size(), end - start - marker.size());
}

inline std::shared_ptr<const LoadedModule> load(const std::filesystem::path& file) {
  auto module = std::make_shared<LoadedModule>();
  module->file = file;
  const std::string name = file.string();
  try {
    // rtld_now: a module with an unresolved symbol fails here, with a message, not in mid-solve.
    module->library.load(boost::dll::fs::path(name), boost::dll::load_mode::rtld_now | boost::dll::load_mode::rtld_local);
  } catch (const std::exception& error) {
    throw LoadError("cannot load unit module " + name + ": " + loader_reason(error.what()));
  }
  if (!module->library.has(pfu_entry_symbol())) {
    throw LoadError(name + " is not a protonflow unit module: it exports no entry symbol '" +
                    std::string(pfu_entry_symbol()) + "'");
  }
  const auto& entry = module->library.get<const pfu_module*()>(pfu_entry_symbol());
  const pfu_module* table_address = entry();
  if (table_address == nullptr) throw LoadError(name + ": the entry symbol returned no module table");
  const pfu_module table = read_struct<pfu_module>(table_address, name, "the module table");
  module->abi_major = table.header.abi_major;
  module->abi_minor = table.header.abi_minor;
  module->name = required_text(table.name, name, "the module name");
  module->version = required_text(table.version, name, "the module version");

  const std::vector<pfu_unit_class> classes = read_array(table.classes, table.class_count, name, "unit class descriptor");
  for (std::size_t i = 0; i < classes.size(); ++i) {
    const pfu_unit_class& raw = classes[i];
    UnitClassInfo info;
    info.type = required_text(raw.type, name, "unit class descriptor " + std::to_string(i + 1) + " type");
    const std::string where = "unit '" + info.type + "'";
    if (info.type.empty()) throw LoadError(name + ": unit class descriptor " + std::to_string(i + 1) + " has an empty type");
    if (std::ranges::find(module->classes, info.type, &UnitClassInfo::type) != module->classes.end()) {
      throw LoadError(name + ": " + where + " is described twice");
    }
    info.summary = required_text(raw.summary, name, where + " summary");
    if (raw.create == nullptr || raw.solve == nullptr || raw.destroy == nullptr) {
      throw LoadError(name + ": " + where + " lacks its create, solve or destroy function");
    }
    for (const pfu_port& port : read_array(raw.ports, raw.port_count, name, where + " port")) {
      info.ports.push_back(read_port(port, name, where));
    }
    for (const pfu_parameter& parameter : read_array(raw.parameters, raw.parameter_count, name, where + " parameter")) {
      info.parameters.push_back(read_parameter(parameter, name, where));
    }
    for (const pfu_result& result : read_array(raw.results, raw.result_count, name, where + " result")) {
      const std::string result_name = required_text(result.name, name, where + " result name");
      const std::string what = where + " result '" + result_name + "'";
      info.results.push_back(
          {result_name, required_text(result.unit, name, what + " unit"), required_text(result.meaning, name, what + " meaning")});
    }
    // Capabilities (ABI 1.3): read those this host knows, refuse an unknown one the class requires.
    pfu_series_length_fn series_length = nullptr;
    if (raw.capability_count > 0 && raw.capabilities == nullptr) {
      throw LoadError(name + ": " + where + " has " + std::to_string(raw.capability_count) + " capabilities at a null address");
    }
    for (std::uint32_t c = 0; c < raw.capability_count; ++c) {
      const std::string item = where + " capability " + std::to_string(c + 1);
      if (raw.capabilities[c] == nullptr) throw LoadError(name + ": " + item + " is null");
      const pfu_capability capability = read_struct<pfu_capability>(raw.capabilities[c], name, item);
      std::string label = "without a name";
      if (capability.name != nullptr) label = std::string("'").append(capability.name).append("'");
      if (capability.id == PFU_CAPABILITY_SERIES) {
        const pfu_series_capability series = read_struct<pfu_series_capability>(raw.capabilities[c], name, item);
        for (const pfu_series& s : read_array(series.series, series.series_count, name, where + " series")) {
          info.series.push_back(read_series(s, name, where));
        }
        series_length = series.length;
      } else if (capability.id == PFU_CAPABILITY_OUTLETS_ONLY) {
        info.outlets_only = true;
      } else if ((capability.flags & PFU_CAPABILITY_REQUIRED) != 0) {
        throw LoadError(name + ": " + where + " needs capability " + label + " (id " + std::to_string(capability.id) +
                        "), which unit ABI " + version_text(PFU_ABI_MAJOR, PFU_ABI_MINOR) +
                        " does not know; it needs a newer host");
      }
    }
    for (std::size_t s = 0; s < info.series.size(); ++s) {
      for (std::size_t t = 0; t < s; ++t) {
        if (info.series[s].name == info.series[t].name) throw LoadError(name + ": " + where + " declares series '" + info.series[s].name + "' twice");
      }
    }
    const bool lists = std::ranges::any_of(info.ports, &PortInfo::list);
    if (raw.solve_call == nullptr && (lists || !info.series.empty())) {
      throw LoadError(name + ": " + where + " has list ports or series but no solve_call");
    }
    module->classes.push_back(std::move(info));
    module->functions.push_back({raw.create, raw.solve, raw.destroy, raw.solve_call, series_length});
  }
  return module;
}

inline std::vector<std::string> split_lines(std::string_view text) {
  std::vector<std::string> lines;
  while (!text.empty()) {
    const std::size_t end = text.find('\n');
    lines.emplace_back(text.substr(0, end));
    text = end == std::string_view::npos ? std::string_view{} : text.substr(end + 1);
  }
  return lines;
}

// The header a struct of this host carries.
template <class T>
pfu_header header_for() {
  return {static_cast<std::uint16_t>(PFU_ABI_MAJOR), static_cast<std::uint16_t>(PFU_ABI_MINOR),
          static_cast<std::uint32_t>(sizeof(T))};
}

}  // namespace detail

// One unit instance; destroyed when this handle is. Use from one thread at a time.
class Instance {
 public:
  Instance(const Instance&) = delete;
  Instance& operator=(const Instance&) = delete;
  Instance(Instance&& other) noexcept { swap(other); }
  Instance& operator=(Instance&& other) noexcept {
    Instance moved(std::move(other));
    swap(moved);
    return *this;
  }
  ~Instance() {
    if (handle_ != nullptr) module_->functions[index_].destroy(handle_);
  }

  const UnitClassInfo& unit_class() const { return module_->classes[index_]; }
  const Slate& slate() const noexcept { return slate_; }

  // Points the instance fills in each of its class's series at every solve, fixed at create.
  const std::vector<std::uint32_t>& series_lengths() const noexcept { return series_lengths_; }

  // Solves once with one stream per port; outlets are resized to the slate. Throws SolveError for
  // a non-ok status.
  Solution solve(std::span<const StreamState> inlets, std::span<StreamState> outlets) {
    const UnitClassInfo& info = unit_class();
    if (inlets.size() != info.inlet_count() || outlets.size() != info.outlet_count()) {
      throw std::invalid_argument("unit '" + info.type + "' takes " + std::to_string(info.inlet_count()) + " inlets and " +
                                  std::to_string(info.outlet_count()) + " outlets");
    }
    inlet_counts_.assign(info.inlet_count(), 1);
    outlet_counts_.assign(info.outlet_count(), 1);
    return solve_streams(inlets, outlets);
  }

  // Solves once with the streams of each port one after another, port by port: inlet_counts[p]
  // streams for the p-th inlet port (list ports take their bounds, other ports one), likewise for
  // outlets. Throws std::invalid_argument for counts the class does not take. With outlets_only
  // (a pass of an iteration whose outlets alone are read), a class with the outlets-only
  // capability may leave its results, series and warnings out; any other class solves in full.
  Solution solve(std::span<const StreamState> inlets, std::span<const std::uint32_t> inlet_counts,
                 std::span<StreamState> outlets, std::span<const std::uint32_t> outlet_counts, bool outlets_only = false) {
    const UnitClassInfo& info = unit_class();
    check_counts(true, inlet_counts, inlets.size());
    check_counts(false, outlet_counts, outlets.size());
    inlet_counts_.assign(inlet_counts.begin(), inlet_counts.end());
    outlet_counts_.assign(outlet_counts.begin(), outlet_counts.end());
    const bool one_each = std::ranges::all_of(inlet_counts_, [](std::uint32_t n) { return n == 1; }) &&
                          std::ranges::all_of(outlet_counts_, [](std::uint32_t n) { return n == 1; });
    if (module_->functions[index_].solve_call == nullptr && !one_each) {
      throw std::invalid_argument("unit '" + info.type + "' is of unit ABI " +
                                  detail::version_text(module_->abi_major, module_->abi_minor) +
                                  ", which passes one stream per port");
    }
    return solve_streams(inlets, outlets, outlets_only && info.outlets_only ? static_cast<std::uint32_t>(PFU_SOLVE_OUTLETS_ONLY) : 0u);
  }

 private:
  friend class Module;
  Instance() = default;

  void check_counts(bool inlet, std::span<const std::uint32_t> counts, std::size_t streams) const {
    const UnitClassInfo& info = unit_class();
    const std::string kind = inlet ? "inlet" : "outlet";
    const std::size_t ports = inlet ? info.inlet_count() : info.outlet_count();
    if (counts.size() != ports) {
      throw std::invalid_argument("unit '" + info.type + "' has " + std::to_string(ports) + " " + kind + " ports; " +
                                  std::to_string(counts.size()) + " stream counts were given");
    }
    std::size_t total = 0;
    std::size_t p = 0;
    for (const PortInfo& port : info.ports) {
      if (port.inlet != inlet) continue;
      const std::uint32_t n = counts[p++];
      total += n;
      const std::uint32_t low = port.list ? port.min_streams : 1;
      const std::uint32_t high = port.list ? port.max_streams : 1;
      if (n < low || n > high) {
        throw std::invalid_argument("port '" + port.name + "' of unit '" + info.type + "' takes " +
                                    (low == high ? std::to_string(low)
                                                 : std::to_string(low) + " to " +
                                                       (high == PFU_UNBOUNDED_STREAMS ? "any number of" : std::to_string(high))) +
                                    " streams, not " + std::to_string(n));
      }
    }
    if (total != streams) {
      throw std::invalid_argument("the " + kind + " counts of unit '" + info.type + "' add up to " + std::to_string(total) +
                                  " streams; " + std::to_string(streams) + " were given");
    }
  }

  Solution solve_streams(std::span<const StreamState> inlets, std::span<StreamState> outlets, std::uint32_t flags = 0) {
    const UnitClassInfo& info = unit_class();
    const auto state = [&](const StreamState& stream) {
      // The ABI promises that a module never writes through an inlet's flows.
      return pfu_stream_state{detail::header_for<pfu_stream_state>(), stream.temperature, stream.pressure,
                              static_cast<std::uint32_t>(slate_.phase_count()),
                              static_cast<std::uint32_t>(slate_.components.size()), const_cast<double*>(stream.flows.data())};
    };
    inlet_states_.clear();
    outlet_states_.clear();
    for (const StreamState& inlet : inlets) {
      if (inlet.flows.size() != slate_.flow_count()) {
        throw std::invalid_argument("an inlet of unit '" + info.type + "' has " + std::to_string(inlet.flows.size()) +
                                    " flows; the slate needs " + std::to_string(slate_.flow_count()));
      }
      inlet_states_.push_back(state(inlet));
    }
    for (StreamState& outlet : outlets) {
      outlet.flows.assign(slate_.flow_count(), 0.0);
      outlet_states_.push_back(state(outlet));
    }
    inlet_pointers_.clear();
    outlet_pointers_.clear();
    for (const pfu_stream_state& s : inlet_states_) inlet_pointers_.push_back(&s);
    for (pfu_stream_state& s : outlet_states_) outlet_pointers_.push_back(&s);

    Solution solution{std::vector<double>(info.results.size()), {}, std::vector<SeriesValues>(info.series.size())};
    series_buffers_.clear();
    series_pointers_.clear();
    for (std::size_t i = 0; i < info.series.size(); ++i) {
      solution.series[i].x.assign(series_lengths_[i], 0.0);
      solution.series[i].y.assign(series_lengths_[i], 0.0);
      series_buffers_.push_back({detail::header_for<pfu_series_buffer>(), series_lengths_[i], 0, solution.series[i].x.data(),
                                 solution.series[i].y.data()});
    }
    for (pfu_series_buffer& buffer : series_buffers_) series_pointers_.push_back(&buffer);
    const detail::LoadedModule::Functions& functions = module_->functions[index_];
    pfu_status status = PFU_BUFFER_TOO_SMALL;
    // A solve is repeatable, so warnings that did not fit are had by solving again with more room.
    for (int attempt = 0; attempt < 16 && status == PFU_BUFFER_TOO_SMALL; ++attempt) {
      if (attempt > 0) warnings_.resize(warnings_.size() * 2);
      if (functions.solve_call != nullptr) {
        const pfu_solve_call call{detail::header_for<pfu_solve_call>(),
                                  inlet_pointers_.data(),
                                  outlet_pointers_.data(),
                                  inlet_counts_.data(),
                                  outlet_counts_.data(),
                                  static_cast<std::uint32_t>(inlet_pointers_.size()),
                                  static_cast<std::uint32_t>(outlet_pointers_.size()),
                                  solution.results.data(),
                                  static_cast<std::uint32_t>(solution.results.size()),
                                  static_cast<std::uint32_t>(series_pointers_.size()),
                                  series_pointers_.data(),
                                  warnings_.data(),
                                  warnings_.size(),
                                  message_.data(),
                                  message_.size(),
                                  flags};
        status = functions.solve_call(handle_, &call);
      } else {
        status = functions.solve(handle_, inlet_pointers_.data(), static_cast<std::uint32_t>(inlet_pointers_.size()),
                                 outlet_pointers_.data(), static_cast<std::uint32_t>(outlet_pointers_.size()),
                                 solution.results.data(), static_cast<std::uint32_t>(solution.results.size()),
                                 warnings_.data(), warnings_.size(), message_.data(), message_.size());
      }
    }
    if (status != PFU_OK) throw SolveError(status, message_text(std::string("solve failed: ") + pfu_status_name(status)));
    for (std::size_t i = 0; i < outlets.size(); ++i) {
      outlets[i].temperature = outlet_states_[i].temperature;
      outlets[i].pressure = outlet_states_[i].pressure;
    }
    for (std::size_t i = 0; i < series_buffers_.size(); ++i) {
      const std::uint32_t count = series_buffers_[i].count;
      if (count > series_lengths_[i]) {
        throw SolveError(PFU_INTERNAL_ERROR, "unit '" + info.type + "' wrote " + std::to_string(count) + " points into series '" +
                                                 info.series[i].name + "', which holds " + std::to_string(series_lengths_[i]));
      }
      solution.series[i].x.resize(count);
      solution.series[i].y.resize(count);
    }
    solution.warnings = detail::split_lines(
        std::string_view(warnings_.data(), std::find(warnings_.begin(), warnings_.end(), '\0') - warnings_.begin()));
    return solution;
  }

  void swap(Instance& other) noexcept {
    std::swap(module_, other.module_);
    std::swap(index_, other.index_);
    std::swap(handle_, other.handle_);
    std::swap(slate_, other.slate_);
    std::swap(inlet_states_, other.inlet_states_);
    std::swap(outlet_states_, other.outlet_states_);
    std::swap(inlet_pointers_, other.inlet_pointers_);
    std::swap(outlet_pointers_, other.outlet_pointers_);
    std::swap(message_, other.message_);
    std::swap(warnings_, other.warnings_);
    std::swap(series_lengths_, other.series_lengths_);
    std::swap(inlet_counts_, other.inlet_counts_);
    std::swap(outlet_counts_, other.outlet_counts_);
    std::swap(series_buffers_, other.series_buffers_);
    std::swap(series_pointers_, other.series_pointers_);
  }

  // The module's message; a module that forgot the terminating NUL is cut at the buffer's end.
  std::string message_text(const std::string& fallback) const {
    const std::string text(message_.data(), std::find(message_.begin(), message_.end(), '\0') - message_.begin());
    return text.empty() ? fallback : text;
  }

  std::shared_ptr<const detail::LoadedModule> module_;  // keeps the module loaded while the instance lives
  std::size_t index_ = 0;
  pfu_instance* handle_ = nullptr;
  Slate slate_;
  // Scratch reused between solves.
  std::vector<pfu_stream_state> inlet_states_;
  std::vector<pfu_stream_state> outlet_states_;
  std::vector<const pfu_stream_state*> inlet_pointers_;
  std::vector<pfu_stream_state*> outlet_pointers_;
  std::vector<char> message_;   // sized by Module::create, so a move allocates nothing
  std::vector<char> warnings_;
  std::vector<std::uint32_t> series_lengths_;  // per declared series, read at create
  std::vector<std::uint32_t> inlet_counts_;
  std::vector<std::uint32_t> outlet_counts_;
  std::vector<pfu_series_buffer> series_buffers_;
  std::vector<pfu_series_buffer*> series_pointers_;
};

// A checked unit module. Copies share one loaded library.
class Module {
 public:
  // Loads and checks file; throws LoadError naming the file and what is wrong.
  explicit Module(const std::filesystem::path& file) : module_(detail::load(file)) {}

  const std::filesystem::path& file() const noexcept { return module_->file; }
  const std::string& name() const noexcept { return module_->name; }
  const std::string& version() const noexcept { return module_->version; }
  // The ABI version the module was built against.
  unsigned abi_major() const noexcept { return module_->abi_major; }
  unsigned abi_minor() const noexcept { return module_->abi_minor; }
  const std::vector<UnitClassInfo>& classes() const noexcept { return module_->classes; }

  // The class of that type, or nullptr.
  const UnitClassInfo* find(std::string_view type) const {
    const auto found = std::ranges::find(module_->classes, type, &UnitClassInfo::type);
    return found == module_->classes.end() ? nullptr : &*found;
  }

  // Creates an instance; throws std::invalid_argument for an unknown type, CreateError if the module refuses.
  Instance create(std::string_view type, std::span<const ParameterValue> parameters, const Slate& slate) const {
    const UnitClassInfo* info = find(type);
    if (info == nullptr) {
      std::string known;
      for (const UnitClassInfo& c : module_->classes) known += (known.empty() ? "" : ", ") + c.type;
      throw std::invalid_argument("module " + file().string() + " has no unit type '" + std::string(type) +
                                  "' (it has: " + known + ")");
    }
    std::vector<pfu_parameter_value> values;
    for (const ParameterValue& parameter : parameters) {
      pfu_parameter_value value{detail::header_for<pfu_parameter_value>(), parameter.name.c_str(), PFU_NUMBER, 0.0, nullptr};
      if (const double* number = std::get_if<double>(&parameter.value)) {
        value.number = *number;
      } else {
        value.kind = PFU_TEXT;
        value.text = std::get<std::string>(parameter.value).c_str();
      }
      values.push_back(value);
    }
    std::vector<const pfu_parameter_value*> value_pointers;
    for (const pfu_parameter_value& value : values) value_pointers.push_back(&value);
    std::vector<const char*> components;
    std::vector<const char*> solids;
    for (const std::string& c : slate.components) components.push_back(c.c_str());
    for (const std::string& s : slate.solids) solids.push_back(s.c_str());
    const pfu_slate raw_slate{detail::header_for<pfu_slate>(), static_cast<std::uint32_t>(components.size()),
                              static_cast<std::uint32_t>(solids.size()), components.data(), solids.data()};

    Instance instance;
    instance.module_ = module_;
    instance.index_ = static_cast<std::size_t>(info - module_->classes.data());
    instance.slate_ = slate;
    instance.message_.assign(1024, '\0');
    instance.warnings_.assign(4096, '\0');
    instance.handle_ = module_->functions[instance.index_].create(
        value_pointers.data(), static_cast<std::uint32_t>(value_pointers.size()), &raw_slate, instance.message_.data(),
        instance.message_.size());
    if (instance.handle_ == nullptr) {
      throw CreateError(instance.message_text("unit '" + info->type + "' refused to be created and said nothing"));
    }
    const pfu_series_length_fn length = module_->functions[instance.index_].series_length;
    for (std::uint32_t i = 0; i < info->series.size(); ++i) {
      const std::uint32_t points = length != nullptr ? length(instance.handle_, i) : info->series[i].max_points;
      if (points > info->series[i].max_points) {
        throw CreateError("unit '" + info->type + "' asks for " + std::to_string(points) + " points in series '" +
                          info->series[i].name + "', declared with at most " + std::to_string(info->series[i].max_points));
      }
      instance.series_lengths_.push_back(points);
    }
    return instance;
  }

 private:
  std::shared_ptr<const detail::LoadedModule> module_;
};

}  // namespace protonflow::unit_host
