#include "envsift/read/coordinates.hpp"

#include <charconv>
#include <cmath>

#include "envsift/reason_codes.hpp"

namespace envsift {

std::string_view trim(std::string_view t) {
  const char* space = " \t\r\n\v\f";
  auto b = t.find_first_not_of(space);
  if (b == std::string_view::npos) return {};
  auto e = t.find_last_not_of(space);
  return t.substr(b, e - b + 1);
}

ParsedNumber parse_number(std::string_view text) {
  ParsedNumber out;
  text = trim(text);
  if (text.empty()) {
    out.problem = "empty";
    return out;
  }
  std::string_view digits = text;
  if (digits.front() == '+') digits.remove_prefix(1);  // from_chars rejects a leading '+'
  auto [end, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), out.value);
  if (ec == std::errc::result_out_of_range) {
    out.problem = reason::coord_not_finite;
  } else if (ec != std::errc() || end != digits.data() + digits.size()) {
    out.problem = reason::coord_not_numeric;
  } else if (!std::isfinite(out.value)) {
    out.problem = reason::coord_not_finite;
  }
  return out;
}

ParsedNumber parse_coordinate(std::string_view text, Axis axis) {
  ParsedNumber out = parse_number(text);
  if (out.problem == "empty") {
    out.problem = reason::coord_missing;
  } else if (out.problem.empty()) {
    const double limit = axis == Axis::latitude ? 90.0 : 180.0;
    if (std::fabs(out.value) > limit) out.problem = reason::coord_out_of_range;
  }
  return out;
}

}  // namespace envsift
