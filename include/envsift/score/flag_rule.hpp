// How a record comes to be flagged: from the tests' tail probabilities (Finding::probability),
// combined, at one knob — the share of a taxon's clean records a user accepts to see flagged
// (--flag-share, default 1 %) — or, with --flag-rule fdr, at that false discovery rate among a
// taxon's records (Benjamini & Hochberg 1995); with --flag-rule cutoffs, by each test's own
// cutoff as before. A record check (reported elevation, range) and a test that only ranks
// (reverse jackknife) give no probability: checks flag by their own tolerance under every
// rule; a ranking-only test flags only under `cutoffs`.
//
// Combination: the Cauchy combination (Liu & Xie 2020; detect/tail_probability.hpp) of the
// probabilities of the tests that judged the record, equal weights. It stays valid when the
// tests are dependent — they all see the same values — which Fisher's product does not, and it
// is less conservative than the Šidák minimum when several tests see the same departure; its
// tail is exact for any dependence as p → 0 (Liu & Xie, Theorem 1), and near 1 % it holds within
// a few per cent of the level for correlated normal statistics (their simulations).
#pragma once
#include <cmath>
#include <cstddef>
#include <vector>

#include "envsift/detect/detector.hpp"
#include "envsift/detect/test_settings.hpp"

namespace envsift {

struct FlagSettings {
  FlagRule rule = FlagRule::cutoffs;
  double share = 0.01;  // the knob (a share of clean records; the FDR under `fdr`)
};

// What the rule decided for one record.
struct RecordFlag {
  double probability = std::nan("");  // the combined probability; NaN: no test gave one
  bool flagged = false;               // flagged by the combined evidence (not by a check)
};

// A taxon's findings, [test][record], before the population guard: under `share` and `fdr` each
// test's `flagged` becomes "its own probability is at most the knob" (nothing for a test
// without one), so the guard counts what that test's evidence alone would flag. Under `cutoffs`
// nothing changes.
void flag_tests_at_knob(std::vector<std::vector<Finding>>& findings, const FlagSettings& settings);

// The combined probability of one record from its findings (tests whose flags the guard
// withheld left out).
double combined_probability(const std::vector<const Finding*>& findings);

// After the guard: each record's combined probability and flag, for the whole taxon (the FDR
// rule ranks the taxon's records together). Under `cutoffs` no record is flagged here: the
// tests' own flags stand.
std::vector<RecordFlag> decide_flags(const std::vector<std::vector<Finding>>& findings, const FlagSettings& settings);

}  // namespace envsift
