#include "envsift/write/value_format.hpp"

#include <charconv>
#include <cmath>

namespace envsift {

// C++17 [charconv.to.chars]: to_chars with a format and precision writes what printf would with
// the matching conversion in the "C" locale, so these are byte for byte the %.6g and %.3f the
// outputs have always had.
char* put_value(char* out, double value, bool as_float32) {
  if (std::isnan(value)) return out;
  return (as_float32 ? std::to_chars(out, out + kNumberChars, static_cast<float>(value))
                     : std::to_chars(out, out + kNumberChars, value))
      .ptr;
}

char* put_statistic(char* out, double value) {
  if (std::isnan(value)) return out;
  return std::to_chars(out, out + kNumberChars, value, std::chars_format::general, 6).ptr;
}

char* put_probability(char* out, double p) {
  if (std::isnan(p)) return out;
  return std::to_chars(out, out + kNumberChars, p, std::chars_format::general, 3).ptr;
}

char* put_score(char* out, double score) {
  return std::to_chars(out, out + kNumberChars, score, std::chars_format::fixed, 3).ptr;
}

std::string format_value(double value, bool as_float32) {
  char buf[kNumberChars];
  return std::string(buf, put_value(buf, value, as_float32));
}

std::string format_statistic(double value) {
  char buf[kNumberChars];
  return std::string(buf, put_statistic(buf, value));
}

std::string format_score(double score) {
  char buf[kNumberChars];
  return std::string(buf, put_score(buf, score));
}

double score_as_written(double score) { return std::stod(format_score(score)); }

double statistic_as_written(double statistic) {
  const std::string text = format_statistic(statistic);
  return text.empty() ? statistic : std::stod(text);
}

}  // namespace envsift
