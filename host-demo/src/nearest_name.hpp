// "Did you mean ...?" for misspelt keys and option values.
#pragma once

#include <optional>
#include <span>
#include <string>
#include <string_view>

namespace protonflow::host {

// The candidate closest to word (case-insensitive edit distance), if it is close enough to be a
// plausible misspelling; nothing otherwise.
std::optional<std::string_view> nearest_name(std::string_view word, std::span<const std::string_view> candidates);

// "'a', 'b' or 'c'", for messages that list the valid choices.
std::string list_choices(std::span<const std::string_view> candidates);

}  // namespace protonflow::host
