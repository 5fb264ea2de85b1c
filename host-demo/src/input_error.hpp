// Errors in a user's input file, with the position that caused them.
#pragma once

#include <stdexcept>
#include <string>
#include <string_view>
#include <utility>

namespace protonflow::host {

// A place in an input file. Line and column are 1-based; 0 means "the file as a whole".
struct SourcePosition {
  std::string file;
  int line = 0;
  int column = 0;
};

// "FILE:LINE:COLUMN: error: message" (or "FILE: error: message" without a position), the form
// compilers use, so editors and CI logs can jump to the place.
std::string format_diagnostic(const SourcePosition& where, std::string_view message);
// "FILE:LINE:COLUMN: warning: message": the answer stands, but the user must know this.
std::string format_warning(const SourcePosition& where, std::string_view message);

class InputError : public std::runtime_error {
 public:
  InputError(SourcePosition where, const std::string& message)
      : std::runtime_error(message), where_(std::move(where)) {}
  const SourcePosition& where() const noexcept { return where_; }

 private:
  SourcePosition where_;
};

}  // namespace protonflow::host
