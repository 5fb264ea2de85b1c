#include "speciate_command.hpp"

#include <ostream>

#include <fmt/format.h>

#include "component_amounts.hpp"
#include "input_error.hpp"
#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/held_constants.hpp"
#include "protonflow/thermo/pitzer_coverage.hpp"
#include "protonflow/thermo/pitzer_enthalpy.hpp"
#include "protonflow/thermo/stream_enthalpy.hpp"
#include "protonflow/thermo/tableau.hpp"
#include "quantity.hpp"
#include "solution_file.hpp"
#include "speciation_report.hpp"
#include "species_data.hpp"
#include "stream_solution.hpp"

namespace protonflow::host {
namespace {

constexpr double celsius_offset = 273.15;  // K at 0 °C, by definition of the Celsius scale (SI Brochure)


// Each component is mapped onto the basis alone first, so an unknown formula is reported at its
// own line rather than at the list.
void check_components_known(const thermo::Database& database, const SolutionInput& input) {
  for (const ComponentEntry& entry : input.components) {
    if (entry.formula == water_formula) {
      continue;
    }
    try {
      static_cast<void>(thermo::decompose(database, entry.formula));
    } catch (const thermo::ThermoError& error) {
      throw InputError(entry.key_at, fmt::format("component {}: {}", entry.formula, error.what()));
    }
  }
}

void check_temperature_range(const thermo::ChemicalSystem& system, const SolutionInput& input) {
  const double low = system.minimum_temperature();
  const double high = system.maximum_temperature();
  if (input.temperature < low || input.temperature > high) {
    throw InputError(input.temperature_at,
                     fmt::format("temperature {:.2f} K ({:.2f} °C) is out of range: the species data of this "
                                 "solution cover {:.2f} to {:.2f} K ({:.2f} to {:.2f} °C)",
                                 input.temperature, input.temperature - celsius_offset, low, high,
                                 low - celsius_offset, high - celsius_offset));
  }
}

// Each named solid and gas must be one of the database's, of the right phase: said at its own line.
void check_phases_known(const thermo::Database& database, const SolutionInput& input) {
  const auto check = [&](const PhaseEntry& entry, thermo::Phase phase, std::string_view what) {
    const thermo::Species* species = database.find(entry.name);
    if (species != nullptr && species->phase == phase) return;
    std::vector<std::string> names;
    for (const thermo::Species& s : database.species())
      if (s.phase == phase) names.push_back(s.name);
    std::string known;
    for (const std::string& name : names) known += (known.empty() ? "" : ", ") + name;
    throw InputError(entry.at, species == nullptr ? fmt::format("unknown {} '{}'; the data know: {}", what, entry.name, known)
                                                  : fmt::format("'{}' is not a {}; the data's {}s are: {}", entry.name,
                                                                what, what, known));
  };
  for (const PhaseEntry& solid : input.solids) check(solid, thermo::Phase::solid, "solid");
  for (const PhaseEntry& gas : input.open_gases) check(gas, thermo::Phase::gas, "gas");
}

// The slate's amounts, reordered to the system's component order.
std::vector<double> amounts_in_system_order(const thermo::ChemicalSystem& system, const ComponentSlate& slate) {
  std::vector<double> amounts(system.components().size(), 0.0);
  for (std::size_t k = 0; k < slate.names.size(); ++k) {
    amounts[system.index_of_component(slate.names[k])] += slate.amounts[k];
  }
  return amounts;
}

// Where a ThermoError from building or solving the system belongs in the input.
SourcePosition position_for(const thermo::ThermoError& error, const SolutionInput& input) {
  switch (error.kind()) {
    case thermo::ErrorKind::out_of_range: {
      const std::string_view message = error.what();
      return message.find("pressure") != std::string_view::npos ? input.pressure_at : input.temperature_at;
    }
    case thermo::ErrorKind::unknown_species:
    case thermo::ErrorKind::bad_formula:
    case thermo::ErrorKind::bad_input: return input.components_at;
    default: return input.solution_at;
  }
}

SpeciationReport make_report(const SolutionInput& input, const thermo::ChemicalSystem& system,
                             std::vector<double> amounts, thermo::Speciation speciation) {
  SpeciationReport report;
  report.source = input.file;
  report.name = input.name;
  report.activity_model = std::string(to_string(input.activity_model));
  report.amounts_as = std::string(to_string(input.basis));
  report.precipitates = thermo::to_string(input.precipitates);
  report.components = system.components();
  report.closure = measure_closure(system, amounts, speciation);
  report.component_amounts = std::move(amounts);
  for (const thermo::Solute& solute : system.solutes()) {
    report.solutes.push_back(SoluteLabel{solute.name, solute.charge});
  }
  report.warnings = thermo::describe_warnings(speciation);
  const auto excess = thermo::make_excess_enthalpy_model(system);
  for (std::string& line : thermo::describe_pitzer_coverage(system, speciation)) report.warnings.push_back(std::move(line));
  for (std::string& line : thermo::describe_held_constants(system, speciation)) report.warnings.push_back(std::move(line));
  try {
    report.enthalpy = thermo::state_enthalpy(system, speciation, excess.get());
  } catch (const thermo::ThermoError& error) {
    report.enthalpy_unavailable = error.what();
  }
  for (const thermo::PhaseSpecies& solid : system.solids()) report.solids.push_back(solid.name);
  for (const thermo::PhaseSpecies& gas : system.open_gases()) report.open_gases.push_back(gas.name);
  for (const thermo::PhaseSpecies& gas : system.phase_gases()) report.phase_gases.push_back(gas.name);
  for (std::size_t p = 0; p < system.solids().size(); ++p)
    if (speciation.solid_amount[p] > 0.0) {
      const thermo::PhaseSpecies& solid = system.solids()[p];
      report.warnings.push_back(solid.age == thermo::PrecipitateAge::any
                                    ? fmt::format("{} precipitates", solid.name)
                                    : fmt::format("{} precipitates (the {} form)", solid.name, thermo::to_string(solid.age)));
    }
  if (speciation.gas_phase_present)
    report.warnings.push_back("a gas phase forms: the solution degasses or boils at this temperature and pressure");
  report.speciation = std::move(speciation);
  return report;
}

void print_convergence_failure(const thermo::ConvergenceError& error, const SolutionInput& input, std::ostream& err) {
  err << format_diagnostic(input.solution_at,
                           fmt::format("the equilibrium solver stopped without an answer: {}", error.what()))
      << "\n";
  err << fmt::format("scaled residual of each equation after {} iterations:\n", error.iterations());
  for (const thermo::EquationResidual& residual : error.residuals()) {
    err << fmt::format("  {:<32} {:.3e}\n", residual.equation, residual.scaled_residual);
  }
}

int speciate(const SpeciateOptions& options, std::ostream& out, std::ostream& err) {
  const UnitConverter units;
  const SolutionInput input = options.stream.empty() ? read_solution_file(options.file, units)
                                                     : read_stream_solution(options.file, options.stream, units);
  const std::shared_ptr<const thermo::Database> shared = load_species_data(options.data_directory);
  const thermo::Database& database = *shared;
  check_components_known(database, input);
  check_phases_known(database, input);
  const ComponentSlate slate = to_component_slate(input);
  try {
    thermo::SystemOptions system_options;
    system_options.activity = input.activity_model;
    system_options.gas_phase = input.gas_phase;
    system_options.precipitates = input.precipitates;
    for (const PhaseEntry& gas : input.open_gases) system_options.open_gases.push_back(gas.name);
    if (input.all_solids) {
      const thermo::ChemicalSystem without(database, slate.names, system_options);
      for (const thermo::PhaseSpecies& solid : without.solids()) system_options.allowed_solids.push_back(solid.name);
    }
    for (const PhaseEntry& solid : input.solids) system_options.allowed_solids.push_back(solid.name);
    const thermo::ChemicalSystem system(database, slate.names, system_options);
    if (!input.enthalpy) check_temperature_range(system, input);
    std::vector<double> amounts = amounts_in_system_order(system, slate);
    std::vector<double> pressures;
    for (const PhaseEntry& gas : input.open_gases) pressures.push_back(gas.partial_pressure);
    thermo::SolverOptions solver_options;
    solver_options.max_iterations = options.max_iterations;
    thermo::EquilibriumSolver solver(system, solver_options);
    thermo::Speciation speciation;
    if (input.enthalpy) {
      const auto excess = thermo::make_excess_enthalpy_model(system);
      thermo::solve_at_enthalpy(solver, *input.enthalpy, input.pressure, amounts, pressures, speciation, excess.get());
    } else {
      solver.solve(input.temperature, input.pressure, amounts, pressures, speciation);
    }
    const SpeciationReport report = make_report(input, system, std::move(amounts), std::move(speciation));
    out << (options.table ? to_table(report) : to_yaml(report));
    // Warnings also go to stderr, so a user who redirects the results still sees them.
    for (const std::string& warning : report.warnings) err << format_warning(input.solution_at, warning) << "\n";
    return exit_ok;
  } catch (const thermo::ConvergenceError& error) {
    print_convergence_failure(error, input, err);
    return exit_not_converged;
  } catch (const thermo::ThermoError& error) {
    throw InputError(position_for(error, input), error.what());
  }
}

}  // namespace

int run_speciate(const SpeciateOptions& options, std::ostream& out, std::ostream& err) noexcept {
  try {
    try {
      return speciate(options, out, err);
    } catch (const InputError& error) {
      err << format_diagnostic(error.where(), error.what()) << "\n";
    } catch (const QuantityError& error) {
      err << format_diagnostic(SourcePosition{options.file, 0, 0}, error.what()) << "\n";
    } catch (const std::exception& error) {
      err << format_diagnostic(SourcePosition{options.file, 0, 0}, fmt::format("unexpected error: {}", error.what()))
          << "\n";
    } catch (...) {
      err << format_diagnostic(SourcePosition{options.file, 0, 0}, "unexpected error of unknown type") << "\n";
    }
  } catch (...) {
    // Writing the message itself failed (stderr closed); the exit code still says what happened.
  }
  return exit_bad_input;
}

}  // namespace protonflow::host
