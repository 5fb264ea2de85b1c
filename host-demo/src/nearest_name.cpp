#include "nearest_name.hpp"

#include <algorithm>
#include <cctype>
#include <numeric>
#include <vector>

#include <fmt/format.h>

namespace protonflow::host {
namespace {

char lower(char c) { return static_cast<char>(std::tolower(static_cast<unsigned char>(c))); }

// Levenshtein distance with one row of memory; inputs are short keys.
std::size_t edit_distance(std::string_view a, std::string_view b) {
  std::vector<std::size_t> row(b.size() + 1);
  std::iota(row.begin(), row.end(), std::size_t{0});
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diagonal = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t above = row[j];
      const std::size_t substitution = diagonal + (lower(a[i - 1]) == lower(b[j - 1]) ? 0 : 1);
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, substitution});
      diagonal = above;
    }
  }
  return row[b.size()];
}

}  // namespace

std::optional<std::string_view> nearest_name(std::string_view word, std::span<const std::string_view> candidates) {
  std::optional<std::string_view> best;
  std::size_t best_distance = 0;
  for (const std::string_view candidate : candidates) {
    const std::size_t distance = edit_distance(word, candidate);
    if (!best || distance < best_distance) {
      best = candidate;
      best_distance = distance;
    }
  }
  // A third of the longer word, at least 2: catches transpositions and dropped letters without
  // suggesting an unrelated key.
  const std::size_t longest = best ? std::max(word.size(), best->size()) : 0;
  if (best && best_distance <= std::max<std::size_t>(2, longest / 3)) {
    return best;
  }
  return std::nullopt;
}

std::string list_choices(std::span<const std::string_view> candidates) {
  std::string text;
  for (std::size_t i = 0; i < candidates.size(); ++i) {
    if (i > 0) {
      text += (i + 1 == candidates.size()) ? " or " : ", ";
    }
    text += fmt::format("'{}'", candidates[i]);
  }
  return text;
}

}  // namespace protonflow::host
