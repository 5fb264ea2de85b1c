// Standard atomic weights of the elements the species data uses.
#pragma once

#include <optional>
#include <string_view>

namespace protonflow::thermo {

// Standard atomic weight in g/mol, or nothing for a symbol that is not in the table.
std::optional<double> standard_atomic_weight(std::string_view symbol);

}  // namespace protonflow::thermo
