// The speciation benchmark of docs/performance.md: water with totals of Na, Cl, S(VI), C(IV),
// N(−III) and Ca at 25 °C, Davies activity, secondary species OH^-, HSO4^-, HCO3^-, CO2(aq), NH3,
// CaSO4°, NaSO4^-, CaCO3°; totals log-uniform in 1e-3…1e-1 mol/kg.
#include <benchmark/benchmark.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <random>
#include <vector>

#include "protonflow/thermo/chemical_system.hpp"
#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/equilibrium_solver.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/stream_enthalpy.hpp"

using namespace protonflow::thermo;

namespace {

const Database& database() {
  static const Database db = load_database(default_data_directory());
  return db;
}

// One component per element total; the proton balance follows from charge.
ChemicalSystem benchmark_system(ActivityModelKind model = ActivityModelKind::davies) {
  SystemOptions options;
  options.activity = model;
  options.secondary_species = {"OH^-", "HSO4^-", "HCO3^-", "CO2(aq)", "NH3(aq)", "CaSO4(aq)", "NaSO4^-", "CaCO3(aq)"};
  return ChemicalSystem(database(), {"H2O", "NaOH", "HCl", "H2SO4", "CO2", "NH3", "Ca(OH)2"}, options);
}

std::vector<std::vector<double>> draw_cases(std::size_t count) {
  std::mt19937_64 random(20261201);
  std::uniform_real_distribution<double> exponent(-3.0, -1.0);
  std::vector<std::vector<double>> cases;
  for (std::size_t k = 0; k < count; ++k) {
    std::vector<double> amounts{1.0 / constants::water_molar_mass};
    for (int c = 0; c < 6; ++c) amounts.push_back(std::pow(10.0, exponent(random)));
    cases.push_back(std::move(amounts));
  }
  return cases;
}

double median(std::vector<double> values) {
  std::nth_element(values.begin(), values.begin() + static_cast<std::ptrdiff_t>(values.size() / 2), values.end());
  return values[values.size() / 2];
}

// 10,000 cases: each solved cold, then again warm after a 1 % change of every total (a flowsheet
// iteration's typical step). Each solve is timed on its own; medians, the convergence rate and the
// share of cases with a solid are reported as counters.
void cold_and_warm_10000_cases(benchmark::State& state, const ChemicalSystem& system, const std::vector<double>& pressures,
                               const std::vector<std::vector<double>>& cases = draw_cases(10000),
                               NewtonForm form = NewtonForm::full) {
  SolverOptions options;
  options.form = form;
  EquilibriumSolver solver(system, options);
  Speciation out;
  for (auto _ : state) {
    std::vector<double> cold_us, warm_us;
    double converged = 0, warm_iterations = 0, cold_iterations = 0, with_solid = 0;
    for (const auto& amounts : cases) {
      auto nearby = amounts;
      for (std::size_t c = 1; c < nearby.size(); ++c) nearby[c] *= 1.01;
      try {
        solver.reset_warm_start();
        const auto t0 = std::chrono::steady_clock::now();
        solver.solve(298.15, constants::standard_atmosphere, amounts, pressures, out);
        const auto t1 = std::chrono::steady_clock::now();
        cold_iterations += static_cast<double>(out.iterations);
        solver.solve(298.15, constants::standard_atmosphere, nearby, pressures, out);
        const auto t2 = std::chrono::steady_clock::now();
        cold_us.push_back(std::chrono::duration<double, std::micro>(t1 - t0).count());
        warm_us.push_back(std::chrono::duration<double, std::micro>(t2 - t1).count());
        warm_iterations += static_cast<double>(out.iterations);
        converged += 1;
        with_solid += std::any_of(out.solid_amount.begin(), out.solid_amount.end(), [](double n) { return n > 0.0; }) ? 1 : 0;
      } catch (const ThermoError&) {
        // counted as not converged
      }
    }
    state.counters["cold_median_us"] = median(cold_us);
    state.counters["warm_median_us"] = median(warm_us);
    state.counters["warm_newton_iterations_mean"] = warm_iterations / converged;
    state.counters["cold_newton_iterations_mean"] = cold_iterations / converged;
    state.counters["converged_percent"] = 100.0 * converged / static_cast<double>(cases.size());
    const bool solids_allowed =
        std::any_of(system.solids().begin(), system.solids().end(), [](const PhaseSpecies& p) { return p.allowed; });
    if (solids_allowed) state.counters["with_a_solid_percent"] = 100.0 * with_solid / static_cast<double>(cases.size());
  }
}

void speciation_10000_cases(benchmark::State& state) { cold_and_warm_10000_cases(state, benchmark_system(), {}); }
BENCHMARK(speciation_10000_cases)->Iterations(1)->Unit(benchmark::kMillisecond);

// Steady warm solving: alternate between two states 1 % apart, as a converging recycle does.
void speciation_warm_nearby(benchmark::State& state) {
  const ChemicalSystem system = benchmark_system();
  EquilibriumSolver solver(system);
  const auto base = draw_cases(1).front();
  auto nearby = base;
  for (std::size_t c = 1; c < nearby.size(); ++c) nearby[c] *= 1.01;
  Speciation out;
  solver.solve(298.15, constants::standard_atmosphere, base, out);
  bool flip = false;
  for (auto _ : state) {
    solver.solve(298.15, constants::standard_atmosphere, flip ? base : nearby, out);
    flip = !flip;
    benchmark::DoNotOptimize(out.ph);
  }
}
BENCHMARK(speciation_warm_nearby)->Unit(benchmark::kMicrosecond);
// Fixed iteration counts, for instruction counts under callgrind (docs/performance.md): the
// difference between the two runs is 1000 warm solves, set-up and the first cold solve cancel.
BENCHMARK(speciation_warm_nearby)->Iterations(10)->Unit(benchmark::kMicrosecond);
BENCHMARK(speciation_warm_nearby)->Iterations(1010)->Unit(benchmark::kMicrosecond);

// The same steady warm solving with each activity model, in the benchmark's dilute solution and in
// a concentrated brine (3 mol/kg NaCl with sulfate, carbonate, ammonia and calcium; I ≈ 3.5 mol/kg,
// beyond Davies' range, which the result warns of), where the activity terms dominate the
// Jacobian. Another activity model is one more pair of lines here.
void speciation_warm_nearby_in_form(benchmark::State& state, NewtonForm form, ActivityModelKind model, bool brine) {
  const ChemicalSystem system = benchmark_system(model);
  SolverOptions options;
  options.form = form;
  EquilibriumSolver solver(system, options);
  const std::vector<double> base = brine ? std::vector<double>{1.0 / constants::water_molar_mass, 3.0, 3.2, 0.3, 0.05, 0.1, 0.01}
                                         : draw_cases(1).front();
  auto nearby = base;
  for (std::size_t c = 1; c < nearby.size(); ++c) nearby[c] *= 1.01;
  Speciation out;
  solver.solve(298.15, constants::standard_atmosphere, base, out);
  bool flip = false;
  for (auto _ : state) {
    solver.solve(298.15, constants::standard_atmosphere, flip ? base : nearby, out);
    flip = !flip;
    benchmark::DoNotOptimize(out.ph);
  }
  state.counters["newton_iterations"] = static_cast<double>(out.iterations);
}

void speciation_warm_nearby_with(benchmark::State& state, ActivityModelKind model, bool brine) {
  speciation_warm_nearby_in_form(state, NewtonForm::full, model, brine);
}
BENCHMARK_CAPTURE(speciation_warm_nearby_with, ideal, ActivityModelKind::ideal, false)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, b_dot, ActivityModelKind::b_dot, false)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, brine_davies, ActivityModelKind::davies, true)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, brine_b_dot, ActivityModelKind::b_dot, true)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, ideal, ActivityModelKind::ideal, false)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, ideal, ActivityModelKind::ideal, false)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, b_dot, ActivityModelKind::b_dot, false)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, b_dot, ActivityModelKind::b_dot, false)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, brine_davies, ActivityModelKind::davies, true)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, brine_davies, ActivityModelKind::davies, true)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, brine_b_dot, ActivityModelKind::b_dot, true)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, brine_b_dot, ActivityModelKind::b_dot, true)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, pitzer, ActivityModelKind::pitzer, false)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, brine_pitzer, ActivityModelKind::pitzer, true)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, pitzer, ActivityModelKind::pitzer, false)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, pitzer, ActivityModelKind::pitzer, false)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, brine_pitzer, ActivityModelKind::pitzer, true)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_with, brine_pitzer, ActivityModelKind::pitzer, true)->Iterations(1010);

