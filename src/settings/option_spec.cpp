#include "envsift/settings/option_spec.hpp"

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <algorithm>
#include <cstdlib>

#include "envsift/errors.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {
namespace {

// A const settings struct seen through a field accessor that takes a mutable one.
template <class T>
const T& read_field(const std::function<T&(ScreenSettings&)>& field, const ScreenSettings& s) {
  return field(const_cast<ScreenSettings&>(s));
}

double parse_real(const std::string& option, const std::string& text) {
  char* end = nullptr;
  errno = 0;
  const double v = std::strtod(text.c_str(), &end);
  if (text.empty() || *end != '\0' || errno == ERANGE || !std::isfinite(v))
    throw UsageError("--" + option + " takes a number, not '" + text + "'");
  return v;
}


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

std::function<std::string(const ScreenSettings&)> bounds_check(std::function<double(const ScreenSettings&)> value,
                                                               Bounds bounds) {
  if (!bounds.low && !bounds.high) return nullptr;
  return [value = std::move(value), bounds](const ScreenSettings& s) {
    const double v = value(s);
    return within(bounds, v) ? std::string() : "must be " + bound_words(bounds) + ", not " + number_text(v);
  };
}

}  // namespace

unsigned long long parse_whole(const std::string& option, const std::string& text) {
  char* end = nullptr;
  errno = 0;
  const unsigned long long v = std::strtoull(text.c_str(), &end, 10);
  if (text.empty() || text[0] == '-' || *end != '\0' || errno == ERANGE)
    throw UsageError("--" + option + " takes a whole number (0, 1, 2, ...), not '" + text + "'");
  return v;
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

OptionSpec real_option(std::string name, std::string value_name, std::string help,
                       std::function<double&(ScreenSettings&)> field, Bounds bounds) {
  OptionSpec o{name, std::move(value_name), std::move(help)};
  o.set = [name, field](ScreenSettings& s, const std::string& text) { field(s) = parse_real(name, text); };
  o.get = [field](const ScreenSettings& s) { return number_text(read_field(field, s)); };
  o.check = bounds_check([field](const ScreenSettings& s) { return read_field(field, s); }, bounds);
  return o;
}

OptionSpec count_option(std::string name, std::string value_name, std::string help,
                        std::function<std::size_t&(ScreenSettings&)> field, Bounds bounds) {
  OptionSpec o{name, std::move(value_name), std::move(help)};
  o.set = [name, field](ScreenSettings& s, const std::string& text) {
    field(s) = static_cast<std::size_t>(parse_whole(name, text));
  };
  o.get = [field](const ScreenSettings& s) { return std::to_string(read_field(field, s)); };
  o.check = bounds_check([field](const ScreenSettings& s) { return static_cast<double>(read_field(field, s)); }, bounds);
  return o;
}

OptionSpec seed_option(std::string name, std::string value_name, std::string help,
                       std::function<unsigned long long&(ScreenSettings&)> field) {
  OptionSpec o{name, std::move(value_name), std::move(help)};
  o.set = [name, field](ScreenSettings& s, const std::string& text) { field(s) = parse_whole(name, text); };
  o.get = [field](const ScreenSettings& s) { return std::to_string(read_field(field, s)); };
  return o;
}

OptionSpec text_option(std::string name, std::string value_name, std::string help,
                       std::function<std::string&(ScreenSettings&)> field) {
  OptionSpec o{name, std::move(value_name), std::move(help)};
  o.set = [field](ScreenSettings& s, const std::string& text) { field(s) = text; };
  o.get = [field](const ScreenSettings& s) { return read_field(field, s); };
  return o;
}

OptionSpec choice_option(std::string name, std::string help, std::function<std::string&(ScreenSettings&)> field,
                         std::vector<std::string> choices) {
  std::string value_name;
  for (const auto& c : choices) value_name += (value_name.empty() ? "" : "|") + c;
  OptionSpec o = text_option(std::move(name), value_name, std::move(help), field);
  o.check = [field, choices, value_name](const ScreenSettings& s) {
    const std::string& v = read_field(field, s);
    for (const auto& c : choices)
      if (v == c) return std::string();
    return "must be one of " + value_name + ", not '" + v + "'";
  };
  return o;
}

OptionSpec list_option(std::string name, std::string value_name, std::string help,
                       std::function<std::vector<std::string>&(ScreenSettings&)> field) {
  OptionSpec o{name, std::move(value_name), std::move(help)};
  o.multitoken = true;
  o.set = [field](ScreenSettings& s, const std::string& text) { field(s).push_back(text); };
  o.get = [field](const ScreenSettings& s) {
    std::string joined;
    for (const auto& item : read_field(field, s)) joined += (joined.empty() ? "" : " ") + item;
    return joined;
  };
  return o;
}

OptionSpec switch_option(std::string name, std::string help, std::function<bool&(ScreenSettings&)> field) {
  OptionSpec o{name, "", std::move(help)};
  o.is_switch = true;
  o.set = [field](ScreenSettings& s, const std::string& text) { field(s) = text != "false"; };
  o.get = [field](const ScreenSettings& s) { return std::string(read_field(field, s) ? "true" : "false"); };
  return o;
}

void check_options(const std::vector<OptionSpec>& options, const ScreenSettings& settings) {
  for (const auto& o : options) {
    if (o.required && o.get(settings).empty()) throw UsageError("--" + o.name + " is required");
    if (!o.check) continue;
    const std::string complaint = o.check(settings);
    if (!complaint.empty()) throw UsageError("--" + o.name + " " + complaint);
  }
}

}  // namespace envsift
