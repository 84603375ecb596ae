// Step 6: rank the records and write every output. In batches, two at a time: the main thread
// reads a batch's fields in order (the store's buffered sequential read), then reads its verdicts
// and formats its rows in parallel, while the batch before it is counted and fed to the outputs,
// in order, on a thread of its own (the outputs' own work, the CSV's writes above all, overlaps
// the formatting). Each slot's vectors and strings are reused from batch to batch.
#include <algorithm>
#include <exception>
#include <numeric>
#include <thread>

#include "envsift/reason_codes.hpp"
#include "envsift/write/atomic_file.hpp"
#include "envsift/write/record_columns.hpp"
#include "steps.hpp"

namespace envsift::run {
namespace {

struct PendingRecord {
  std::vector<std::string> fields, codes, row;
  std::string line;
  Verdict verdict;
  VerdictStore::Scratch scratch;
  bool scored = false;
};

class BatchWriter {
 public:
  BatchWriter(const RunContext& run, const Judgement* judgement, const std::vector<RecordSink*>& outputs, RunSummary& summary,
              Progress* progress)
      : t_(run.table), judgement_(judgement), outputs_(outputs), summary_(summary), seconds_(outputs.size(), 0.0),
        progress_(progress) {
    const std::size_t n = t_.size();
    ranks_.assign(n, 0);
    rows_.resize(n);
    std::iota(rows_.begin(), rows_.end(), 0);
    if (judgement) {
      ranks_ = rank_by_score(judgement->scores, judgement->tiers);
      if (run.outputs.order == RowOrder::rank)
        std::stable_sort(rows_.begin(), rows_.end(), [&](std::size_t a, std::size_t b) {
          return (ranks_[a] ? ranks_[a] : n + 1) < (ranks_[b] ? ranks_[b] : n + 1);
        });
    }
    with_decisions_ = judgement && !run.inputs.decisions.empty();
    rows_wanted_ = std::any_of(outputs.begin(), outputs.end(), [](RecordSink* o) { return o->wants_row(); });
    lines_wanted_ = std::any_of(outputs.begin(), outputs.end(), [](RecordSink* o) { return o->wants_csv_line(); });
  }

  void write_records();
  void finish_and_commit();
  const std::vector<double>& seconds() const { return seconds_; }

 private:
  static constexpr std::size_t kBatch = 8192;
  void prepare(std::vector<PendingRecord>& batch, std::size_t start, std::size_t size);
  void feed(std::vector<PendingRecord>& batch, std::size_t start, std::size_t size);
  RecordOutcome outcome(std::vector<PendingRecord>& batch, std::size_t start, std::size_t k) const {
    const std::size_t i = rows_[start + k];
    return RecordOutcome{i, &batch[k].fields, &batch[k].codes, ranks_[i], judgement_ ? &batch[k].verdict : nullptr,
                         &batch[k].row, &batch[k].line, with_decisions_};
  }
  template <class Call>
  void timed(std::size_t k, Call&& call) {
    const Stopwatch clock;
    call(*outputs_[k]);
    seconds_[k] += clock.seconds();
  }