// The reduced form and the Schur complement of the full form (docs/performance.md, "Reduced form
// and Schur complement"), on the benchmark system and the brine, Davies and Pitzer.
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_davies, NewtonForm::reduced, ActivityModelKind::davies, false)
    ->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, schur_davies, NewtonForm::full_by_schur, ActivityModelKind::davies, false)
    ->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_brine_davies, NewtonForm::reduced, ActivityModelKind::davies, true)
    ->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, schur_brine_davies, NewtonForm::full_by_schur, ActivityModelKind::davies, true)
    ->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_pitzer, NewtonForm::reduced, ActivityModelKind::pitzer, false)
    ->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_brine_pitzer, NewtonForm::reduced, ActivityModelKind::pitzer, true)
    ->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_davies, NewtonForm::reduced, ActivityModelKind::davies, false)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_davies, NewtonForm::reduced, ActivityModelKind::davies, false)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, schur_davies, NewtonForm::full_by_schur, ActivityModelKind::davies, false)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, schur_davies, NewtonForm::full_by_schur, ActivityModelKind::davies, false)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_brine_davies, NewtonForm::reduced, ActivityModelKind::davies, true)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_brine_davies, NewtonForm::reduced, ActivityModelKind::davies, true)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, schur_brine_davies, NewtonForm::full_by_schur, ActivityModelKind::davies, true)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, schur_brine_davies, NewtonForm::full_by_schur, ActivityModelKind::davies, true)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_pitzer, NewtonForm::reduced, ActivityModelKind::pitzer, false)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_pitzer, NewtonForm::reduced, ActivityModelKind::pitzer, false)->Iterations(1010);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_brine_pitzer, NewtonForm::reduced, ActivityModelKind::pitzer, true)->Iterations(10);
