// Writing a file so that readers see the old contents or the new, never half of either: write a
// temporary file in the same directory, flush it to disk, then rename it over the target (rename
// within one file system is atomic in POSIX).
#pragma once

#include <filesystem>
#include <stdexcept>
#include <string_view>

namespace protonflow::host {

class FileWriteError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// Replaces file with contents. On any failure the target is left as it was, the temporary file is
// removed, and FileWriteError says what failed. A new file gets the permissions the umask allows;
// an existing one keeps its own.
void write_file_atomically(const std::filesystem::path& file, std::string_view contents);

}  // namespace protonflow::host
