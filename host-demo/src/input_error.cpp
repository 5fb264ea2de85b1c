#include "input_error.hpp"

#include <fmt/format.h>

namespace protonflow::host {

namespace {

std::string format_at(const SourcePosition& where, std::string_view severity, std::string_view message) {
  if (where.line <= 0) {
    return fmt::format("{}: {}: {}", where.file, severity, message);
  }
  return fmt::format("{}:{}:{}: {}: {}", where.file, where.line, where.column, severity, message);
}

}  // namespace

std::string format_diagnostic(const SourcePosition& where, std::string_view message) {
  return format_at(where, "error", message);
}

std::string format_warning(const SourcePosition& where, std::string_view message) {
  return format_at(where, "warning", message);
}

}  // namespace protonflow::host