BENCHMARK_CAPTURE(speciation_warm_nearby_in_form, reduced_brine_pitzer, NewtonForm::reduced, ActivityModelKind::pitzer, true)->Iterations(1010);

// Cold solving through the drawn cases.
void speciation_cold_in_form(benchmark::State& state, NewtonForm form) {
  const ChemicalSystem system = benchmark_system();
  SolverOptions options;
  options.form = form;
  EquilibriumSolver solver(system, options);
  const auto cases = draw_cases(1000);
  Speciation out;
  std::size_t k = 0;
  for (auto _ : state) {
    solver.reset_warm_start();
    solver.solve(298.15, constants::standard_atmosphere, cases[k++ % cases.size()], out);
    benchmark::DoNotOptimize(out.ph);
  }
}
void speciation_cold(benchmark::State& state) { speciation_cold_in_form(state, NewtonForm::full); }
BENCHMARK(speciation_cold)->Unit(benchmark::kMicrosecond);
BENCHMARK(speciation_cold)->Iterations(10)->Unit(benchmark::kMicrosecond);
BENCHMARK(speciation_cold)->Iterations(210)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_cold_in_form, reduced, NewtonForm::reduced)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(speciation_cold_in_form, reduced, NewtonForm::reduced)->Iterations(10);
BENCHMARK_CAPTURE(speciation_cold_in_form, reduced, NewtonForm::reduced)->Iterations(210);

// The same system with calcite and gypsum allowed to precipitate and CO2 open to air (42 Pa, about
// 415 ppm at 1 atm: the atmosphere's CO2 around 2021, NOAA Mauna Loa annual mean, from memory).
ChemicalSystem system_with_phases() {
  SystemOptions options;
  options.activity = ActivityModelKind::davies;
  options.secondary_species = {"OH^-", "HSO4^-", "HCO3^-", "CO2(aq)", "NH3(aq)", "CaSO4(aq)", "NaSO4^-", "CaCO3(aq)"};
  options.allowed_solids = {"calcite", "gypsum"};
  options.open_gases = {"CO2(g)"};
  return ChemicalSystem(database(), {"H2O", "NaOH", "HCl", "H2SO4", "CO2", "NH3", "Ca(OH)2"}, options);
}

constexpr double air_co2 = 42.0;  // Pa

void speciation_with_solids_and_air_10000_cases(benchmark::State& state) {
  cold_and_warm_10000_cases(state, system_with_phases(), {air_co2});
}
BENCHMARK(speciation_with_solids_and_air_10000_cases)->Iterations(1)->Unit(benchmark::kMillisecond);

// The four sets of 10,000 in another Newton form: the robustness half of the comparison.
void cases_10000_in_form(benchmark::State& state, NewtonForm form, int set);

// The adiabatic problem: the temperature of a given enthalpy, each trial temperature a warm solve.
void adiabatic_solve(benchmark::State& state) {
  const ChemicalSystem system = system_with_phases();
  EquilibriumSolver solver(system);
  const auto amounts = draw_cases(1).front();
  const std::vector<double> pressure{air_co2};
  Speciation out;
  solver.solve(318.15, constants::standard_atmosphere, amounts, pressure, out);
  const double enthalpy = state_enthalpy(system, out);
  for (auto _ : state) {
    solve_at_enthalpy(solver, enthalpy, constants::standard_atmosphere, amounts, pressure, out);
    benchmark::DoNotOptimize(out.temperature);
  }
}
BENCHMARK(adiabatic_solve)->Unit(benchmark::kMicrosecond);

