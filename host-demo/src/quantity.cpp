#include "quantity.hpp"

#include <udunits2.h>

#include <charconv>
#include <cmath>
#include <string>

#include <fmt/format.h>

namespace protonflow::host {
namespace {

bool is_space(char c) { return c == ' ' || c == '\t'; }

std::string_view trim(std::string_view text) {
  while (!text.empty() && is_space(text.front())) text.remove_prefix(1);
  while (!text.empty() && is_space(text.back())) text.remove_suffix(1);
  return text;
}

struct UnitDeleter {
  void operator()(ut_unit* unit) const noexcept { ut_free(unit); }
};
using UnitHandle = std::unique_ptr<ut_unit, UnitDeleter>;

struct ConverterDeleter {
  void operator()(cv_converter* converter) const noexcept { cv_free(converter); }
};
using ConverterHandle = std::unique_ptr<cv_converter, ConverterDeleter>;

UnitHandle parse_unit(const ut_system* system, std::string_view text) {
  // ut_parse needs a NUL-terminated string; UTF-8 so that "°C" works as well as "degC".
  const std::string owned(text);
  UnitHandle unit(ut_parse(system, owned.c_str(), UT_UTF8));
  if (!unit) {
    throw QuantityError(fmt::format("UDUNITS-2 does not know the unit '{}'", text));
  }
  return unit;
}

}  // namespace

QuantityText split_quantity(std::string_view text) {
  const std::string_view trimmed = trim(text);
  double value = 0.0;
  const char* const end = trimmed.data() + trimmed.size();
  const auto [after_number, error] = std::from_chars(trimmed.data(), end, value);
  if (error != std::errc{} || !std::isfinite(value)) {
    throw QuantityError(fmt::format("'{}' does not start with a number", text));
  }
  const std::string_view unit = trim(std::string_view(after_number, static_cast<std::size_t>(end - after_number)));
  return QuantityText{value, std::string(unit)};
}

void UnitConverter::SystemDeleter::operator()(ut_system* system) const noexcept { ut_free_system(system); }

UnitConverter::UnitConverter() {
  // UDUNITS-2 prints its own diagnostics to stderr by default; we report errors ourselves.
  ut_set_error_message_handler(ut_ignore);
  system_.reset(ut_read_xml(nullptr));
  if (!system_) {
    throw QuantityError("cannot read the UDUNITS-2 unit database (set UDUNITS2_XML_PATH to udunits2.xml)");
  }
}

double UnitConverter::convert(double value, std::string_view unit, std::string_view target_unit) const {
  const UnitHandle from = parse_unit(system_.get(), unit);
  const UnitHandle to = parse_unit(system_.get(), target_unit);
  if (ut_are_convertible(from.get(), to.get()) == 0) {
    throw QuantityError(fmt::format("'{}' cannot be converted to {}", unit, target_unit));
  }
  const ConverterHandle converter(ut_get_converter(from.get(), to.get()));
  if (!converter) {
    throw QuantityError(fmt::format("no conversion from '{}' to {}", unit, target_unit));
  }
  return cv_convert_double(converter.get(), value);
}

}  // namespace protonflow::host