  const RecordTable& t_;
  const Judgement* judgement_;
  const std::vector<RecordSink*>& outputs_;
  RunSummary& summary_;
  std::vector<double> seconds_;
  Progress* progress_;
  std::vector<std::size_t> ranks_, rows_;
  bool rows_wanted_ = false, lines_wanted_ = false, with_decisions_ = false;
};

// The batch's fields (in order, this thread), then its verdicts, codes and rows (in parallel).
void BatchWriter::prepare(std::vector<PendingRecord>& batch, std::size_t start, std::size_t size) {
  for (std::size_t k = 0; k < size; ++k) t_.points.fields.read(rows_[start + k], batch[k].fields);
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t kk = 0; kk < static_cast<std::ptrdiff_t>(size); ++kk) {
    const auto k = static_cast<std::size_t>(kk);
    const std::size_t i = rows_[start + k];
    PendingRecord& p = batch[k];
    p.codes = t_.codes.of(i);
    p.scored = t_.has_any_value(i);  // for `sample`, a record is done once it has values
    if (judgement_) {
      judgement_->verdicts->get(i, p.verdict, p.scratch);
      for (const auto& c : p.verdict.codes)
        if (std::find(p.codes.begin(), p.codes.end(), c) == p.codes.end()) p.codes.push_back(c);
      p.scored = judgement_->scores[i].has_value();
      // a screen's status always says why (a note such as read_decimal_comma never does)
      if (!p.scored && reason::why_not_scored(p.codes) == reason::no_values &&
          std::find(p.codes.begin(), p.codes.end(), reason::no_values) == p.codes.end())
        p.codes.push_back(reason::no_values);
    }
    if (rows_wanted_) p.row = record_row(t_, outcome(batch, start, k));
    if (lines_wanted_) {
      p.line.clear();
      append_record_csv(t_, outcome(batch, start, k), p.line);
    }
  }
}

// Counts the batch into the summary and hands it to every output, in order.
void BatchWriter::feed(std::vector<PendingRecord>& batch, std::size_t start, std::size_t size) {
  for (std::size_t k = 0; k < size; ++k) {
    const PendingRecord& p = batch[k];
    ++summary_.read;
    summary_.flagged += judgement_ && p.scored && !p.verdict.flags.empty() && p.verdict.open();
    if (judgement_ && p.verdict.decision != Decision::none) ++summary_.decided[decision_name(p.verdict.decision)];
    if (p.scored) ++summary_.scored;
    else ++summary_.not_scored[reason::why_not_scored(p.codes)];
    summary_.count_codes(p.codes);
    const RecordOutcome o = outcome(batch, start, k);
    for (std::size_t s = 0; s < outputs_.size(); ++s) timed(s, [&](RecordSink& out) { out.record(o); });
  }
  if (progress_) progress_->advance(size);
}

void BatchWriter::write_records() {
  const std::size_t n = t_.size();
  if (progress_) progress_->stage("writing", n, "records");
  std::vector<PendingRecord> slots[2];
  for (auto& slot : slots) slot.resize(std::min(kBatch, n));
  std::thread feeder;
  std::exception_ptr feed_error;
  auto join_feeder = [&] {
    if (feeder.joinable()) feeder.join();
    if (feed_error) std::rethrow_exception(feed_error);
  };
  try {
    for (std::size_t start = 0, b = 0; start < n; start += kBatch, ++b) {
      std::vector<PendingRecord>& batch = slots[b % 2];  // the feeder has the other slot
      const std::size_t size = std::min(kBatch, n - start);
      prepare(batch, start, size);
      join_feeder();
      feeder = std::thread([this, &feed_error, start, size, slot = &batch] {
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
}

// Every output finishes (complete under its temporary name) before any is put in place.
void BatchWriter::finish_and_commit() {
  for (std::size_t k = 0; k < outputs_.size(); ++k) timed(k, [&](RecordSink& out) { out.finish(summary_); });
  pause_before_commit_for_tests();
  const CommitPhase committing;
  for (std::size_t k = 0; k < outputs_.size(); ++k) timed(k, [&](RecordSink& out) { out.commit(); });
}

}  // namespace

void write_outputs(const RunContext& run, const Judgement* judgement, const std::vector<RecordSink*>& outputs,
                   RunSummary& summary, Progress* progress) {
  const Stopwatch started;
  BatchWriter writer(run, judgement, outputs, summary, progress);
  writer.write_records();
  writer.finish_and_commit();
  for (std::size_t k = 0; k < outputs.size(); ++k) summary.seconds.emplace_back("write " + outputs[k]->name(), writer.seconds()[k]);
  summary.seconds.emplace_back("write, total", started.seconds());
  if (progress) progress->finish();
}

}  // namespace envsift::run
