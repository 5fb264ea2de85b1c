#include "protonflow/thermo/formula.hpp"

#include <cctype>
#include <cstdlib>
#include <fmt/format.h>

#include "protonflow/thermo/elements.hpp"
#include "protonflow/thermo/errors.hpp"

namespace protonflow::thermo {

namespace {

// Recursive-descent reader over one formula text; position() is 0-based, messages say 1-based.
class FormulaReader {
 public:
  explicit FormulaReader(std::string_view text) : text_(text) {}

  Formula read() {
    if (text_.empty()) fail("the formula is empty");
    Formula formula;
    read_part(formula.elements, 1.0);
    while (accept_hydrate_separator()) read_part(formula.elements, read_hydrate_multiplier());
    formula.charge = read_charge();
    if (!at_end()) fail(fmt::format("unexpected '{}'", text_[position_]));
    return formula;
  }

 private:
  // part := group+ ; the hydrate multiplier (the 2 of ".2H2O") multiplies the whole part.
  void read_part(std::map<std::string, double>& elements, double multiplier) {
    std::map<std::string, double> part;
    if (!at_group_start()) fail("expected an element symbol or '('");
    while (at_group_start()) read_group(part);
    for (const auto& [symbol, count] : part) elements[symbol] += multiplier * count;
  }

  // The count before a hydrate's water: whole ("2H2O") or decimal ("0.5H2O"); none means 1.
  double read_hydrate_multiplier() {
    if (!at_digit()) return 1.0;
    const std::size_t start = position_;
    while (at_digit()) ++position_;
    if (peek() == '.' && position_ + 1 < text_.size() && std::isdigit(static_cast<unsigned char>(text_[position_ + 1]))) {
      ++position_;
      while (at_digit()) ++position_;
    }
    return to_count(start);
  }

  void read_group(std::map<std::string, double>& elements) {
    std::map<std::string, double> group;
    if (peek() == '(') {
      ++position_;
      if (!at_group_start()) fail("expected an element symbol after '('");
      while (at_group_start()) read_group(group);
      if (peek() != ')') fail("missing ')'");
      ++position_;
    } else {
      group[read_element()] = 1.0;
    }
    const double count = at_digit() ? read_count() : 1.0;
    for (const auto& [symbol, n] : group) elements[symbol] += count * n;
  }

  std::string read_element() {
    const std::size_t start = position_;
    std::string symbol(1, text_[position_++]);
    while (!at_end() && std::islower(static_cast<unsigned char>(text_[position_]))) symbol += text_[position_++];
    if (!standard_atomic_weight(symbol)) {
      position_ = start;
      fail(fmt::format("unknown element '{}'", symbol));
    }
    return symbol;
  }

  // Atom counts are whole numbers: a '.' after them starts a hydrate part ("CaSO4.2H2O").
  double read_count() {
    const std::size_t start = position_;
    while (at_digit()) ++position_;
    return to_count(start);
  }

  double to_count(std::size_t start) {
    const std::string digits(text_.substr(start, position_ - start));
    std::size_t used = 0;
    double value = 0.0;
    try {
      value = std::stod(digits, &used);
    } catch (const std::exception&) {
      used = 0;
    }
    if (used != digits.size() || value <= 0.0) {
      position_ = start;
      fail(fmt::format("'{}' is not a count", digits));
    }
    return value;
  }

  // charge := '^' digits? ('+' | '-') at the very end: "Na^+", "SO4^2-"; the 1 is never written.
  int read_charge() {
    if (peek() == '+' || peek() == '-') fail_old_notation("a charge is written after '^'");
    if (peek() != '^') return 0;
    ++position_;
    const std::size_t start = position_;
    int magnitude = 0;
    // No ion carries more than a handful of charges; stop long before int overflows.
    constexpr int largest_charge = 99;
    while (at_digit()) {
      magnitude = 10 * magnitude + (text_[position_++] - '0');
      if (magnitude > largest_charge) {
        position_ = start;
        fail(fmt::format("a charge above {} is not a charge", largest_charge));
      }
    }
    const bool has_number = position_ > start;
    if ((has_number && magnitude < 2) || (peek() != '+' && peek() != '-')) {
      position_ = start;
      fail("a charge is written '^+', '^-', '^2+', '^3-' at the end of the formula (no 1, no 0)");
    }
    const int sign = text_[position_++] == '+' ? 1 : -1;
    return sign * (has_number ? magnitude : 1);
  }

