// `protonflow units [--unit-dir DIR]...`: every unit type on the search path, as its module
// describes it — no instance is created.
#include <cmath>
#include <ostream>

#include <fmt/format.h>

#include "flowsheet_commands.hpp"
#include "flowsheet_session.hpp"
#include "module_search.hpp"

namespace protonflow::host {
namespace {

std::string phases_text(std::uint32_t phases) {
  std::vector<std::string> names;
  if (phases & PFU_PHASE_AQUEOUS) names.emplace_back("aqueous");
  if (phases & PFU_PHASE_GAS) names.emplace_back("gas");
  if (phases & PFU_PHASE_SOLID) names.emplace_back("solids");
  return names.empty() ? "none" : fmt::format("{}", fmt::join(names, ", "));
}

std::string number_text(double value) {
  if (std::isinf(value)) return value > 0 ? "inf" : "-inf";
  return fmt::format("{:g}", value);
}

std::string unit_text(const std::string& unit) { return unit.empty() ? "-" : unit; }

std::string default_text(const unit_host::ParameterInfo& parameter) {
  if (parameter.required()) return "(required)";
  if (parameter.kind == unit_host::ParameterKind::number) return number_text(parameter.default_number);
  return parameter.default_text.empty() ? "\"\"" : parameter.default_text;
}

std::string range_text(const unit_host::ParameterInfo& parameter) {
  switch (parameter.kind) {
    case unit_host::ParameterKind::number:
      return fmt::format("[{}, {}]", number_text(parameter.lower), number_text(parameter.upper));
    case unit_host::ParameterKind::choice: return fmt::format("one of: {}", fmt::join(parameter.choices, ", "));
    case unit_host::ParameterKind::text: return "text";
  }
  return "";
}

// Columns padded to their widest cell.
std::string table(const std::vector<std::vector<std::string>>& rows, const std::string& indent) {
  std::vector<std::size_t> width;
  for (const auto& row : rows) {
    width.resize(std::max(width.size(), row.size()), 0);
    for (std::size_t i = 0; i < row.size(); ++i) width[i] = std::max(width[i], row[i].size());
  }
  std::string out;
  for (const auto& row : rows) {
    std::string line = indent;
    for (std::size_t i = 0; i < row.size(); ++i) {
      line += i + 1 < row.size() ? fmt::format("{:<{}}  ", row[i], width[i]) : row[i];
    }
    out += line + "\n";
  }
  return out;
}

std::string describe(const unit_host::UnitClassInfo& info, const unit_host::Module& module) {
  std::string out = fmt::format("{}: {}\n", info.type, info.summary);
  out += fmt::format("  module: {} {} (unit ABI {}.{}), {}\n", module.name(), module.version(), module.abi_major(),
                     module.abi_minor(), module.file().string());
  std::vector<std::vector<std::string>> ports{{"name", "direction", "streams", "phases", "meaning"}};
  for (const auto& port : info.ports) {
    const std::string streams =
        !port.list ? (port.optional ? "0 or 1" : "1")
        : port.max_streams == PFU_UNBOUNDED_STREAMS ? fmt::format("list, {} or more", port.min_streams)
                                                    : fmt::format("list, {} to {}", port.min_streams, port.max_streams);
    ports.push_back({port.name, port.inlet ? "inlet" : "outlet", streams, phases_text(port.phases), port.meaning});
  }
  out += "  ports:\n" + table(ports, "    ");
  if (info.parameters.empty()) {
    out += "  parameters: none\n";
  } else {
    std::vector<std::vector<std::string>> parameters{{"name", "unit", "default", "allowed", "meaning"}};
    for (const auto& p : info.parameters) {
      parameters.push_back({p.name, unit_text(p.unit), default_text(p), range_text(p), p.meaning});
    }
    out += "  parameters:\n" + table(parameters, "    ");
  }
  if (info.results.empty()) {
    out += "  results: none\n";
  } else {
    std::vector<std::vector<std::string>> results{{"name", "unit", "meaning"}};
    for (const auto& r : info.results) results.push_back({r.name, unit_text(r.unit), r.meaning});
    out += "  results:\n" + table(results, "    ");
  }
  if (!info.series.empty()) {
    std::vector<std::vector<std::string>> series{{"name", "x", "y", "points", "meaning"}};
    for (const auto& s : info.series) {
      series.push_back({s.name, fmt::format("{} [{}]", s.x_name, s.x_unit), fmt::format("{} [{}]", s.y_name, s.y_unit),
                        fmt::format("up to {}", s.max_points), s.meaning});
    }
    out += "  series:\n" + table(series, "    ");
  }
  return out;
}

}  // namespace

int list_units(const UnitsOptions& options, std::ostream& out, std::ostream& err) noexcept {
  return report_errors("protonflow units", err, [&]() -> int {
    const UnitCatalog catalog = UnitCatalog::scan(unit_search_path(options.unit_dirs));
    out << "Search path (first match wins):\n";
    for (const auto& directory : catalog.search_path()) {
      out << fmt::format("  {}{}\n", directory.string(), std::filesystem::is_directory(directory) ? "" : "  (absent)");
    }
    const std::vector<std::string> types = catalog.types();
    out << fmt::format("\n{} unit type{} found\n", types.size(), types.size() == 1 ? "" : "s");
    for (const std::string& type : types) out << "\n" << describe(*catalog.unit_class(type), *catalog.module_for(type));
    if (!catalog.shadowed().empty()) {
      out << "\nShadowed (a module earlier on the path offers the same type):\n";
      for (const ShadowedUnit& shadowed : catalog.shadowed()) {
        out << fmt::format("  {} in {} (using {})\n", shadowed.type, shadowed.ignored.string(), shadowed.used.string());
      }
    }
    if (!catalog.problems().empty()) {
      out << "\nModules that failed to load:\n";
      for (const ModuleProblem& problem : catalog.problems()) {
        out << fmt::format("  {}\n    {}\n", problem.file.string(), problem.message);
      }
    }
    return exit_ok;
  });
}

}  // namespace protonflow::host
