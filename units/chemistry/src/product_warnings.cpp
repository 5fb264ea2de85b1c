#include <protonflow/units/product_warnings.hpp>

#include <cstddef>

#include <protonflow/thermo/held_constants.hpp>
#include <protonflow/thermo/pitzer_coverage.hpp>

#include <protonflow/units/message_text.hpp>

namespace protonflow::units {

namespace {

// Hot corrosive liquor: above 60 °C a splash scalds (a common-practice touch limit, as in the ABI
// test mixer), and a liquor below pH 2 or above 12 is corrosive to skin and to carbon steel (common
// practice; cf. the corrosivity characteristic of US EPA 40 CFR 261.22, pH <= 2 or >= 12.5, from
// memory). The project's brief fixes these three numbers.
constexpr double hot_liquor_temperature = 333.15;  // K, 60 °C
constexpr double corrosive_ph_low = 2.0;
constexpr double corrosive_ph_high = 12.0;

}  // namespace

void warn_about_product(std::string_view unit_type, std::string_view fouling, const thermo::ChemicalSystem& system,
                        const thermo::Speciation& product, const InletPhases& inlets, unit::Warnings& warnings) {
  const std::string prefix = "unit '" + std::string(unit_type) + "': ";
  const double t = product.temperature;
  const double ph = product.ph;
  if (t > hot_liquor_temperature && (ph < corrosive_ph_low || ph > corrosive_ph_high)) {
    warnings.add(prefix + "hot corrosive liquor: the product is at " + celsius_text(t) + " with pH " + number_text(ph, 3) +
                 " (above 60 °C and pH below 2 or above 12): it burns on contact and corrodes fast; choose materials, "
                 "guarding and protective equipment by local codes and a qualified engineer");
  }
  if (product.gas_phase_present) {
    std::string parts;
    const auto& gases = system.phase_gases();
    for (std::size_t g = 0; g < gases.size(); ++g) {
      if (!(product.gas_phase_amount > 0.0)) break;
      const double y = product.gas_amount[g] / product.gas_phase_amount;
      if (y >= 1e-6) parts += (parts.empty() ? "" : ", ") + gases[g].name + " " + number_text(100.0 * y, 3) + " %";
    }
    warnings.add(prefix + "a gas phase " + std::string(inlets.gas_amount > 0.0 ? "is present" : "forms") + " in the product: " +
                 number_text(product.gas_phase_amount, 4) + " mol/s (" + parts + "; the " + inlets.label +
                 " at equilibrium had " + number_text(inlets.gas_amount, 4) + " mol/s): boiling or degassing; the " +
                 std::string(unit_type) +
                 ", its vent and its relief must be designed for it, and acid or toxic gases in it captured (defer to "
                 "local codes and a qualified engineer)");
  }
  std::string solids;
  const auto& list = system.solids();
  for (std::size_t s = 0; s < list.size(); ++s) {
    const double amount = product.solid_amount[s];
    if (amount <= 0.0) continue;
    // A solid with a fresh and an aged form says which one the unit was asked for.
    const std::string form = list[s].age == thermo::PrecipitateAge::any ? "" : std::string(" (") + thermo::to_string(list[s].age) + " form)";
    solids += (solids.empty() ? "" : ", ") + list[s].name + form + " " + number_text(amount, 4) + " mol/s (" + inlets.label +
              " at equilibrium " + number_text(inlets.solid_amount[s], 4) + ")";
  }
  if (!solids.empty()) warnings.add(prefix + "solids precipitate in the product: " + solids + ": " + std::string(fouling));
  for (const std::string& line : thermo::describe_pitzer_coverage(system, product)) warnings.add(prefix + "product: " + line);
  for (const std::string& line : thermo::describe_held_constants(system, product)) warnings.add(prefix + "product: " + line);
}

void warn_about_model(std::string_view unit_type, std::string_view stream, const thermo::Speciation& state,
                      unit::Warnings& warnings) {
  for (const std::string& line : thermo::describe_warnings(state)) {
    warnings.add("unit '" + std::string(unit_type) + "': " + std::string(stream) + ": " + line);
  }
}

}  // namespace protonflow::units
