// Step 5 of the pipeline: combine what the tests found into one score per record and rank.
//
//   score = mean (or max, --combine) over tests t that judged the record of  statistic_t / threshold_t
//
// each "how many times its own cutoff", so scores are comparable across taxa and tests. Records
// are ranked by score, highest first; ties keep input order. Flags are decided apart, from the
// tests' probabilities (flag_rule.hpp): the score orders the review, the flag says where a
// stated share of clean records would be cut.
#pragma once
#include <cmath>
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "envsift/detect/detector.hpp"
#include "envsift/review/decision.hpp"
#include "envsift/score/flag_rule.hpp"

namespace envsift {

// What one test found for one record, as written to its columns.
struct TestResult {
  bool tested = false;
  double statistic = std::nan(""), threshold = std::nan("");
  double probability = std::nan("");  // its tail probability (NaN: it gives none)
  std::vector<double> extras;  // the test's extra columns
};

// The typed verdict on one record, as every output receives it.
struct Verdict {
  std::optional<double> score;      // empty: no test could judge the record
  double probability = std::nan(""); // combined over the tests (score/flag_rule.hpp); NaN: none gave one
  // Names of the tests that flagged it: under a probability rule, those whose own probability is
  // within the knob, or `combined` when only their evidence together is; checks by their own cutoff.
  std::vector<std::string> flags;
  std::vector<std::string> reasons; // plain words, most severe test first
  std::vector<std::string> codes;   // reason codes of tests that could not judge it, or withheld their flags
  std::vector<TestResult> tests;    // per test, in the run's order
  // A reviewer's decision from an earlier round (--decisions), its note, and for a `valid` record
  // the flags and reasons it would have had ("robust_z: ..."), set aside.
  Decision decision = Decision::none;
  std::string decision_note, set_aside;
  // Tests whose flag on this record the population guard withheld (codes looks_multimodal:TEST).
  std::vector<std::string> withheld() const;
  // Not decided as error or valid, and flagged or a flag withheld: a record a reviewer should see.
  bool open() const { return decision == Decision::none || decision == Decision::unsure; }
  bool for_review() const { return open() && (!flags.empty() || !withheld().empty()); }
};

// A decision applied to a verdict: `valid` sets its flags and reasons aside (never flagged
// again); `error` adds the code reviewed_error. The test results stay as they are.
void apply_decision(Verdict& verdict, Decision decision, const std::string& note);

// `findings[t]` is test t's finding for this record; `names[t]` its name; `flag` what the flag
// rule decided for it (flag_rule.hpp; under `cutoffs` each test's own flag stands).
// How the severities of the tests that judged a record make its score: `max` (the worst test:
// a score above 1 means some test flagged it) or `mean` (agreement counts: a record several tests
// find far from its taxon ranks above one only a single test finds far). Flags are the same
// either way; only the ranking differs.
enum class CombineRule { max, mean };
Verdict combine(const std::vector<const Finding*>& findings, const std::vector<std::string>& names,
                CombineRule rule = CombineRule::max, const RecordFlag& flag = {}, FlagRule flag_rule = FlagRule::cutoffs);

// "about 1 in 4,000" for a probability of 0.00025, for reasons a reviewer reads.
std::string one_in(double probability);

// Rank 1 = highest score. Records without a score get rank 0 (written as empty). With `tiers`
// (per record; empty: all 0), a lower tier ranks first whatever the scores: open records, then
// those decided valid, then those decided error (review_tier).
std::vector<std::size_t> rank_by_score(const std::vector<std::optional<double>>& scores,
                                       const std::vector<std::uint8_t>& tiers = {});
std::uint8_t review_tier(Decision decision);

}  // namespace envsift
