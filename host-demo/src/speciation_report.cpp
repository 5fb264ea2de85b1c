#include "speciation_report.hpp"

#include <algorithm>
#include <cmath>

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

namespace protonflow::host {
namespace {

// Shortest text that reads back to the same double, so a regression test sees every bit.
std::string number_text(double value) {
  if (std::isnan(value)) return ".nan";
  if (std::isinf(value)) return value > 0 ? ".inf" : "-.inf";
  return fmt::format("{}", value + 0.0);  // + 0.0 turns −0 into 0
}

void emit_number(YAML::Emitter& out, std::string_view key, double value) {
  out << YAML::Key << std::string(key) << YAML::Value << number_text(value);
}

std::string charge_text(int charge) { return charge == 0 ? "0" : fmt::format("{:+d}", charge); }

constexpr double celsius_offset = 273.15;  // K at 0 °C, by definition of the Celsius scale (SI Brochure)

const BalanceResidual* worst_mass_balance(const BalanceClosure& closure) {
  const auto worst = std::max_element(
      closure.mass.begin(), closure.mass.end(),
      [](const BalanceResidual& a, const BalanceResidual& b) { return std::abs(a.relative) < std::abs(b.relative); });
  return worst == closure.mass.end() ? nullptr : &*worst;
}

}  // namespace

std::string to_yaml(const SpeciationReport& report) {
  const thermo::Speciation& s = report.speciation;
  YAML::Emitter out;
  out << YAML::BeginMap;
  out << YAML::Key << "source" << YAML::Value << report.source;
  if (!report.name.empty()) {
    out << YAML::Key << "name" << YAML::Value << report.name;
  }
  out << YAML::Key << "activity_model" << YAML::Value << report.activity_model;
  out << YAML::Key << "amounts_as" << YAML::Value << report.amounts_as;
  out << YAML::Key << "precipitates" << YAML::Value << report.precipitates;
  emit_number(out, "temperature_K", s.temperature);
  emit_number(out, "pressure_Pa", s.pressure);
  emit_number(out, "pH", s.ph);
  emit_number(out, "ionic_strength_mol_per_kg", s.ionic_strength);
  emit_number(out, "water_mass_kg", s.water_mass);
  emit_number(out, "water_activity", s.water_activity);

  out << YAML::Key << "solver" << YAML::Value << YAML::BeginMap;
  out << YAML::Key << "iterations" << YAML::Value << s.iterations;
  emit_number(out, "residual_norm", s.residual_norm);
  out << YAML::Key << "warm_started" << YAML::Value << s.warm_started;
  out << YAML::EndMap;

  if (report.enthalpy) {
    emit_number(out, "enthalpy_J", *report.enthalpy);
  } else {
    out << YAML::Key << "enthalpy_J" << YAML::Value << YAML::Null;
    out << YAML::Key << "enthalpy_unavailable" << YAML::Value << report.enthalpy_unavailable;
  }
  if (!report.solids.empty()) {
    out << YAML::Key << "solids" << YAML::Value << YAML::BeginMap;
    for (std::size_t p = 0; p < report.solids.size(); ++p) {
      out << YAML::Key << report.solids[p] << YAML::Value << YAML::BeginMap;
      emit_number(out, "amount_mol", s.solid_amount[p]);
      emit_number(out, "saturation_index", s.saturation_index[p]);
      out << YAML::EndMap;
    }
    out << YAML::EndMap;
  }
  if (!report.open_gases.empty()) {
    out << YAML::Key << "open_gases" << YAML::Value << YAML::BeginMap;
    for (std::size_t g = 0; g < report.open_gases.size(); ++g) {
      out << YAML::Key << report.open_gases[g] << YAML::Value << YAML::BeginMap;
      emit_number(out, "uptake_mol", s.gas_uptake[g]);
      out << YAML::EndMap;
    }
    out << YAML::EndMap;
  }
  if (!report.phase_gases.empty()) {
    out << YAML::Key << "gas_phase" << YAML::Value << YAML::BeginMap;
    out << YAML::Key << "present" << YAML::Value << s.gas_phase_present;
    emit_number(out, "amount_mol", s.gas_phase_amount);
    out << YAML::Key << "gases" << YAML::Value << YAML::BeginMap;
    for (std::size_t g = 0; g < report.phase_gases.size(); ++g) {
      out << YAML::Key << report.phase_gases[g] << YAML::Value << YAML::BeginMap;
      emit_number(out, "amount_mol", s.gas_amount[g]);
      emit_number(out, "partial_pressure_Pa", s.partial_pressure[g]);
      out << YAML::EndMap;
    }
    out << YAML::EndMap << YAML::EndMap;
  }

  out << YAML::Key << "warnings" << YAML::Value << YAML::BeginSeq;
  for (const std::string& warning : report.warnings) out << warning;
  out << YAML::EndSeq;

  out << YAML::Key << "balance_closure" << YAML::Value << YAML::BeginMap;
  emit_number(out, "charge", report.closure.charge);
  out << YAML::Key << "mass" << YAML::Value << YAML::BeginMap;
  for (const BalanceResidual& residual : report.closure.mass) {
    emit_number(out, residual.quantity, residual.relative);
  }
  out << YAML::EndMap << YAML::EndMap;

  out << YAML::Key << "components_mol" << YAML::Value << YAML::BeginMap;
  for (std::size_t c = 0; c < report.components.size(); ++c) {
    emit_number(out, report.components[c], report.component_amounts[c]);
  }
  out << YAML::EndMap;

  out << YAML::Key << "solutes" << YAML::Value << YAML::BeginMap;
  for (std::size_t i = 0; i < report.solutes.size(); ++i) {
    out << YAML::Key << report.solutes[i].name << YAML::Value << YAML::BeginMap;
    out << YAML::Key << "charge" << YAML::Value << report.solutes[i].charge;
    emit_number(out, "molality_mol_per_kg", s.molality[i]);
    emit_number(out, "activity", s.activity[i]);
    emit_number(out, "log10_gamma", s.log10_gamma[i]);
    out << YAML::EndMap;
  }
  out << YAML::EndMap;
  out << YAML::EndMap;
  return std::string(out.c_str()) + "\n";
}

std::string to_table(const SpeciationReport& report) {
  const thermo::Speciation& s = report.speciation;
  std::string text;
  const auto line = [&text](std::string_view label, const std::string& value) {
    text += fmt::format("{:<17}{}\n", label, value);
  };
  line("solution", report.name.empty() ? report.source : fmt::format("{} ({})", report.name, report.source));
  line("temperature", fmt::format("{:.2f} °C  ({:.2f} K)", s.temperature - celsius_offset, s.temperature));
  line("pressure", fmt::format("{:.3f} kPa", s.pressure / 1000.0));
  line("activity model", report.activity_model);
  line("precipitates", report.precipitates);
  line("pH", fmt::format("{:.4f}", s.ph));
  line("ionic strength", fmt::format("{:.4e} mol/kg", s.ionic_strength));
  line("water", fmt::format("{:.6f} kg, activity {:.6f}", s.water_mass, s.water_activity));
  line("solver", fmt::format("{} iterations, residual norm {:.1e}", s.iterations, s.residual_norm));
  const BalanceResidual* const worst = worst_mass_balance(report.closure);
  line("closure", fmt::format("charge {:.1e}, worst mass balance {:.1e} ({})", report.closure.charge,
                              worst ? worst->relative : 0.0, worst ? worst->quantity : "-"));
  line("enthalpy", report.enthalpy ? fmt::format("{:.6e} J", *report.enthalpy) : "unavailable: " + report.enthalpy_unavailable);
  for (std::size_t p = 0; p < report.solids.size(); ++p)
    line(p == 0 ? "solids" : "", fmt::format("{:<16} {:>13.6e} mol  SI {:+.4f}", report.solids[p], s.solid_amount[p],
                                             s.saturation_index[p]));
  for (std::size_t g = 0; g < report.open_gases.size(); ++g)
    line(g == 0 ? "open to" : "", fmt::format("{:<16} uptake {:+.6e} mol", report.open_gases[g], s.gas_uptake[g]));
  if (!report.phase_gases.empty()) {
    line("gas phase", s.gas_phase_present ? fmt::format("{:.6e} mol", s.gas_phase_amount) : std::string("none"));
    for (std::size_t g = 0; g < report.phase_gases.size(); ++g)
      line("", fmt::format("{:<16} {:>13.6e} mol  p {:.6e} Pa", report.phase_gases[g], s.gas_amount[g],
                           s.partial_pressure[g]));
  }
  for (const std::string& warning : report.warnings) line("WARNING", warning);
  text += "\n";
  text += fmt::format("{:<14}{:>7}{:>16}{:>14}{:>11}\n", "solute", "charge", "mol/kg", "activity", "log10 γ");
  for (std::size_t i = 0; i < report.solutes.size(); ++i) {
    text += fmt::format("{:<14}{:>7}{:>16.6e}{:>14.4e}{:>11.4f}\n", report.solutes[i].name,
                        charge_text(report.solutes[i].charge), s.molality[i], s.activity[i], s.log10_gamma[i] + 0.0);
  }
  return text;
}

}  // namespace protonflow::host
