#include "envsift/write/value_format.hpp"

#include <charconv>
#include <cmath>
#include <cstdio>

namespace envsift {

std::string format_value(double value, bool as_float32) {
  if (std::isnan(value)) return "";
  char buf[64];
  auto res = as_float32 ? std::to_chars(buf, buf + sizeof buf, static_cast<float>(value))
                        : std::to_chars(buf, buf + sizeof buf, value);
  return std::string(buf, res.ptr);
}

std::string format_statistic(double value) {
  if (std::isnan(value)) return "";
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.6g", value);
  return buf;
}

std::string format_score(double score) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.3f", score);
  return buf;
}

double score_as_written(double score) { return std::stod(format_score(score)); }

double statistic_as_written(double statistic) {
  const std::string text = format_statistic(statistic);
  return text.empty() ? statistic : std::stod(text);
}

}  // namespace envsift
