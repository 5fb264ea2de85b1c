// Shared by the ABI tests: a scratch directory and a slate of the shape every test uses.
#pragma once

#include <atomic>
#include <filesystem>
#include <string>

#include <unistd.h>

#include <protonflow/unit_host.hpp>

#include "../support/temporary_directory.hpp"

namespace protonflow::abi_test {

using test_support::TemporaryDirectory;

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
