#include "options.hpp"

#include <algorithm>
#include <iostream>

#include <sys/resource.h>

#include "envsift/errors.hpp"
#include "envsift/run_summary.hpp"

namespace envsift::cli {

void add_declared(po::options_description& d, const std::vector<OptionSpec>& options,
                  const std::vector<std::string>& required) {
  const ScreenSettings defaults;
  for (const auto& o : options) {
    const bool needed = std::find(required.begin(), required.end(), o.name) != required.end();
    if (o.is_switch) {
      d.add_options()(o.name.c_str(), po::bool_switch(), o.help.c_str());
    } else if (o.multitoken) {
      auto* value = po::value<std::vector<std::string>>()->multitoken()->value_name(o.value_name);
      if (needed) value->required();
      d.add_options()(o.name.c_str(), value, o.help.c_str());
    } else {
      auto* value = po::value<std::string>()->value_name(o.value_name);
      if (const std::string text = o.get(defaults); !text.empty() && text != "false") value->default_value(text);
      if (needed) value->required();
      d.add_options()(o.name.c_str(), value, o.help.c_str());
    }
  }
}

void add_run_switches(po::options_description& d) {
  d.add_options()
    ("quiet,q", po::bool_switch(), "no progress display")
    ("timings", po::bool_switch(), "print the time each stage took (and each test's CPU time)")
    ("help,h", "show this help");
}

namespace {

// Edit distance (insertions, deletions, substitutions) between two option names.
std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diagonal = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t above = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diagonal + (a[i - 1] == b[j - 1] ? 0 : 1)});
      diagonal = above;
    }
  }
  return row[b.size()];
}

// The declared option a mistyped one most likely meant (two edits at most), or "".
std::string closest_option(std::string typed, const po::options_description& options) {
  while (!typed.empty() && typed[0] == '-') typed.erase(0, 1);
  std::string best;
  std::size_t best_distance = 3;
  for (const auto& o : options.options()) {
    const std::string name = o->long_name();
    const std::size_t d = edit_distance(typed, name);
    if (d < best_distance) best = name, best_distance = d;
  }
  return best;
}

}  // namespace

bool parse(int argc, char** argv, const std::string& command, const std::string& synopsis,
           const po::options_description& options, po::variables_map& vm,
           const po::positional_options_description* positional, const po::options_description* visible) {
  for (int i = 0; i < argc; ++i) {
    const std::string a = argv[i];
    if (a == "--help" || a == "-h") {
      std::cout << "usage: envsift " << command << " " << synopsis << "\n\n" << (visible ? *visible : options) << "\n";
      return false;
    }
  }
  try {
    po::command_line_parser parser(argc, argv);
    parser.options(options);
    if (positional) parser.positional(*positional);
    const po::parsed_options parsed = parser.run();
    // an option whose value is missing takes the next option's name as its value
    for (const auto& o : parsed.options)
      for (const auto& value : o.value)
        if (value.size() > 2 && value.compare(0, 2, "--") == 0 && options.find_nothrow(value.substr(2, value.find('=') - 2), false))
          throw UsageError("--" + o.string_key + " has no value: " + value + " follows it; give the value right after --" +
                           o.string_key + " (see 'envsift " + command + " --help')");
    // words that belong to no option (Boost keeps them quietly): a value given twice, or a
    // misplaced one, would otherwise be ignored without a word
    if (!positional)
      for (const auto& stray : po::collect_unrecognized(parsed.options, po::include_positional))
        throw UsageError("unexpected argument '" + stray + "': every value follows its option (e.g. --layers A.tif B.tif); see 'envsift " +
                         command + " --help'");
    po::store(parsed, vm);
    po::notify(vm);
  } catch (const po::unknown_option& e) {
    const std::string near = closest_option(e.get_option_name(), options);
    throw UsageError(std::string(e.what()) + (near.empty() ? "" : " (did you mean --" + near + "?)") + "; see 'envsift " +
                     command + " --help'");
  } catch (const po::error& e) {
    throw UsageError(std::string(e.what()) + "; see 'envsift " + command + " --help'");
  }
  return true;
}

void apply_declared(const po::variables_map& vm, const std::vector<OptionSpec>& options, ScreenSettings& s) {
  for (const auto& o : options) {
    if (!vm.count(o.name) || vm[o.name].defaulted()) continue;
    if (o.is_switch) {
      if (vm[o.name].as<bool>()) o.set(s, "true");
    } else if (o.multitoken) {
      for (const auto& token : vm[o.name].as<std::vector<std::string>>()) o.set(s, token);
    } else {
      o.set(s, vm[o.name].as<std::string>());
    }
  }
}

std::string command_line(const std::string& command, int argc, char** argv) {
  std::string line = "envsift " + command;
  for (int i = 1; i < argc; ++i) line += std::string(" ") + argv[i];
  return line;
}

std::string terminal_safe(const std::string& message) {
  static const char* hex = "0123456789abcdef";
  std::string out;
  for (std::size_t i = 0; i < message.size(); ++i) {
    const auto c = static_cast<unsigned char>(message[i]);
    const bool c1 = c == 0xC2 && i + 1 < message.size() && static_cast<unsigned char>(message[i + 1]) >= 0x80 &&
                    static_cast<unsigned char>(message[i + 1]) <= 0x9F;  // U+0080-U+009F in UTF-8
    if (c >= 0x20 && c != 0x7F && !c1) {
      out += message[i];
      continue;
    }
    const auto shown = c1 ? static_cast<unsigned char>(message[++i]) : c;
    out += "\\x";
    out += hex[shown >> 4];
    out += hex[shown & 15];
  }
  return out;
}

void report(const RunSummary& summary, const po::variables_map& vm, const std::string& wrote) {
  constexpr std::size_t kShown = 20;  // thousands of taxa can each warn; the rest are in the status codes
  for (std::size_t i = 0; i < summary.warnings.size() && i < kShown; ++i)
    std::cerr << "envsift: warning: " << terminal_safe(summary.warnings[i]) << "\n";
  if (summary.warnings.size() > kShown)
    std::cerr << "envsift: warning: " << summary.warnings.size() - kShown
              << " more warnings like these (every record concerned carries its reason code in `status`)\n";
  if (vm.count("timings") && vm["timings"].as<bool>()) {
    for (const auto& [stage, seconds] : summary.seconds) std::cerr << "envsift: time: " << stage << " " << seconds << " s\n";
    rusage usage{};
    getrusage(RUSAGE_SELF, &usage);  // ru_maxrss: KiB on Linux
    std::cerr << "envsift: memory: peak resident " << with_thousands(static_cast<std::size_t>(usage.ru_maxrss) / 1024)
              << " MB; estimated " << (summary.memory.empty() ? std::string("(none)") : summary.memory) << "\n";
  }
  std::cerr << terminal_safe(summary.codes_line()) << "\n" << terminal_safe(summary.line()) << "\nenvsift: wrote "
            << terminal_safe(wrote) << "\n";
}

}  // namespace envsift::cli
