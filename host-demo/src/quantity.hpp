// Quantities written as text ("25 degC", "101.325 kPa", "50 mmol/kg"), converted to SI with
// UDUNITS-2 so that every unit its database knows is accepted and a wrong dimension is caught.
#pragma once

#include <memory>
#include <stdexcept>
#include <string>
#include <string_view>

struct ut_system;  // from <udunits2.h>, kept out of this header

namespace protonflow::host {

class QuantityError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// A number and the unit text after it, as written; unit is empty for a bare number.
struct QuantityText {
  double value = 0.0;
  std::string unit;
};

// Splits "25 degC" into 25 and "degC". Throws QuantityError unless the text starts with a finite
// number.
QuantityText split_quantity(std::string_view text);

// The UDUNITS-2 unit database, read once and shared by every conversion.
class UnitConverter {
 public:
  UnitConverter();  // throws QuantityError if the database cannot be read

  // value in unit, expressed in target_unit (an SI unit such as "K", "Pa", "mol/kg", "1").
  // Throws QuantityError for a unit UDUNITS-2 does not know or one of another dimension.
  double convert(double value, std::string_view unit, std::string_view target_unit) const;

 private:
  struct SystemDeleter {
    void operator()(ut_system* system) const noexcept;
  };
  std::unique_ptr<ut_system, SystemDeleter> system_;
};

}  // namespace protonflow::host
