#include <protonflow/units/phase_placement.hpp>

#include <Eigen/Dense>

#include <algorithm>
#include <cmath>
#include <utility>

#include <protonflow/units/message_text.hpp>

namespace protonflow::units {

namespace {

// A phase species (a solid or a gas) is written onto the slate as a combination of at most this
// many components, found once at create.
constexpr std::size_t max_combination = 3;

// Snaps a coefficient found by least squares onto a simple fraction (denominator up to 12), the
// form every stoichiometric coefficient of the data has.
double snap(double x) {
  for (int d = 1; d <= 12; ++d) {
    const double scaled = x * d;
    if (std::abs(scaled - std::round(scaled)) < 1e-9 * d) return std::round(scaled) / d;
  }
  return x;
}

std::vector<double> target_of(const thermo::PhaseSpecies& species) {
  std::vector<double> target = species.stoichiometry;
  target.push_back(species.water_coefficient);
  return target;
}

std::string no_combination_reason(const std::string& name) {
  return name + " is no non-negative combination of at most " + std::to_string(max_combination) +
         " slate components; add a component of its formula to the slate";
}

}  // namespace

PhasePlacement::PhasePlacement(std::string_view unit_type, const thermo::ChemicalSystem& system, const unit::Slate& slate)
    : unit_type_(unit_type) {
  for (const thermo::PhaseSpecies& solid : system.solids()) {
    Placement p;
    p.name = solid.name;
    const auto row = std::ranges::find(slate.solids, solid.name);
    if (row == slate.solids.end()) {
      p.unplaced_reason = "the slate has no solid phase '" + solid.name + "'; add it to the slate's solids";
    } else {
      p.row = PFU_FIRST_SOLID_ROW + static_cast<std::size_t>(row - slate.solids.begin());
      p.combinations = combinations_for(system, target_of(solid));
      if (p.combinations.empty()) p.unplaced_reason = no_combination_reason(solid.name);
    }
    solids_.push_back(std::move(p));
  }
  for (const thermo::PhaseSpecies& gas : system.phase_gases()) {
    Placement p;
    p.name = gas.name;
    p.row = PFU_GAS_ROW;
    p.combinations = combinations_for(system, target_of(gas));
    if (p.combinations.empty()) p.unplaced_reason = no_combination_reason(gas.name);
    gases_.push_back(std::move(p));
  }
  remainder_.assign(slate.components.size(), 0.0);
}

// Every non-negative combination of at most max_combination slate components whose basis
// composition (and water) equals the target exactly; none contains another. Ordered by size, then
// by the components' order on the slate.
std::vector<PhasePlacement::Combination> PhasePlacement::combinations_for(const thermo::ChemicalSystem& system,
                                                                          const std::vector<double>& target) {
  const std::size_t rows = target.size();
  const std::size_t nc = system.components().size();
  Eigen::MatrixXd a(rows, nc);
  for (std::size_t c = 0; c < nc; ++c) {
    for (std::size_t b = 0; b + 1 < rows; ++b) a(static_cast<Eigen::Index>(b), static_cast<Eigen::Index>(c)) = system.composition(c)[b];
    a(static_cast<Eigen::Index>(rows - 1), static_cast<Eigen::Index>(c)) = system.water_in(c);
  }
  Eigen::VectorXd v(rows);
  for (std::size_t r = 0; r < rows; ++r) v(static_cast<Eigen::Index>(r)) = target[r];
  const double scale = 1.0 + v.lpNorm<Eigen::Infinity>();

  std::vector<Combination> found;
  std::vector<std::vector<std::size_t>> supports;
  const auto try_support = [&](const std::vector<std::size_t>& s) {
    for (const auto& known : supports) {
      if (std::ranges::includes(s, known)) return;  // a smaller combination already covers it
    }
    Eigen::MatrixXd sub(rows, s.size());
    for (std::size_t j = 0; j < s.size(); ++j) sub.col(static_cast<Eigen::Index>(j)) = a.col(static_cast<Eigen::Index>(s[j]));
    const Eigen::VectorXd x = sub.colPivHouseholderQr().solve(v);
    Combination full(nc, 0.0);
    for (std::size_t j = 0; j < s.size(); ++j) {
      const double coefficient = snap(x(static_cast<Eigen::Index>(j)));
      if (!(coefficient > 0.0)) return;
      full[s[j]] = coefficient;
    }
    Eigen::VectorXd snapped(s.size());
    for (std::size_t j = 0; j < s.size(); ++j) snapped(static_cast<Eigen::Index>(j)) = full[s[j]];
    if ((sub * snapped - v).lpNorm<Eigen::Infinity>() > 1e-12 * scale) return;
    found.push_back(std::move(full));
    supports.push_back(s);
  };
  // Supports of size k in lexicographic order of slate indices.
  for (std::size_t k = 1; k <= std::min(max_combination, nc); ++k) {
    std::vector<std::size_t> s(k);
    for (std::size_t j = 0; j < k; ++j) s[j] = j;
    while (true) {
      try_support(s);
      std::size_t j = k;
      while (j > 0 && s[j - 1] == nc - k + (j - 1)) --j;
      if (j == 0) break;
      ++s[j - 1];
      for (std::size_t i = j; i < k; ++i) s[i] = s[i - 1] + 1;
    }
  }
  return found;
}

void PhasePlacement::write(std::span<const double> totals, const thermo::Speciation& state, unit::OutletState& outlet,
                           unit::Warnings& warnings) {
  std::ranges::fill(outlet.flows, 0.0);
  std::ranges::copy(totals, remainder_.begin());
  for (std::size_t s = 0; s < solids_.size(); ++s) place(solids_[s], state.solid_amount[s], totals, outlet, warnings);
  if (state.gas_phase_present) {
    for (std::size_t g = 0; g < gases_.size(); ++g) place(gases_[g], state.gas_amount[g], totals, outlet, warnings);
  }
  for (std::size_t c = 0; c < remainder_.size(); ++c) outlet.flow(PFU_AQUEOUS_ROW, c) = remainder_[c];
}

// Moves amount × the first combination the remaining totals can cover into the species' row.
void PhasePlacement::place(const Placement& p, double amount, std::span<const double> totals, unit::OutletState& outlet,
                           unit::Warnings& warnings) {
  if (amount <= 0.0) return;
  const std::string head =
      "unit '" + unit_type_ + "': " + p.name + " (" + number_text(amount, 4) + " mol/s) is present in the product, but ";
  if (p.combinations.empty()) {
    warnings.add(head + p.unplaced_reason + ". It is carried in the aqueous row: totals are right, the phase split is not");
    return;
  }
  for (const Combination& combination : p.combinations) {
    bool fits = true;
    for (std::size_t c = 0; c < combination.size() && fits; ++c) {
      // Up to 1e-10 of a component's total may be missing: the engine's mass-balance tolerance.
      fits = remainder_[c] - amount * combination[c] >= -1e-10 * totals[c];
    }
    if (!fits) continue;
    for (std::size_t c = 0; c < combination.size(); ++c) {
      if (combination[c] == 0.0) continue;
      const double moved = std::min(amount * combination[c], remainder_[c]);
      outlet.flow(p.row, c) += moved;
      remainder_[c] -= moved;
    }
    return;
  }
  warnings.add(head + "no way of writing it on the slate's components leaves the aqueous row non-negative. It is carried "
                      "in the aqueous row: totals are right, the phase split is not");
}

}  // namespace protonflow::units
