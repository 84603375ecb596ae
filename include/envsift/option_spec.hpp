// One setting as both the command line and the library see it: its option name, help and
// default, how its text is read into the struct it belongs to, and the bounds or choices it
// accepts. An option is bound to a member of the settings struct of the part that uses it (a
// test's own settings, the outputs', the sampler's), as GDAL's algorithms bind an argument to a
// member; `lift` carries it up to the struct that holds that part, so the whole run's options
// are gathered in one place (settings/) without any part knowing the whole. The CLI builds its
// options from these declarations and `check_options` checks a struct against the same ones, so
// an embedding program gets the command line's checks and messages ("--z-cutoff must be above
// 0, not 0").
#pragma once
#include <functional>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace envsift {

template <class Target>
struct Option {
  std::string name;        // "z-cutoff": the option --z-cutoff, and the name in messages
  std::string value_name;  // "Z", shown in --help; empty for a switch
  std::string help;
  bool is_switch = false;  // an option without a value (set to "true" when given)
  bool multitoken = false; // takes several values; `set` appends each one
  bool required = false;   // the command cannot run without it
  // Reads the text of one value into the settings; throws UsageError when it is not of the
  // right kind ("--z-cutoff takes a number, not 'x'").
  std::function<void(Target&, const std::string&)> set = nullptr;
  // The value as written ("0.05", "nearest", "" when unset), for --help and the run manifest.
  std::function<std::string(const Target&)> get = nullptr;
  // The complaint when the value is out of its bounds or choices ("must be above 0"), else empty.
  std::function<std::string(const Target&)> check = nullptr;
};

// Bounds of a number: low/high (inclusive unless `open`), each optional.
struct Bounds {
  std::optional<double> low, high;
  bool low_open = false, high_open = false;
};
Bounds above(double low);                 // (low, ∞)
Bounds at_least(double low);              // [low, ∞)
Bounds between(double low, double high);  // [low, high]
Bounds inside(double low, double high);   // (low, high)

// The readers and words the declarations share (option_spec.cpp).
double parse_real(const std::string& option, const std::string& text);
// A whole number as an option's value: digits only (no sign), within 64 bits; else UsageError.
unsigned long long parse_whole(const std::string& option, const std::string& text);
// "must be above 0, not 0" when `value` is outside `bounds`, else empty.
std::string bounds_complaint(const Bounds& bounds, double value);
// "a,b,,c" → {a, b, c}; and back, joined by `separator`
std::vector<std::string> split_list(const std::string& text);
std::string join_list(const std::vector<std::string>& items, const std::string& separator);
// The shortest text that reads back to the same double: 0.05, not 0.050000000000000003.
std::string number_text(double value);
// Throws UsageError "--NAME COMPLAINT".
[[noreturn]] void refuse_option(const std::string& name, const std::string& complaint);

// Where an option's value lives in its struct: a member, or a function for anything deeper.
template <class Target, class Value>
using Field = std::function<Value&(Target&)>;

template <class Target, class Value>
Field<Target, Value> field(Value Target::*member) {
  return [member](Target& t) -> Value& { return t.*member; };
}

namespace detail {
// A const struct seen through a field accessor that takes a mutable one; the accessor only
// finds the member, it never changes the struct.
template <class Target, class Value>
const Value& read(const Field<Target, Value>& f, const Target& t) {
  return f(const_cast<Target&>(t));
}
}  // namespace detail

template <class T, class V>
Option<T> real_option(std::string name, std::string value_name, std::string help, Field<T, V> f, Bounds bounds = {}) {
  Option<T> o{name, std::move(value_name), std::move(help)};
  o.set = [name, f](T& t, const std::string& text) { f(t) = parse_real(name, text); };
  o.get = [f](const T& t) { return number_text(detail::read(f, t)); };
  if (bounds.low || bounds.high) o.check = [f, bounds](const T& t) { return bounds_complaint(bounds, detail::read(f, t)); };
  return o;
}
template <class T>
Option<T> real_option(std::string name, std::string value_name, std::string help, double T::*m, Bounds bounds = {}) {
  return real_option<T, double>(std::move(name), std::move(value_name), std::move(help), field(m), bounds);
}

template <class T, class V>
Option<T> count_option(std::string name, std::string value_name, std::string help, Field<T, V> f, Bounds bounds = {}) {
  Option<T> o{name, std::move(value_name), std::move(help)};
  o.set = [name, f](T& t, const std::string& text) { f(t) = static_cast<V>(parse_whole(name, text)); };
  o.get = [f](const T& t) { return std::to_string(detail::read(f, t)); };
  if (bounds.low || bounds.high)
    o.check = [f, bounds](const T& t) { return bounds_complaint(bounds, static_cast<double>(detail::read(f, t))); };
  return o;
}
template <class T, class V>
Option<T> count_option(std::string name, std::string value_name, std::string help, V T::*m, Bounds bounds = {}) {
  return count_option<T, V>(std::move(name), std::move(value_name), std::move(help), field(m), bounds);
}

