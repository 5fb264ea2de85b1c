// One stream of a flowsheet file read as a solution for `protonflow speciate --stream NAME`: the
// flowsheet's stream format (docs/flowsheet-format.md) serves both commands.
#pragma once

#include <string>

#include "quantity.hpp"
#include "solution_file.hpp"

namespace protonflow::host {

// The named stream's temperature, pressure and the sum over its phases of each component's flow,
// as the amounts (mol, for one second of flow) of a solution in which every solid the components
// reach may precipitate and a gas phase may form — the state a unit would see the stream in.
// Throws InputError naming the file, line and column (an unknown stream lists the known ones).
SolutionInput read_stream_solution(const std::string& file, const std::string& stream, const UnitConverter& units);

}  // namespace protonflow::host
