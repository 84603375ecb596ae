// Turning coordinate text into numbers, with a reason code instead of a crash for bad values.
#pragma once
#include <string>
#include <string_view>

namespace envsift {

enum class Axis { longitude, latitude };

struct ParsedNumber {
  double value = 0;
  std::string problem;  // empty when `value` is usable, else a reason code
};

// Decimal degrees: surrounding spaces are ignored; empty → coord_missing; text that is not
// entirely a number → coord_not_numeric; NaN, inf or overflow → coord_not_finite;
// outside [-90, 90] (latitude) or [-180, 180] (longitude) → coord_out_of_range.
ParsedNumber parse_coordinate(std::string_view text, Axis axis);

// A plain decimal number (no range check). Empty text gives problem "empty".
ParsedNumber parse_number(std::string_view text);

std::string_view trim(std::string_view text);

}  // namespace envsift
