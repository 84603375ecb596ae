#include "envsift/run/run.hpp"

#include <algorithm>

#include "envsift/errors.hpp"
#include "envsift/run/output_paths.hpp"
#include "envsift/run/validate.hpp"
#include "envsift/settings/run_options.hpp"
#include "envsift/write/output_registry.hpp"
#include "envsift/write/record_columns.hpp"
#include "envsift/write/run_manifest.hpp"
#include "steps.hpp"

namespace envsift {
namespace {

std::vector<RecordSink*> pointers(const std::vector<std::unique_ptr<RecordSink>>& owned,
                                  const std::vector<RecordSink*>& extra = {}) {
  std::vector<RecordSink*> all;
  for (const auto& o : owned) all.push_back(o.get());
  all.insert(all.end(), extra.begin(), extra.end());
  return all;
}

RunInputs inputs_of(const ScreenSettings& s) {
  return {s.input.points, s.input.value_columns, s.input.reader.columns.id, s.input.single_taxon, s.review.decisions,
          s.command_line};
}

}  // namespace

RunSummary run_sample(const ScreenSettings& s) {
  validate_for_sample(s);
  refuse_unsafe_outputs(s, true);
  apply_process_settings(s.sampling);
  const auto outputs = open_outputs(s.outputs, true);
  const Stopwatch started;
  RunSummary summary;
  summary.screened = false;
  RecordTable t = run::read_and_sample(s, nullptr);
  t.stack.reset();
  summary.seconds = t.seconds;
  summary.memory = t.memory;
  summary.warnings = t.warnings;
  const RunContext run{s.outputs, t, nullptr, nullptr, inputs_of(s), nullptr,
                       record_header(t, nullptr, s.outputs.column_prefix), settings_as_written(sample_options(), s)};
  for (RecordSink* out : pointers(outputs)) out->begin(run);
  run::write_outputs(run, nullptr, pointers(outputs), summary, s.progress);
  summary.seconds.emplace_back("total", started.seconds());
  return summary;
}

RunSummary run_screen(const ScreenSettings& settings, const std::vector<RecordSink*>& extra_outputs) {
  ScreenSettings s = settings;
  if (s.outputs.shard_count > 1 && s.outputs.manifest.empty() && !s.outputs.out.empty())
    s.outputs.manifest = shard_manifest_path(s.outputs.out);  // what `merge` checks the shards by
  validate(s);
  refuse_unsafe_outputs(s, false);
  apply_process_settings(s.sampling);
  const ActiveTests tests = activate_tests(s.tests, test_context(s.input));
  // read once, before the long part: a decisions file that cannot be used stops the run now
  const std::optional<DecisionFile> decisions =
      s.review.decisions.empty() ? std::nullopt
                                 : std::optional<DecisionFile>(read_decision_file(s.review.decisions, s.input.reader.columns.id));
  const auto owned = open_outputs(s.outputs, false);
  const auto outputs = pointers(owned, extra_outputs);
  if (outputs.empty()) throw UsageError("--out is required: give the CSV file to write");
  Stopwatch clock;
  RunSummary summary;

  RecordTable t = run::read_and_sample(s, &tests);  // 1-2. read points, sample the layers
  if (std::none_of(tests.detectors.begin(), tests.detectors.end(), [](const auto& d) { return d->uses_landscape(); }))
    t.stack.reset();  // no landscape to draw: close the layers and free their block cache
  summary.seconds = t.seconds;
  summary.memory = t.memory;
  clock.lap(summary.seconds, "sampling, total");
  const run::Membership membership = run::group_records(t, s, decisions ? &*decisions : nullptr);  // 3. group by taxon
  clock.lap(summary.seconds, "group");
  const RunContext run{s.outputs,
                       t,
                       &tests,
                       &s.tests,
                       inputs_of(s),
                       decisions ? &*decisions : nullptr,
                       record_header(t, &tests, s.outputs.column_prefix, !s.review.decisions.empty()),
                       settings_as_written(all_screen_options(), s)};
  for (RecordSink* out : outputs) out->begin(run);
  const double cpu_before = process_cpu_seconds();
  const run::Judgement judgement = run::judge_records(t, tests, membership, s, outputs);  // 4-5. tests, scores
  clock.lap(summary.seconds, "screen");
  summary.seconds.emplace_back("screen (CPU, all threads)", process_cpu_seconds() - cpu_before);
  summary.seconds.insert(summary.seconds.end(), judgement.test_seconds.begin(), judgement.test_seconds.end());

  summary.warnings = t.warnings;
  summary.warnings.insert(summary.warnings.end(), judgement.warnings.begin(), judgement.warnings.end());
  run::write_outputs(run, &judgement, outputs, summary, s.progress);  // 6. rank, write
  return summary;
}

}  // namespace envsift
