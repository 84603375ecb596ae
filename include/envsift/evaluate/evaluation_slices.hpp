// The slices of an evaluation: the same verdicts measured on the part of the virtual records each
// question is about. A slice chooses which errors and which clean records count; every metric of
// detection_metrics.hpp is then computed over them (the ranking too, within the slice).
//   all                every error, every clean record
//   single_errors      errors of one record each (relocation, swap, sign flips, decimal shift)
//   relocations        … of those, the relocations only
//   batch_errors       records moved in batches to one to a few wrong places
//   second_population  no errors; the clean records of taxa's second populations (its
//                      false_flag_rate is the share of a genuine second population flagged)
//   places_A_B         errors and clean records of taxa with A to B distinct places (cells),
//                      the size classes the small-taxa targets are set for
#pragma once
#include <cstddef>
#include <functional>
#include <string>
#include <vector>

#include "envsift/evaluate/detection_metrics.hpp"

namespace envsift {

// What the evaluation knows of a virtual record besides its verdict.
struct RecordTruth {
  std::string error;               // the kind of error, empty for a clean record
  bool second_population = false;  // clean, from its taxon's second population
  std::size_t taxon_places = 0;    // distinct places (coordinates) of its taxon's records
};

struct EvaluationSlice {
  std::string name;
  std::function<bool(const RecordTruth&)> counts;  // whether the record is in the slice
};

const std::vector<EvaluationSlice>& evaluation_slices();

// The metrics over the records of one slice.
DetectionMetrics measure_slice(const EvaluationSlice& slice, const std::vector<RecordTruth>& truth,
                               const std::vector<JudgedRecord>& judged);

}  // namespace envsift
