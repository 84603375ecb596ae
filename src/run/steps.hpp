// Private to the run layer: the steps run_screen calls in order, each in its own file.
#pragma once
#include "envsift/review/decisions.hpp"
#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "envsift/table/record_table.hpp"
#include "envsift/run_summary.hpp"
#include "envsift/score/verdict_store.hpp"
#include "envsift/settings/settings.hpp"
#include "envsift/write/record_sink.hpp"

namespace envsift::run {

// Steps 1-2: read the points and sample the layers (or read the value columns); only this
// shard's records are sampled.
RecordTable read_and_sample(const ScreenSettings& settings, const ActiveTests* tests);
extern const std::string kSingleTaxon;  // the one group of --single-taxon

// Whether this shard (--shard I/N) judges record i: the shard of its taxon's stable hash.
bool owned_by_this_shard(const ScreenSettings& settings, const PointTable& points, std::size_t record);

// Step 3: which records this run judges, and their taxa (shards, --single-taxon, taxon_missing).
struct Membership {
  std::vector<std::string> taxon_names;  // index 0: no taxon
  std::vector<std::uint32_t> taxon_of;   // per record
  std::vector<bool> mine;                // this shard's
  std::vector<bool> eligible;            // mine, with a taxon and a value to judge
  RecordDecisions decisions;             // --decisions: per record (empty when none given); its
                                         // pointers are into the DecisionFile group_records was given
  std::vector<bool> left_out;            // judged, but out of the reference: decided `error`
};
// `decisions`: --decisions as read before sampling (null: none).
Membership group_records(RecordTable& table, const ScreenSettings& settings, const DecisionFile* decisions);

// Steps 4-5: every taxon judged by every detector and every record by every check, combined
// into verdicts (kept on disk) and scores; each judged taxon is passed to the outputs.
struct Judgement {
  std::unique_ptr<VerdictStore> verdicts;
  std::vector<std::optional<double>> scores;  // as written, for the ranking
  std::vector<std::uint8_t> tiers;            // per record, review_tier of its decision (empty: none given)
  std::vector<std::string> warnings;          // a test's flags withheld from a taxon
  StageSeconds test_seconds;                  // each detector's CPU time
};
Judgement judge_records(RecordTable& table, const ActiveTests& tests, const Membership& membership,
                        const ScreenSettings& settings, const std::vector<RecordSink*>& outputs);

// Step 6 (the outputs have begun with `run` before judging, to receive each judged taxon):
// every record, in the chosen order, to every output; then all finish, then all commit.
void write_outputs(const RunContext& run, const Judgement* judgement, const std::vector<RecordSink*>& outputs,
                   RunSummary& summary, Progress* progress);

}  // namespace envsift::run
