// A stream seen as one of the concentrated solute–water binaries of thermo (H2SO4, HCl, HNO3 or
// NaOH with water): its mass, solute mass fraction and specific enthalpy from the full-range binary
// models (docs/concentrated-acids.md). A stream is such a binary when all its flow is in the aqueous
// row and it holds water and at most that one solute.
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/concentrated_binary.hpp>

#include <cstddef>
#include <optional>
#include <span>
#include <vector>

namespace protonflow::units {

// The slate's columns that the binary models know: water and each solute present on the slate.
struct BinaryColumns {
  std::optional<std::size_t> water;
  struct Solute {
    thermo::ConcentratedBinary binary;
    std::size_t column;
  };
  std::vector<Solute> solutes;

  explicit BinaryColumns(const unit::Slate& slate);
};

struct BinaryComposition {
  std::optional<thermo::ConcentratedBinary> binary;  // none: pure water
  double mass = 0.0;              // kg/s
  double solute_fraction = 0.0;   // kg solute per kg
};

// The binary a stream's flows (mol/s, all rows) make, or nothing when it is not one: flow outside the
// aqueous row, a component other than water and one binary solute, or two solutes.
std::optional<BinaryComposition> binary_composition(const BinaryColumns& columns, const thermo::ChemicalSystem& system,
                                                    const unit::InletState& stream);
std::optional<BinaryComposition> binary_composition(const BinaryColumns& columns, const thermo::ChemicalSystem& system,
                                                    std::span<const double> totals);

// Specific enthalpy (J/kg, the engine's NBS convention) of a binary of that composition at T (K);
// pure water is the binary `fallback` at mass fraction 0. Throws thermo::BinaryRangeError.
double binary_enthalpy(thermo::ConcentratedBinary fallback, const BinaryComposition& composition, double temperature);

}  // namespace protonflow::units
