#include <algorithm>
#include <exception>
#include <numeric>
#include <thread>

#include "envsift/write/atomic_file.hpp"
#include "envsift/write/record_columns.hpp"

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
  const bool rows_wanted = std::any_of(outputs.begin(), outputs.end(), [](RecordSink* o) { return o->wants_row(); });
  const bool lines_wanted = std::any_of(outputs.begin(), outputs.end(), [](RecordSink* o) { return o->wants_csv_line(); });
  // In batches, two at a time: the main thread reads a batch's fields in order (the store's
  // buffered sequential read), then reads its verdicts and formats its rows in parallel, while the
  // batch before it is counted and fed to the outputs, in order, on a thread of its own (the
  // outputs' own work, the CSV's writes above all, overlaps the formatting). Each slot's vectors
  // and strings are reused from batch to batch.
  constexpr std::size_t kBatch = 8192;
  struct Pending {
    std::vector<std::string> fields, codes, row;
    std::string line;
    Verdict verdict;
    VerdictStore::Scratch scratch;
    bool scored = false;
  };
  std::vector<Pending> slots[2];
  for (auto& slot : slots) slot.resize(std::min(kBatch, n));
  auto outcome = [&](std::vector<Pending>& batch, std::size_t start, std::size_t k) {
    const std::size_t i = rows[start + k];
    return RecordOutcome{i, &batch[k].fields, &batch[k].codes, ranks[i], judgement ? &batch[k].verdict : nullptr,
                         &batch[k].row, &batch[k].line};
  };
  auto feed = [&](std::vector<Pending>& batch, std::size_t start, std::size_t size) {
    for (std::size_t k = 0; k < size; ++k) {
      const Pending& p = batch[k];
      ++summary.read;
      summary.flagged += judgement && p.scored && !p.verdict.flags.empty();
      if (p.scored) ++summary.scored;
      else ++summary.not_scored[reason::why_not_scored(p.codes)];
      summary.count_codes(p.codes);
      const RecordOutcome o = outcome(batch, start, k);
      for (std::size_t s = 0; s < outputs.size(); ++s) timed(s, [&](RecordSink& out) { out.record(o); });
    }
    if (progress) progress->advance(size);
  };
  std::thread feeder;
  std::exception_ptr feed_error;
  auto join_feeder = [&] {
    if (feeder.joinable()) feeder.join();
    if (feed_error) std::rethrow_exception(feed_error);
  };
  try {
    for (std::size_t start = 0, b = 0; start < n; start += kBatch, ++b) {
      std::vector<Pending>& batch = slots[b % 2];  // the feeder has the other slot
      const std::size_t size = std::min(kBatch, n - start);
      for (std::size_t k = 0; k < size; ++k) t.points.fields.read(rows[start + k], batch[k].fields);
#pragma omp parallel for schedule(static)
      for (std::ptrdiff_t kk = 0; kk < static_cast<std::ptrdiff_t>(size); ++kk) {
        const auto k = static_cast<std::size_t>(kk);
        const std::size_t i = rows[start + k];
        Pending& p = batch[k];
        p.codes = t.codes.of(i);
        p.scored = t.has_any_value(i);  // for `sample`, a record is done once it has values
        if (judgement) {
          judgement->verdicts->get(i, p.verdict, p.scratch);
          for (const auto& c : p.verdict.codes)
            if (std::find(p.codes.begin(), p.codes.end(), c) == p.codes.end()) p.codes.push_back(c);
          p.scored = judgement->scores[i].has_value();
          // a screen's status always says why (a note such as coord_decimal_comma never does)
          if (!p.scored && reason::why_not_scored(p.codes) == reason::no_values &&
              std::find(p.codes.begin(), p.codes.end(), reason::no_values) == p.codes.end())
            p.codes.push_back(reason::no_values);
        }
        if (rows_wanted) p.row = record_row(t, outcome(batch, start, k));
        if (lines_wanted) {
          p.line.clear();
          append_record_csv(t, outcome(batch, start, k), p.line);
        }
      }
      join_feeder();
      feeder = std::thread([&, start, size, slot = &batch] {
        try {
          feed(*slot, start, size);
        } catch (...) {
          feed_error = std::current_exception();
        }
      });
    }
    join_feeder();
  } catch (...) {
    if (feeder.joinable()) feeder.join();  // never leave a thread running over the batches
    throw;
  }
  // Every output finishes (complete under its temporary name) before any is put in place.
  for (std::size_t k = 0; k < outputs.size(); ++k) timed(k, [&](RecordSink& out) { out.finish(summary); });
  pause_before_commit_for_tests();
  {
    const CommitPhase committing;
    for (std::size_t k = 0; k < outputs.size(); ++k) timed(k, [&](RecordSink& out) { out.commit(); });
  }
  for (std::size_t k = 0; k < outputs.size(); ++k) summary.seconds.emplace_back("write " + outputs[k]->name(), seconds[k]);
  summary.seconds.emplace_back("write, total", started.seconds());
  if (progress) progress->finish();
}

}  // namespace envsift::run
