#include "envsift/run/validate.hpp"

#include "envsift/detect/test_registry.hpp"
#include "envsift/errors.hpp"
#include "envsift/review/decisions.hpp"
#include "envsift/settings/run_options.hpp"
#include "envsift/write/output_registry.hpp"

namespace envsift {

std::vector<OptionSpec> all_screen_options() {
  std::vector<OptionSpec> all = input_options();
  for (const auto* group : {&sampling_options(), &screen_options(), &test_options(), &output_options()})
    all.insert(all.end(), group->begin(), group->end());
  return all;
}

void validate(const ScreenSettings& s) {
  check_options(all_screen_options(), s);
  const InputSettings& in = s.input;
  if (in.value_columns.empty() && in.layers.empty()) throw UsageError("give --layers (rasters to sample) or --value-columns");
  if (!in.value_columns.empty() && !in.layers.empty()) throw UsageError("give either --layers or --value-columns, not both");
  if (s.outputs.shard_count > 1 && s.outputs.order == "rank")
    throw UsageError("--shard writes rows in input order (envsift merge ranks them); drop --order rank");
  validate_tests(s);
  // a decisions file that cannot be used stops the run now, not after the points are sampled
  if (!s.review.decisions.empty()) (void)read_decision_file(s.review.decisions, s.input.reader.columns.id);
}

std::vector<OptionSpec> sample_options() {
  std::vector<OptionSpec> options = input_options();
  options.insert(options.end(), sampling_options().begin(), sampling_options().end());
  for (const auto& o : output_registry())
    if (o.in_sample) options.push_back(o.option);
  return options;
}

std::vector<std::pair<std::string, std::string>> settings_as_written(const std::vector<OptionSpec>& options,
                                                                     const ScreenSettings& settings) {
  std::vector<std::pair<std::string, std::string>> written;
  for (const auto& o : options) written.emplace_back(o.name, o.get(settings));
  return written;
}

}  // namespace envsift
