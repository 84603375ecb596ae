// Command-line options shared by the subcommands.
#pragma once
#include <boost/program_options.hpp>
#include <string>
#include <vector>

#include "envsift/pipeline.hpp"
#include "envsift/write/run_manifest.hpp"

namespace envsift::cli {

namespace po = boost::program_options;

// Adds --points, --layers, --method, --out, column names, --threads and --block-cache-mb.
void add_sampling_options(po::options_description& d, SampleOptions& o, bool layers_required = true);

// Parses argv; returns false after printing help. Throws UsageError on bad options.
// `positional`: positional arguments, if the command takes any; `visible`: what --help shows
// (default: all options).
bool parse(int argc, char** argv, const std::string& command, const std::string& synopsis,
           const po::options_description& options, po::variables_map& vm,
           const po::positional_options_description* positional = nullptr,
           const po::options_description* visible = nullptr);

// Applies the parsed values that need checking or conversion (method, delimiter, threads).
void finish_sampling_options(const po::variables_map& vm, SampleOptions& o);

// The run manifest (command line, options, inputs, layers, times) of this run.
RunManifest make_manifest(const po::variables_map& vm, const std::string& command, int argc, char** argv,
                          const SampleOptions& o, unsigned long long seed, const RunSummary& summary);
// With --manifest FILE.json: writes the run manifest.
void write_manifest_if_asked(const po::variables_map& vm, const std::string& command, int argc, char** argv,
                             const SampleOptions& o, unsigned long long seed, const RunSummary& summary);

// Warnings, timings (with --timings), reason-code counts and the record accounting, on stderr.
void report(const RunSummary& summary, const po::variables_map& vm, const std::string& wrote);

}  // namespace envsift::cli
