#include "protonflow/thermo/pitzer_coverage.hpp"

#include <fmt/format.h>
#include <fmt/ranges.h>

#include "protonflow/thermo/activity_pitzer.hpp"

namespace protonflow::thermo {

std::vector<std::string> describe_pitzer_coverage(const ChemicalSystem& system, const Speciation& state) {
  if (system.options().activity != ActivityModelKind::pitzer) return {};
  SoluteProperties p;
  for (const Solute& s : system.solutes()) {
    p.charge.push_back(s.charge);
    p.ion_size_angstrom.push_back(s.ion_size_angstrom);
    p.name.push_back(s.name);
  }
  const PitzerModel model(std::move(p), bundled_pitzer_parameters());
  std::vector<std::string> uncovered;
  for (const std::string& name : model.species_without_parameters())
    if (state.molality[system.index_of_solute(name)] >= 1e-4) uncovered.push_back(name);
  if (uncovered.empty()) return {};
  return {fmt::format("the Pitzer parameters do not cover {}: only the Debye-Hückel term acts on these ions (neutral "
                      "ones keep γ = 1)",
                      fmt::join(uncovered, ", "))};
}

}  // namespace protonflow::thermo
