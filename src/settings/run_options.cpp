#include "envsift/settings/run_options.hpp"

#include "envsift/detect/test_registry.hpp"
#include "envsift/errors.hpp"
#include "envsift/write/output_registry.hpp"

namespace envsift {
namespace {

using S = ScreenSettings;

OptionSpec shard_option() {
  OptionSpec o{"shard", "I/N",
               "screen only the taxa of shard I of N (0-based; taxa split by a stable hash of their name, the same on "
               "every machine); other records are written with status other_shard. Run I = 0..N-1, then "
               "'envsift merge' the outputs: the result equals one run's, byte for byte"};
  o.set = [](S& s, const std::string& text) {
    const auto slash = text.find('/');
    try {
      std::size_t used = 0;
      if (slash == std::string::npos || text[0] == '-' || text[slash + 1] == '-') throw std::invalid_argument(text);
      s.outputs.shard_index = std::stoul(text.substr(0, slash), &used);
      if (used != slash) throw std::invalid_argument(text);
      s.outputs.shard_count = std::stoul(text.substr(slash + 1), &used);
      if (used != text.size() - slash - 1) throw std::invalid_argument(text);
    } catch (const std::exception&) {
      throw UsageError("--shard must be I/N, e.g. 0/8, not '" + text + "'");
    }
  };
  o.get = [](const S& s) {
    return s.outputs.shard_count <= 1 ? std::string()
                                      : std::to_string(s.outputs.shard_index) + "/" + std::to_string(s.outputs.shard_count);
  };
  o.check = [](const S& s) {
    const auto& out = s.outputs;
    return out.shard_count >= 1 && out.shard_index < out.shard_count
               ? std::string()
               : "needs 0 <= I < N, not " + std::to_string(out.shard_index) + "/" + std::to_string(out.shard_count);
  };
  return o;
}

}  // namespace

std::vector<OptionSpec> input_run_options() { return lift(input_options(), &S::input); }
std::vector<OptionSpec> sampling_run_options() { return lift(sampling_options(), &S::sampling); }
std::vector<OptionSpec> test_run_options() { return lift(test_options(), &S::tests); }
std::vector<OptionSpec> output_run_options() { return lift(output_options(), &S::outputs); }

const std::vector<OptionSpec>& screen_options() {
  static const std::vector<OptionSpec> options = [] {
    using I = InputSettings;
    using O = OutputSettings;
    std::vector<OptionSpec> v;
    v.push_back(lift(comma_list_option("value-columns", "A,B,...",
                                       "screen values already in the points file (these columns) instead of sampling --layers",
                                       &I::value_columns),
                     field(&S::input)));
    v.push_back(lift(switch_option("single-taxon", "treat the whole file as one taxon (no taxon column needed)",
                                   &I::single_taxon),
                     field(&S::input)));
    v.push_back(shard_option());
    v.push_back(lift(text_option("column-prefix", "P",
                                 "put P before every column envsift adds after the layers (status, rank, score, flags, "
                                 "reasons, each test's columns), for points that have a status or rank column of their own; "
                                 "layer columns are named with NAME=PATH",
                                 &O::column_prefix),
                     field(&S::outputs)));
    v.push_back(lift(choice_option("order", "row order of the output: input order, or by rank (unscored records last)",
                                   &O::order, Choices<RowOrder>{{"input", RowOrder::input}, {"rank", RowOrder::rank}}),
                     field(&S::outputs)));
    v.push_back(lift(text_option("decisions", "FILE.csv",
                                 "a reviewer's decisions from earlier rounds, one row per record: its ID (the points' ID "
                                 "column), decision (error: confirmed wrong, left out of its taxon's statistics and "
                                 "ranked last; valid: confirmed right, never flagged again, ranked after the open suspects; "
                                 "unsure), and optionally note, reviewer, date",
                                 &ReviewSettings::decisions),
                     field(&S::review)));
    return v;
  }();
  return options;
}

std::vector<OptionSpec> sample_options() {
  std::vector<OptionSpec> options = input_run_options();
  for (const auto& o : sampling_run_options()) options.push_back(o);
  for (const auto& e : output_registry())
    if (e.in_sample) options.push_back(lift(e.option, field(&S::outputs)));
  return options;
}

void validate_for_sample(const ScreenSettings& s) {
  check_options(input_options(), s.input);
  check_options(sampling_options(), s.sampling);
  if (s.input.layers.empty()) throw UsageError("--layers is required: give the rasters to sample");
  if (s.outputs.out.empty()) throw UsageError("--out is required: give the CSV file to write");
}

}  // namespace envsift
