// Aeration of ferrous iron ahead of the equilibrium (docs/units.md, "neutraliser", "Aeration"):
//
//   Fe^2+ + 1/4 O2 + H^+ -> Fe^3+ + 1/2 H2O
//
// applied to a share f of the feed's Fe(II) on its basis totals, then written back on the slate's
// formula components. Fe(II) and Fe(III) stay separate components of the species data (no hidden
// redox): this step is the only place the neutraliser changes an oxidation state, and only when
// asked. The oxygen comes from outside (air); the liquor gains the oxygen of the Fe(III) formed.
#pragma once

#include <protonflow/thermo/chemical_system.hpp>

#include <cstddef>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace protonflow::units {

class FerrousAeration {
 public:
  // The parameter that sets f, as the unit declares it.
  static constexpr const char* parameter = "fe2_oxidised_fraction";

  // f = fraction (0: no aeration). With f > 0 the slate must reach Fe^2+ and Fe^3+, and some
  // combination of its components must carry the reaction; otherwise UnitError
  // (PFU_INVALID_PARAMETER) naming the parameter. The system is kept: it must outlive this.
  FerrousAeration(std::string_view unit_type, const thermo::ChemicalSystem& system, double fraction);

  bool active() const noexcept { return fraction_ > 0.0; }

  // Writes into aerated the feed's totals (mol/s per component) after oxidising f of its Fe(II).
  // Throws UnitError naming the parameter when the feed holds no Fe(II), or when no combination
  // keeps every component's total non-negative. Without aeration, copies the feed.
  void apply(std::span<const double> feed, std::span<double> aerated);

  double oxidised() const noexcept { return oxidised_; }        // mol/s of Fe(II) made Fe(III)
  double oxygen() const noexcept { return 0.25 * oxidised_; }   // mol/s of O2 consumed

 private:
  // Per mol of Fe oxidised: the change of each component's total (mol/mol) that carries the
  // reaction, on as few components as the slate allows.
  using Change = std::vector<double>;

  std::string prefix_;
  const thermo::ChemicalSystem* system_;
  double fraction_;
  std::size_t ferrous_ = 0;  // solute index of Fe^2+
  std::vector<Change> changes_;
  double oxidised_ = 0.0;
};

}  // namespace protonflow::units
