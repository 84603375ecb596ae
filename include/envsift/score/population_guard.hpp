// A taxon with two populations in different environments (two mountain ranges, an island and the
// mainland) is not a taxon with many errors, but every test sees the smaller population as
// outliers. envsift's rule: when one test flags more than `max_share` of the records of a taxon it
// could judge (and at least `min_count` of them), that test's flags are withheld for the taxon —
// its statistics stay in the output, above their cutoff but not flagged — and the records get the
// code looks_multimodal:TEST, so the taxon is reviewed as a whole instead of record by record.
// The other tests still judge the taxon. A population smaller than max_share looks like a cluster
// of errors and stays flagged: the README says so.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "envsift/detect/detector.hpp"

namespace envsift {

struct PopulationGuard {
  double max_share = 0.15;
  std::size_t min_count = 5;
};

// Applies the rule to one test's findings for one taxon; returns the share it flagged when the
// flags were withheld, or a negative number when they stand.
double withhold_population_flags(std::vector<Finding>& findings, const std::string& test, const PopulationGuard& guard);

}  // namespace envsift
