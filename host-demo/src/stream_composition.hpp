// From a phase as a flowsheet describes it — a total flow and a composition in some basis — to the
// molar flow of each formula component, which is all a stream state carries. Pure arithmetic,
// SI in and out; the reader (flowsheet_file.cpp) does the units and the positions.
#pragma once

#include <cstddef>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace protonflow::host {

// What the numbers of a phase's composition mean.
enum class CompositionBasis {
  flows,               // each component's own flow (no total)
  mass_fraction,       // kg per kg of the phase
  mole_fraction,       // mol per mol of the phase
  volume_fraction,     // gas only: m³ per m³, equal to the mole fraction for an ideal gas
  molality,            // aqueous only: mol per kg of water; H2O is the solvent, not listed
  molarity,            // aqueous only: mol per m³ of solution (written in mol/L)
  mass_concentration,  // aqueous only: kg per m³ of solution (written in mg/L)
};

std::string_view to_string(CompositionBasis basis) noexcept;

// How the total flow of a phase was given.
enum class TotalFlowKind { molar, mass, volume };

enum class PhaseKind { aqueous, gas, solid };

std::string_view to_string(PhaseKind kind) noexcept;

struct CompositionItem {
  std::string formula;
  double value = 0.0;      // in the basis' SI unit (1, mol/kg, mol/m³, kg/m³); ignored if balance
  bool balance = false;    // fractions only: this component makes up the rest to 1
  double molar_mass = 0.0; // kg/mol
};

struct PhaseComposition {
  PhaseKind phase = PhaseKind::aqueous;
  CompositionBasis basis = CompositionBasis::mole_fraction;
  TotalFlowKind total_kind = TotalFlowKind::molar;
  double total = 0.0;        // mol/s, kg/s or m³/s (actual volume at the phase's T and P)
  double temperature = 0.0;  // K
  double pressure = 0.0;     // Pa
  double density = 0.0;      // kg/m³ of an aqueous phase; used for volume flows and per-volume bases
  std::vector<CompositionItem> items;
};

// A composition that cannot be turned into flows; item is the index of the entry to blame, or
// npos when the composition as a whole is at fault.
class CompositionError : public std::runtime_error {
 public:
  static constexpr std::size_t npos = static_cast<std::size_t>(-1);
  CompositionError(std::size_t item, const std::string& message) : std::runtime_error(message), item_(item) {}
  std::size_t item() const noexcept { return item_; }

 private:
  std::size_t item_;
};

// Fractions that add up to 1 within this are taken as exact (then rescaled to sum to exactly 1):
// analyses are reported to four to six significant digits, so a sum of 0.999999 is rounding.
inline constexpr double fraction_sum_tolerance = 1e-6;

struct ComponentFlow {
  std::string formula;
  double flow;  // mol/s
};

// The molar flow of every item, in order, followed by water ("H2O") for the bases in which water is
// the solvent (molality, molarity, mass_concentration). Throws CompositionError.
std::vector<ComponentFlow> component_flows(const PhaseComposition& phase);

}  // namespace protonflow::host
