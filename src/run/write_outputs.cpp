#include <numeric>

#include "envsift/reason_codes.hpp"
#include "steps.hpp"

namespace envsift::run {

void write_outputs(const RunContext& run, const Judgement* judgement, const std::vector<RecordSink*>& outputs,
                   RunSummary& summary) {
  const RecordTable& t = run.table;
  const std::size_t n = t.size();
  const Stopwatch started;
  std::vector<double> seconds(outputs.size(), 0.0);
  auto timed = [&](std::size_t k, auto&& call) {
    const Stopwatch clock;
    call(*outputs[k]);
    seconds[k] += clock.seconds();
  };

  std::vector<std::size_t> ranks(n, 0), rows(n);
  std::iota(rows.begin(), rows.end(), 0);
  if (judgement) {
    ranks = rank_by_score(judgement->scores);
    if (run.settings.outputs.order == "rank")
      std::stable_sort(rows.begin(), rows.end(), [&](std::size_t a, std::size_t b) {
        return (ranks[a] ? ranks[a] : n + 1) < (ranks[b] ? ranks[b] : n + 1);
      });
  }
  Progress* progress = run.settings.progress;
  if (progress) progress->stage("writing", n, "records");
  std::vector<std::string> fields, codes;
  Verdict verdict;
  for (std::size_t i : rows) {
    if (progress && summary.read % 4096 == 4095) progress->advance(4096);
    ++summary.read;
    t.points.fields.read(i, fields);
    codes = t.codes.of(i);
    bool scored = t.has_any_value(i);  // for `sample`, a record is done once it has values
    if (judgement) {
      judgement->verdicts->get(i, verdict);
      for (const auto& c : verdict.codes)
        if (std::find(codes.begin(), codes.end(), c) == codes.end()) codes.push_back(c);
      scored = judgement->scores[i].has_value();
      summary.flagged += scored && !verdict.flags.empty();
    }
    if (scored) {
      ++summary.scored;
    } else {
      if (codes.empty() && judgement) codes.push_back(reason::no_values);
      ++summary.not_scored[codes.empty() ? reason::no_values : codes.front()];
    }
    for (const auto& c : codes) ++summary.codes[c];
    const RecordOutcome outcome{i, &fields, &codes, ranks[i], judgement ? &verdict : nullptr};
    for (std::size_t k = 0; k < outputs.size(); ++k) timed(k, [&](RecordSink& out) { out.record(outcome); });
  }
  // Every output finishes (complete under its temporary name) before any is put in place.
  for (std::size_t k = 0; k < outputs.size(); ++k) timed(k, [&](RecordSink& out) { out.finish(summary); });
  for (std::size_t k = 0; k < outputs.size(); ++k) timed(k, [&](RecordSink& out) { out.commit(); });
  for (std::size_t k = 0; k < outputs.size(); ++k) summary.seconds.emplace_back("write " + outputs[k]->name(), seconds[k]);
  summary.seconds.emplace_back("write, total", started.seconds());
  if (progress) progress->finish();
}

}  // namespace envsift::run
