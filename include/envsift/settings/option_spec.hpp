// One setting as both the command line and the library see it: its option name, help and
// default, how its text is read into a settings struct, and the bounds or choices it accepts.
// The CLI builds its options from these declarations; `validate` checks a settings struct
// against the same declarations, so an embedding program gets the command line's checks and
// messages ("--z-cutoff must be above 0, not 0").
#pragma once
#include <functional>
#include <optional>
#include <string>
#include <vector>

namespace envsift {

struct ScreenSettings;

struct OptionSpec {
  std::string name;        // "z-cutoff": the option --z-cutoff, and the name in messages
  std::string value_name;  // "Z", shown in --help; empty for a switch
  std::string help;
  bool is_switch = false;  // an option without a value (set to "true" when given)
  bool multitoken = false; // takes several values; `set` appends each one
  bool required = false;   // the command cannot run without it
  // Reads the text of one value into the settings; throws UsageError when it is not of the
  // right kind ("--z-cutoff takes a number, not 'x'").
  std::function<void(ScreenSettings&, const std::string&)> set = nullptr;
  // The value as written ("0.05", "nearest", "" when unset), for --help and the run manifest.
  std::function<std::string(const ScreenSettings&)> get = nullptr;
  // The complaint when the value is out of its bounds or choices ("must be above 0"), else empty.
  std::function<std::string(const ScreenSettings&)> check = nullptr;
};

// Bounds of a number: low/high (inclusive unless `open`), each optional.
struct Bounds {
  std::optional<double> low, high;
  bool low_open = false, high_open = false;
};
Bounds above(double low);              // (low, ∞)
Bounds at_least(double low);           // [low, ∞)
Bounds between(double low, double high);  // [low, high]
Bounds inside(double low, double high);   // (low, high)

// Declarations for the common kinds. `field` returns the member the option stands for.
OptionSpec real_option(std::string name, std::string value_name, std::string help,
                       std::function<double&(ScreenSettings&)> field, Bounds bounds = {});
OptionSpec count_option(std::string name, std::string value_name, std::string help,
                        std::function<std::size_t&(ScreenSettings&)> field, Bounds bounds = {});
OptionSpec seed_option(std::string name, std::string value_name, std::string help,
                       std::function<unsigned long long&(ScreenSettings&)> field);
OptionSpec text_option(std::string name, std::string value_name, std::string help,
                       std::function<std::string&(ScreenSettings&)> field);
OptionSpec choice_option(std::string name, std::string help, std::function<std::string&(ScreenSettings&)> field,
                         std::vector<std::string> choices);
OptionSpec list_option(std::string name, std::string value_name, std::string help,
                       std::function<std::vector<std::string>&(ScreenSettings&)> field);
OptionSpec switch_option(std::string name, std::string help, std::function<bool&(ScreenSettings&)> field);

// A whole number as an option's value: digits only (no sign), within 64 bits; else UsageError.
unsigned long long parse_whole(const std::string& option, const std::string& text);

// "a,b,,c" → {a, b, c}
std::vector<std::string> split_list(const std::string& text);

// The shortest text that reads back to the same double: 0.05, not 0.050000000000000003.
std::string number_text(double value);

// Throws UsageError for the first declared option whose value is out of bounds.
void check_options(const std::vector<OptionSpec>& options, const ScreenSettings& settings);

}  // namespace envsift
