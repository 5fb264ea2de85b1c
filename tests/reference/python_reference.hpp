// Runs Debian's /usr/bin/python3 on a short script that prints numbers: the reference libraries
// (python3-iapws, python3-periodictable) live there.
#pragma once

#include <string>
#include <vector>

namespace protonflow::reference {

// The script's whitespace-separated numeric output; throws std::runtime_error if python fails.
std::vector<double> run_python(const std::string& script);

}  // namespace protonflow::reference
