// Heats of dilution from the Pitzer model: the relative enthalpy L = −R T² ∂(G^ex/RT)/∂T of a
// state's aqueous phase, added to the dilute-solution enthalpy sum (docs/energy.md).
#pragma once

#include <memory>

#include "protonflow/thermo/activity_pitzer.hpp"
#include "protonflow/thermo/stream_enthalpy.hpp"

namespace protonflow::thermo {

class PitzerExcessEnthalpy final : public ExcessEnthalpyModel {
 public:
  // A model over the system's solutes with the given parameters.
  explicit PitzerExcessEnthalpy(const ChemicalSystem& system,
                                const PitzerParameters& parameters = bundled_pitzer_parameters());
  // L of the state's solution, J: w_w × (−R T² ∂g/∂T) at the state's molalities.
  double excess_enthalpy(const ChemicalSystem& system, const Speciation& state) const override;
  const PitzerModel& model() const noexcept { return model_; }

 private:
  PitzerModel model_;
};

// The excess-enthalpy model that goes with the system's activity model: a Pitzer one for
// ActivityModelKind::pitzer, none (nullptr) for the dilute-solution models.
std::unique_ptr<ExcessEnthalpyModel> make_excess_enthalpy_model(const ChemicalSystem& system);

}  // namespace protonflow::thermo
