// Shared by the host tests: a scratch directory and whole-file reads and writes.
#pragma once

#include <unistd.h>

#include <atomic>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "../support/temporary_directory.hpp"

namespace protonflow::host_test {

using test_support::TemporaryDirectory;

inline std::string read_text(const std::filesystem::path& file) {
  std::ifstream stream(file, std::ios::binary);
  std::ostringstream text;
  text << stream.rdbuf();
  return text.str();
}

inline void write_text(const std::filesystem::path& file, const std::string& text) {
  std::ofstream(file, std::ios::binary) << text;
}

}  // namespace protonflow::host_test
