// How well a test (or the combined verdict) finds known errors.
//   recall (unsuitable)  flagged errors that moved into unsuitable environment / all such errors
//   recall (all)         flagged errors / all errors that could be scored
//   false-flag rate      flagged clean records / clean records
//   precision            flagged errors / flagged records
//   average precision    of the ranking by score, errors into unsuitable environment against
//                        clean records: the mean over those errors of the precision among the
//                        records ranked at or above each (an error never ranked counts 0) —
//                        the usual information-retrieval definition (e.g. Manning, Raghavan &
//                        Schütze 2008, Introduction to Information Retrieval, §8.4)
// Errors still in suitable environment are left out of the ranking: no environmental test can
// or should find them, and they are neither hits nor false alarms there.
#pragma once
#include <cstddef>
#include <vector>

namespace envsift {

struct JudgedRecord {
  bool error = false;       // an injected error
  bool unsuitable = false;  // … that moved the record into unsuitable environment
  bool scored = false;      // the test judged it
  bool flagged = false;
  double score = 0;         // for the ranking (higher = more suspicious)
};

struct DetectionMetrics {
  std::size_t errors = 0, errors_unsuitable = 0, clean = 0;
  std::size_t flagged_errors = 0, flagged_unsuitable = 0, flagged_clean = 0;
  double recall_unsuitable = 0, recall_all = 0, false_flag_rate = 0, precision = 0, average_precision = 0;
};

// Over the scored records (ranking ties: input order).
DetectionMetrics measure_detection(const std::vector<JudgedRecord>& records);

}  // namespace envsift
