// Shared by the ABI tests: a scratch directory and a slate of the shape every test uses.
#pragma once

#include <atomic>
#include <filesystem>
#include <string>

#include <unistd.h>

#include <protonflow/unit_host.hpp>

namespace protonflow::abi_test {

// A fresh directory under the system's temporary directory, removed with everything in it.
class TemporaryDirectory {
 public:
  TemporaryDirectory() {
    static std::atomic<int> counter{0};
    path_ = std::filesystem::temp_directory_path() /
            ("protonflow-abi-" + std::to_string(::getpid()) + "-" + std::to_string(counter++));
    std::filesystem::remove_all(path_);
    std::filesystem::create_directories(path_);
  }
  TemporaryDirectory(const TemporaryDirectory&) = delete;
  TemporaryDirectory& operator=(const TemporaryDirectory&) = delete;
  ~TemporaryDirectory() {
    std::error_code ignored;
    std::filesystem::remove_all(path_, ignored);
  }
  const std::filesystem::path& path() const noexcept { return path_; }

 private:
  std::filesystem::path path_;
};

// Three components and one solid phase: rows aqueous, gas, gypsum.
inline unit_host::Slate test_slate() { return {{"H2O", "H2SO4", "NaOH"}, {"gypsum"}}; }

inline constexpr std::size_t aqueous = PFU_AQUEOUS_ROW;
inline constexpr std::size_t gas = PFU_GAS_ROW;
inline constexpr std::size_t gypsum = PFU_FIRST_SOLID_ROW;

// A stream of test_slate() at T and P with flows set by (row, component, mol/s) triples.
inline unit_host::StreamState test_stream(double temperature, double pressure,
                                          std::initializer_list<std::tuple<std::size_t, std::size_t, double>> flows) {
  const unit_host::Slate slate = test_slate();
  unit_host::StreamState state = unit_host::empty_stream(slate);
  state.temperature = temperature;
  state.pressure = pressure;
  for (const auto& [row, component, flow] : flows) state.flows[row * slate.components.size() + component] = flow;
  return state;
}

}  // namespace protonflow::abi_test