// The same search started 2 K off the answer with the heat capacity of a 1 K step, as a unit's
// stream starts it from its previous state.
void adiabatic_solve_from_estimate(benchmark::State& state) {
  const ChemicalSystem system = system_with_phases();
  EquilibriumSolver solver(system);
  const auto amounts = draw_cases(1).front();
  const std::vector<double> pressure{air_co2};
  Speciation out;
  solver.solve(319.15, constants::standard_atmosphere, amounts, pressure, out);
  const double enthalpy_above = state_enthalpy(system, out);
  solver.solve(318.15, constants::standard_atmosphere, amounts, pressure, out);
  const double enthalpy = state_enthalpy(system, out);
  const TemperatureEstimate estimate{320.15, enthalpy_above - enthalpy};
  for (auto _ : state) {
    solve_at_enthalpy(solver, enthalpy, constants::standard_atmosphere, amounts, pressure, out, nullptr, estimate);
    benchmark::DoNotOptimize(out.temperature);
  }
}
BENCHMARK(adiabatic_solve_from_estimate)->Unit(benchmark::kMicrosecond);

// The Pitzer model on the same benchmark system (the same species, ion pairs included, so that
// the times compare with Davies' above), and on a concentrated brine: NaCl, KCl, CaCl2, MgSO4 and
// HCl each log-uniform in 0.05…1.5 mol/kg (I about 0.5 to 10 mol/kg, median about 4), the ion pairs
// the parameters fold left out.
ChemicalSystem pitzer_benchmark_system() {
  SystemOptions options;
  options.activity = ActivityModelKind::pitzer;
  options.secondary_species = {"OH^-", "HSO4^-", "HCO3^-", "CO2(aq)", "NH3(aq)", "CaSO4(aq)", "NaSO4^-", "CaCO3(aq)"};
  return ChemicalSystem(database(), {"H2O", "NaOH", "HCl", "H2SO4", "CO2", "NH3", "Ca(OH)2"}, options);
}

void pitzer_speciation_10000_cases(benchmark::State& state) {
  cold_and_warm_10000_cases(state, pitzer_benchmark_system(), {});
}
BENCHMARK(pitzer_speciation_10000_cases)->Iterations(1)->Unit(benchmark::kMillisecond);

ChemicalSystem pitzer_brine_system() {
  SystemOptions options;
  options.activity = ActivityModelKind::pitzer;
  return ChemicalSystem(database(), {"H2O", "NaCl", "KCl", "CaCl2", "MgSO4", "HCl"}, options);
}

std::vector<std::vector<double>> pitzer_brine_cases() {
  std::mt19937_64 random(20261201);
  std::uniform_real_distribution<double> exponent(std::log10(0.05), std::log10(1.5));
  std::vector<std::vector<double>> cases;
  for (int k = 0; k < 10000; ++k) {
    std::vector<double> amounts{1.0 / constants::water_molar_mass};
    for (int c = 0; c < 5; ++c) amounts.push_back(std::pow(10.0, exponent(random)));
    cases.push_back(std::move(amounts));
  }
  return cases;
}

void pitzer_brine_10000_cases(benchmark::State& state) {
  cold_and_warm_10000_cases(state, pitzer_brine_system(), {}, pitzer_brine_cases());
}
BENCHMARK(pitzer_brine_10000_cases)->Iterations(1)->Unit(benchmark::kMillisecond);

void cases_10000_in_form(benchmark::State& state, NewtonForm form, int set) {
  switch (set) {
    case 0: cold_and_warm_10000_cases(state, benchmark_system(), {}, draw_cases(10000), form); break;
    case 1: cold_and_warm_10000_cases(state, system_with_phases(), {air_co2}, draw_cases(10000), form); break;
    case 2: cold_and_warm_10000_cases(state, pitzer_benchmark_system(), {}, draw_cases(10000), form); break;
    default: cold_and_warm_10000_cases(state, pitzer_brine_system(), {}, pitzer_brine_cases(), form); break;
  }
}
BENCHMARK_CAPTURE(cases_10000_in_form, reduced_speciation, NewtonForm::reduced, 0)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(cases_10000_in_form, reduced_with_solids_and_air, NewtonForm::reduced, 1)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(cases_10000_in_form, reduced_pitzer_speciation, NewtonForm::reduced, 2)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(cases_10000_in_form, reduced_pitzer_brine, NewtonForm::reduced, 3)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(cases_10000_in_form, schur_speciation, NewtonForm::full_by_schur, 0)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(cases_10000_in_form, schur_with_solids_and_air, NewtonForm::full_by_schur, 1)->Iterations(1)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
