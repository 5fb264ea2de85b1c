#include "protonflow/thermo/elements.hpp"

#include <array>
#include <utility>

namespace protonflow::thermo {

namespace {

// IUPAC standard atomic weights, 2001 table (Coplen 2001, Pure Appl. Chem. 73, 667), g/mol: the
// values python3-periodictable 1.6.0 carries, so the molar-mass check against it is exact.
constexpr std::array<std::pair<std::string_view, double>, 27> atomic_weights{{
    {"H", 1.00794},   {"B", 10.811},     {"C", 12.0107},    {"N", 14.0067},    {"O", 15.9994},
    {"F", 18.9984032}, {"Na", 22.98977}, {"Mg", 24.305},    {"Al", 26.981538}, {"Si", 28.0855},
    {"P", 30.973761}, {"S", 32.065},     {"Cl", 35.453},    {"Ar", 39.948},    {"K", 39.0983},    {"Ca", 40.078},
    {"Cr", 51.9961},  {"Mn", 54.938049}, {"Fe", 55.845},    {"Ni", 58.6934},   {"Cu", 63.546},
    {"Zn", 65.409},   {"Br", 79.904},    {"Ag", 107.8682},  {"Cd", 112.411},   {"I", 126.90447},
    {"Pb", 207.2},
}};

}  // namespace

std::optional<double> standard_atomic_weight(std::string_view symbol) {
  for (const auto& [element, weight] : atomic_weights) {
    if (element == symbol) return weight;
  }
  return std::nullopt;
}

}  // namespace protonflow::thermo
