// Shared helpers of the unit-module tests: streams on a slate, sums, and the python3 reference call.
#pragma once

#include <protonflow/unit_host.hpp>

#include <cstddef>
#include <string>
#include <vector>

namespace units_test {

namespace host = protonflow::unit_host;

// 1 kg of water in mol: 1 / M(H2O), M = 0.018015268 kg/mol (IAPWS-95, Wagner & Pruss 2002).
inline constexpr double mol_per_kg_water = 1.0 / 0.018015268;
inline constexpr double atmosphere = 101325.0;  // Pa, exact by definition

// A stream of the slate's shape at T, P with every flow zero.
host::StreamState stream(const host::Slate& slate, double temperature, double pressure);
// flows[row * components + column], by component name; throws for an unknown name.
double& flow(host::StreamState& state, const host::Slate& slate, std::size_t row, const std::string& component);
double flow(const host::StreamState& state, const host::Slate& slate, std::size_t row, const std::string& component);
// Sum over all phases of one component column.
double column_total(const host::StreamState& state, const host::Slate& slate, std::size_t column);
// Sum of every flow of the stream.
double total_flow(const host::StreamState& state);

// The numbers a python3 script prints, run by Debian's /usr/bin/python3 (which sees python3-iapws).
std::vector<double> run_python(const std::string& script);

// Whether any warning line contains the text.
bool warned(const host::Solution& solution, const std::string& text);

}  // namespace units_test
