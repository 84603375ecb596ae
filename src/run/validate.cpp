#include "envsift/run/validate.hpp"

#include "envsift/detect/test_registry.hpp"
#include "envsift/errors.hpp"
#include "envsift/settings/run_options.hpp"

namespace envsift {

std::vector<OptionSpec> all_screen_options() {
  std::vector<OptionSpec> all = input_run_options();
  for (const auto& group : {sampling_run_options(), screen_options(), test_run_options(), output_run_options()})
    all.insert(all.end(), group.begin(), group.end());
  return all;
}

void validate(const ScreenSettings& s) {
  check_options(all_screen_options(), s);
  const InputSettings& in = s.input;
  if (in.value_columns.empty() && in.layers.empty()) throw UsageError("give --layers (rasters to sample) or --value-columns");
  if (!in.value_columns.empty() && !in.layers.empty()) throw UsageError("give either --layers or --value-columns, not both");
  if (s.outputs.shard_count > 1 && s.outputs.order == RowOrder::rank)
    throw UsageError("--shard writes rows in input order (envsift merge ranks them); drop --order rank");
  validate_tests(s.tests, test_context(s.input));
}

TestContext test_context(const InputSettings& input) {
  TestContext c;
  c.values_from_columns = !input.value_columns.empty();
  return c;
}

std::vector<std::pair<std::string, std::string>> settings_as_written(const std::vector<OptionSpec>& options,
                                                                     const ScreenSettings& settings) {
  std::vector<std::pair<std::string, std::string>> written;
  for (const auto& o : options) written.emplace_back(o.name, o.get(settings));
  return written;
}

}  // namespace envsift
