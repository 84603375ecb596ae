#include "envsift/option_spec.hpp"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "envsift/errors.hpp"

namespace envsift {
namespace {

std::string bound_words(const Bounds& b) {
  auto low = [&] { return (b.low_open ? "above " : "at least ") + number_text(*b.low); };
  auto high = [&] { return (b.high_open ? "below " : "at most ") + number_text(*b.high); };
  if (b.low && b.high && !b.low_open && !b.high_open)
    return "between " + number_text(*b.low) + " and " + number_text(*b.high);
  if (b.low && b.high) return low() + " and " + high();
  return b.low ? low() : high();
}

bool within(const Bounds& b, double v) {
  if (b.low && (b.low_open ? !(v > *b.low) : !(v >= *b.low))) return false;
  if (b.high && (b.high_open ? !(v < *b.high) : !(v <= *b.high))) return false;
  return true;
}

}  // namespace

double parse_real(const std::string& option, const std::string& text) {
  char* end = nullptr;
  errno = 0;
  const double v = std::strtod(text.c_str(), &end);
  if (text.empty() || *end != '\0' || errno == ERANGE || !std::isfinite(v))
    throw UsageError("--" + option + " takes a number, not '" + text + "'");
  return v;
}

unsigned long long parse_whole(const std::string& option, const std::string& text) {
  char* end = nullptr;
  errno = 0;
  const unsigned long long v = std::strtoull(text.c_str(), &end, 10);
  if (text.empty() || text[0] == '-' || *end != '\0' || errno == ERANGE)
    throw UsageError("--" + option + " takes a whole number (0, 1, 2, ...), not '" + text + "'");
  return v;
}

std::string bounds_complaint(const Bounds& bounds, double value) {
  return within(bounds, value) ? std::string() : "must be " + bound_words(bounds) + ", not " + number_text(value);
}

void refuse_option(const std::string& name, const std::string& complaint) {
  throw UsageError("--" + name + " " + complaint);
}

Bounds above(double low) { return {low, std::nullopt, true, false}; }
Bounds at_least(double low) { return {low, std::nullopt, false, false}; }
Bounds between(double low, double high) { return {low, high, false, false}; }
Bounds inside(double low, double high) { return {low, high, true, true}; }

std::vector<std::string> split_list(const std::string& text) {
  std::vector<std::string> items;
  std::size_t start = 0;
  while (start <= text.size()) {
    const std::size_t comma = std::min(text.find(',', start), text.size());
    if (comma > start) items.push_back(text.substr(start, comma - start));
    start = comma + 1;
  }
  return items;
}

std::string join_list(const std::vector<std::string>& items, const std::string& separator) {
  std::string joined;
  for (const auto& item : items) joined += (joined.empty() ? "" : separator) + item;
  return joined;
}

std::string number_text(double value) {
  char buf[40];
  if (value == std::floor(value) && std::fabs(value) < 1e15) {  // 25000, not 2.5e+04
    std::snprintf(buf, sizeof buf, "%.0f", value);
    return buf;
  }
  for (int digits = 1; digits <= 17; ++digits) {
    std::snprintf(buf, sizeof buf, "%.*g", digits, value);
    if (std::strtod(buf, nullptr) == value) break;
  }
  return buf;
}

}  // namespace envsift
