#include "ferrous_aeration.hpp"

#include <protonflow/thermo/errors.hpp>
#include <protonflow/unit_module.hpp>
#include <protonflow/units/message_text.hpp>

#include <Eigen/Dense>

#include <algorithm>
#include <cmath>
#include <ranges>

namespace protonflow::units {

namespace {

// The reaction is carried on at most this many slate components (FeCl2, Fe(OH)3, HCl and H2O take four).
constexpr std::size_t max_support = 5;

// Snaps a coefficient found by least squares onto a simple fraction (denominator up to 12): the
// reaction's coefficients are quarters and halves, the components' integers.
double snap(double x) {
  for (int d = 1; d <= 12; ++d) {
    const double scaled = x * d;
    if (std::abs(scaled - std::round(scaled)) < 1e-9 * d) return std::round(scaled) / d;
  }
  return x;
}

}  // namespace

FerrousAeration::FerrousAeration(std::string_view unit_type, const thermo::ChemicalSystem& system, double fraction)
    : prefix_("unit '" + std::string(unit_type) + "': parameter '" + parameter + "' " + number_text(fraction) + ": "),
      system_(&system),
      fraction_(fraction) {
  if (!active()) return;
  std::size_t ferric = 0;
  try {
    ferrous_ = system.index_of_solute("Fe^2+");
  } catch (const thermo::ThermoError&) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix_ + "the slate has no Fe(II) component (FeSO4, FeCl2): there is no ferrous iron to oxidise");
  }
  try {
    ferric = system.index_of_solute("Fe^3+");
  } catch (const thermo::ThermoError&) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix_ + "the slate has no Fe(III) component to receive the oxidised iron; add Fe(OH)3 (or FeCl3, "
                                    "Fe2(SO4)3) to the slate's components");
  }

  // The basis change per mol of Fe: -1 Fe^2+, +1 Fe^3+, -1 H^+ (solute 0), +1/2 H2O (the last row).
  const std::size_t basis = system.basis_count();
  const std::size_t rows = basis + 1;
  const std::size_t nc = system.components().size();
  Eigen::VectorXd target = Eigen::VectorXd::Zero(static_cast<Eigen::Index>(rows));
  target(static_cast<Eigen::Index>(ferrous_)) = -1.0;
  target(static_cast<Eigen::Index>(ferric)) = 1.0;
  target(0) = -1.0;
  target(static_cast<Eigen::Index>(basis)) = 0.5;
  Eigen::MatrixXd a(rows, nc);
  for (std::size_t c = 0; c < nc; ++c) {
    for (std::size_t b = 0; b < basis; ++b) a(static_cast<Eigen::Index>(b), static_cast<Eigen::Index>(c)) = system.composition(c)[b];
    a(static_cast<Eigen::Index>(basis), static_cast<Eigen::Index>(c)) = system.water_in(c);
  }

  // Every combination of at most max_support components that carries the change exactly, none
  // containing another; by size, then by slate order. Which one a feed uses depends on what it
  // holds (apply): FeCl2 + FeCl3 needs acid to take from, FeCl2 + Fe(OH)3 only water.
  std::vector<std::vector<std::size_t>> supports;
  const auto try_support = [&](const std::vector<std::size_t>& s) {
    for (const auto& known : supports) {
      if (std::ranges::includes(s, known)) return;
    }
    Eigen::MatrixXd sub(rows, s.size());
    for (std::size_t j = 0; j < s.size(); ++j) sub.col(static_cast<Eigen::Index>(j)) = a.col(static_cast<Eigen::Index>(s[j]));
    const Eigen::VectorXd x = sub.colPivHouseholderQr().solve(target);
    Eigen::VectorXd snapped(static_cast<Eigen::Index>(s.size()));
    for (std::size_t j = 0; j < s.size(); ++j) {
      snapped(static_cast<Eigen::Index>(j)) = snap(x(static_cast<Eigen::Index>(j)));
      if (snapped(static_cast<Eigen::Index>(j)) == 0.0) return;  // a smaller support serves
    }
    if ((sub * snapped - target).lpNorm<Eigen::Infinity>() > 1e-12) return;
    Change change(nc, 0.0);
    for (std::size_t j = 0; j < s.size(); ++j) change[s[j]] = snapped(static_cast<Eigen::Index>(j));
    changes_.push_back(std::move(change));
    supports.push_back(s);
  };
  for (std::size_t k = 1; k <= std::min(max_support, nc); ++k) {
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
  if (changes_.empty()) {
    throw unit::UnitError(PFU_INVALID_PARAMETER,
                          prefix_ + "no combination of at most " + std::to_string(max_support) +
                              " slate components carries Fe^2+ + 1/4 O2 + H^+ -> Fe^3+ + 1/2 H2O; add Fe(OH)3 and H2O "
                              "to the slate's components");
  }
}

void FerrousAeration::apply(std::span<const double> feed, std::span<double> aerated) {
  std::ranges::copy(feed, aerated.begin());
  oxidised_ = 0.0;
  if (!active()) return;
  double ferrous = 0.0;
  for (std::size_t c = 0; c < feed.size(); ++c) ferrous += system_->composition(c)[ferrous_] * feed[c];
  if (!(ferrous > 0.0)) {
    throw unit::UnitError(PFU_BAD_INLET, prefix_ + "the feed carries no Fe(II) (Fe^2+ total " + number_text(ferrous) +
                                             " mol/s): there is nothing to aerate; set it to 0 or feed ferrous iron");
  }
  const double amount = fraction_ * ferrous;
  for (const Change& change : changes_) {
    // Up to 1e-12 of a component's flow may go below zero: round-off when all of it is oxidised.
    bool fits = true;
    for (std::size_t c = 0; c < feed.size() && fits; ++c) {
      fits = feed[c] + amount * change[c] >= -1e-12 * (std::abs(feed[c]) + amount);
    }
    if (!fits) continue;
    for (std::size_t c = 0; c < feed.size(); ++c) aerated[c] = std::max(0.0, feed[c] + amount * change[c]);
    oxidised_ = amount;
    return;
  }
  throw unit::UnitError(PFU_BAD_INLET,
                        prefix_ + "oxidising " + number_text(amount) +
                            " mol/s of Fe(II) would leave a component of the feed with a negative flow (the H^+ it takes "
                            "has to come from the feed's acid); add Fe(OH)3 to the slate's components, or feed acid");
}

}  // namespace protonflow::units
