// Step 5 of the pipeline: combine what the tests found into one score per record and rank.
//
//   score = max over tests t that judged the record of  statistic_t / threshold_t
//
// so score > 1 exactly when some test flagged the record (or flagged it and the population guard
// withheld the flag, score/population_guard.hpp), and scores are comparable across taxa
// and tests (each is "how many times its own cutoff"). Records are ranked by score, highest
// first; ties keep input order.
#pragma once
#include <cmath>
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "envsift/detect/detector.hpp"
#include "envsift/review/decision.hpp"

namespace envsift {

// What one test found for one record, as written to its columns.
struct TestResult {
  bool tested = false;
  double statistic = std::nan(""), threshold = std::nan("");
  std::vector<double> extras;  // the test's extra columns
};

// The typed verdict on one record, as every output receives it.
struct Verdict {
  std::optional<double> score;      // empty: no test could judge the record
  std::vector<std::string> flags;   // names of the tests that flagged it
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

// `findings[t]` is test t's finding for this record; `names[t]` its name.
// How the severities of the tests that judged a record make its score: `max` (the worst test:
// a score above 1 means some test flagged it) or `mean` (agreement counts: a record several tests
// find far from its taxon ranks above one only a single test finds far). Flags are the same
// either way; only the ranking differs.
enum class CombineRule { max, mean };
Verdict combine(const std::vector<const Finding*>& findings, const std::vector<std::string>& names,
                CombineRule rule = CombineRule::max);

// Rank 1 = highest score. Records without a score get rank 0 (written as empty). With `tiers`
// (per record; empty: all 0), a lower tier ranks first whatever the scores: open records, then
// those decided valid, then those decided error (review_tier).
std::vector<std::size_t> rank_by_score(const std::vector<std::optional<double>>& scores,
                                       const std::vector<std::uint8_t>& tiers = {});
std::uint8_t review_tier(Decision decision);

}  // namespace envsift