template <class T>
Option<T> text_option(std::string name, std::string value_name, std::string help, Field<T, std::string> f) {
  Option<T> o{std::move(name), std::move(value_name), std::move(help)};
  o.set = [f](T& t, const std::string& text) { f(t) = text; };
  o.get = [f](const T& t) { return detail::read(f, t); };
  return o;
}
template <class T>
Option<T> text_option(std::string name, std::string value_name, std::string help, std::string T::*m) {
  return text_option<T>(std::move(name), std::move(value_name), std::move(help), field(m));
}

// A value from a fixed set of words, each standing for one value of an enum (or any type with ==):
// `{{"mad", Scale::mad}, {"skew", Scale::skew}}`. A word not in the set is refused as it is read.
template <class V>
using Choices = std::vector<std::pair<std::string, V>>;

template <class V>
std::string choice_words(const Choices<V>& choices) {
  std::string words;
  for (const auto& c : choices) words += (words.empty() ? "" : "|") + c.first;
  return words;
}

template <class V>
const std::string& choice_word(const Choices<V>& choices, const V& value) {
  for (const auto& c : choices)
    if (c.second == value) return c.first;
  static const std::string none;
  return none;
}

template <class T, class V>
Option<T> choice_option(std::string name, std::string help, Field<T, V> f, Choices<V> choices) {
  const std::string words = choice_words(choices);
  Option<T> o{name, words, std::move(help)};
  o.set = [name, f, choices, words](T& t, const std::string& text) {
    for (const auto& c : choices)
      if (c.first == text) {
        f(t) = c.second;
        return;
      }
    refuse_option(name, "must be one of " + words + ", not '" + text + "'");
  };
  o.get = [f, choices](const T& t) { return choice_word(choices, detail::read(f, t)); };
  o.check = [f, choices, words](const T& t) {
    return choice_word(choices, detail::read(f, t)).empty() ? "must be one of " + words : std::string();
  };
  return o;
}
template <class T, class V>
Option<T> choice_option(std::string name, std::string help, V T::*m, Choices<V> choices) {
  return choice_option<T, V>(std::move(name), std::move(help), field(m), std::move(choices));
}

template <class T>
Option<T> list_option(std::string name, std::string value_name, std::string help, Field<T, std::vector<std::string>> f) {
  Option<T> o{std::move(name), std::move(value_name), std::move(help)};
  o.multitoken = true;
  o.set = [f](T& t, const std::string& text) { f(t).push_back(text); };
  o.get = [f](const T& t) { return join_list(detail::read(f, t), " "); };
  return o;
}
template <class T>
Option<T> list_option(std::string name, std::string value_name, std::string help, std::vector<std::string> T::*m) {
  return list_option<T>(std::move(name), std::move(value_name), std::move(help), field(m));
}

// A comma-separated list in one value: "a,b,c".
template <class T>
Option<T> comma_list_option(std::string name, std::string value_name, std::string help, std::vector<std::string> T::*m) {
  Option<T> o{std::move(name), std::move(value_name), std::move(help)};
  o.set = [m](T& t, const std::string& text) { t.*m = split_list(text); };
  o.get = [m](const T& t) { return join_list(t.*m, ","); };
  return o;
}

template <class T>
Option<T> switch_option(std::string name, std::string help, Field<T, bool> f) {
  Option<T> o{std::move(name), "", std::move(help)};
  o.is_switch = true;
  o.set = [f](T& t, const std::string& text) { f(t) = text != "false"; };
  o.get = [f](const T& t) { return std::string(detail::read(f, t) ? "true" : "false"); };
  return o;
}
template <class T>
Option<T> switch_option(std::string name, std::string help, bool T::*m) {
  return switch_option<T>(std::move(name), std::move(help), field(m));
}

// An option of a part carried up to the struct that holds the part.
template <class Outer, class Inner>
Option<Outer> lift(const Option<Inner>& o, Field<Outer, Inner> part) {
  Option<Outer> up{o.name, o.value_name, o.help, o.is_switch, o.multitoken, o.required};
  if (o.set) up.set = [set = o.set, part](Outer& s, const std::string& text) { set(part(s), text); };
  if (o.get) up.get = [get = o.get, part](const Outer& s) { return get(detail::read(part, s)); };
  if (o.check) up.check = [check = o.check, part](const Outer& s) { return check(detail::read(part, s)); };
  return up;
}
template <class Outer, class Inner>
std::vector<Option<Outer>> lift(const std::vector<Option<Inner>>& options, Field<Outer, Inner> part) {
  std::vector<Option<Outer>> up;
  for (const auto& o : options) up.push_back(lift(o, part));
  return up;
}
template <class Outer, class Inner>
std::vector<Option<Outer>> lift(const std::vector<Option<Inner>>& options, Inner Outer::*member) {
  return lift(options, field(member));
}

// Throws UsageError for the first declared option whose value is missing or out of bounds.
template <class T>
void check_options(const std::vector<Option<T>>& options, const T& settings) {
  for (const auto& o : options) {
    if (o.required && o.get(settings).empty()) refuse_option(o.name, "is required");
    if (!o.check) continue;
    const std::string complaint = o.check(settings);
    if (!complaint.empty()) refuse_option(o.name, complaint);
  }
}

}  // namespace envsift
