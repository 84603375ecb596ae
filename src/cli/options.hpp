// The command line over the library's declared options (settings/option_spec.hpp): each
// declaration becomes a Boost.Program_options option with its help and its default as written,
// and the parsed text goes back through the declaration's own reader, so the binary and an
// embedding program get the same checks.
#pragma once
#include <boost/program_options.hpp>
#include <string>
#include <vector>

#include "envsift/run_summary.hpp"
#include "envsift/option_spec.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift::cli {

namespace po = boost::program_options;

// Adds the declared options; `required` names the ones the command cannot run without.
void add_declared(po::options_description& d, const std::vector<OptionSpec>& options,
                  const std::vector<std::string>& required = {});
// Adds --quiet, --timings and --help.
void add_run_switches(po::options_description& d);

// Parses argv; returns false after printing help. Throws UsageError on bad options.
// `positional`: positional arguments, if the command takes any; `visible`: what --help shows
// (default: all options).
bool parse(int argc, char** argv, const std::string& command, const std::string& synopsis,
           const po::options_description& options, po::variables_map& vm,
           const po::positional_options_description* positional = nullptr,
           const po::options_description* visible = nullptr);

// Reads every given option into the settings through its declaration.
void apply_declared(const po::variables_map& vm, const std::vector<OptionSpec>& options, ScreenSettings& settings);

// "envsift COMMAND ARGS...", for the run manifest.
std::string command_line(const std::string& command, int argc, char** argv);

// A message as it may reach a terminal: control characters (C0, DEL and the C1 range, which
// input files can carry in a column name or a taxon) written as \xNN, so that no escape sequence
// from a file is run by the terminal.
std::string terminal_safe(const std::string& message);

// Warnings, timings (with --timings), reason-code counts and the record accounting, on stderr.
void report(const RunSummary& summary, const po::variables_map& vm, const std::string& wrote);

}  // namespace envsift::cli
