#include <iostream>

#include "commands.hpp"
#include "envsift/errors.hpp"
#include "envsift/run/run.hpp"
#include "options.hpp"

namespace envsift::cli {

int merge_command(int argc, char** argv) {
  std::vector<std::string> shards;
  std::string out;
  po::options_description d(
      "Combine the outputs of 'envsift screen --shard I/N' for I = 0..N-1 into one ranked file, exactly what\n"
      "a single run would have written. Every shard of the run must be given, each once, in any order.\n\n"
      "Options",
      100, 50);
  d.add_options()
    ("out", po::value(&out)->required()->value_name("FILE.csv"), "the merged result")
    ("help,h", "show this help");
  po::options_description hidden;
  hidden.add_options()("shards", po::value(&shards)->multitoken(), "shard outputs");
  po::options_description all;
  all.add(d).add(hidden);
  po::positional_options_description positional;
  positional.add("shards", -1);
  po::variables_map vm;
  if (!parse(argc, argv, "merge", "SHARD_OUTPUT... --out FILE.csv", all, vm, &positional, &d)) return 0;
  if (shards.empty()) throw UsageError("give the shard outputs: envsift merge SHARD_OUTPUT... --out FILE.csv");
  report(merge_shards(shards, out), vm, out + " (flags are for review, not automatic removal)");
  return 0;
}

}  // namespace envsift::cli