  bool accept_hydrate_separator() {
    if (peek() == ':') fail_old_notation("a hydrate is written with '.'");
    if (peek() == '.') {
      ++position_;
      return true;
    }
    if (text_.substr(position_).starts_with("\u00b7")) {  // IUPAC middle dot, as in CaSO4·2H2O
      position_ += 2;
      return true;
    }
    return false;
  }

  [[noreturn]] void fail_old_notation(const std::string& what) const {
    const auto replacement = notation_replacement(text_);
    fail(replacement ? fmt::format("{}: write '{}'", what, *replacement) : what);
  }

  char peek() const { return at_end() ? '\0' : text_[position_]; }
  bool at_end() const { return position_ >= text_.size(); }
  bool at_digit() const { return std::isdigit(static_cast<unsigned char>(peek())) != 0; }
  bool at_group_start() const { return peek() == '(' || std::isupper(static_cast<unsigned char>(peek())) != 0; }

  [[noreturn]] void fail(const std::string& what) const {
    throw ThermoError(ErrorKind::bad_formula,
                      fmt::format("cannot read formula '{}': {} at character {}", text_, what, position_ + 1));
  }

  std::string_view text_;
  std::size_t position_ = 0;
};

}  // namespace

Formula parse_formula(std::string_view text) { return FormulaReader(text).read(); }

std::optional<std::string> notation_replacement(std::string_view name) {
  std::string text(name);
  bool changed = false;
  for (std::size_t colon = text.find(':'); colon != std::string::npos; colon = text.find(':', colon + 1)) {
    text[colon] = '.';
    changed = true;
  }
  // A trailing '+', '-', '+2', '-3' without '^' before it: move the sign behind the number.
  std::size_t end = text.size();
  while (end > 0 && std::isdigit(static_cast<unsigned char>(text[end - 1]))) --end;
  if (end > 1 && (text[end - 1] == '+' || text[end - 1] == '-') && text.find('^') == std::string::npos) {
    const char sign = text[end - 1];
    std::string digits = text.substr(end);
    if (digits == "1") digits.clear();
    text = text.substr(0, end - 1) + "^" + digits + sign;
    changed = true;
  }
  if (!changed) return std::nullopt;
  return text;
}

double molar_mass(const Formula& formula) {
  double grams = 0.0;
  for (const auto& [symbol, count] : formula.elements) grams += count * standard_atomic_weight(symbol).value();
  return grams * 1e-3;  // g/mol -> kg/mol
}

std::string to_string(const Formula& formula) {
  // Hill order: C, then H, then the rest alphabetically; with no carbon, all alphabetically.
  std::string text;
  const auto append = [&](const std::string& symbol, double count) {
    text += symbol;
    if (count != 1.0) text += fmt::format("{:g}", count);
  };
  const bool has_carbon = formula.elements.contains("C");
  if (has_carbon) {
    append("C", formula.elements.at("C"));
    if (formula.elements.contains("H")) append("H", formula.elements.at("H"));
  }
  for (const auto& [symbol, count] : formula.elements) {
    if (has_carbon && (symbol == "C" || symbol == "H")) continue;
    append(symbol, count);
  }
  if (formula.charge != 0) {
    text += '^';
    if (formula.charge != 1 && formula.charge != -1) text += fmt::format("{}", std::abs(formula.charge));
    text += formula.charge > 0 ? '+' : '-';
  }
  return text;
}

}  // namespace protonflow::thermo
