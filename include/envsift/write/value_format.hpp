// Number formatting for outputs: the shortest text that reads back to the same number, so
// outputs are exact, compact and identical on every run.
#pragma once
#include <string>

namespace envsift {

// NaN → empty. `as_float32`: the value came from a Float32 cell; print the shortest text that
// reads back to that 32-bit float (what GDAL's tools show), not its 17-digit double expansion.
std::string format_value(double value, bool as_float32 = false);

// Test statistics and cutoffs: six significant digits (NaN → empty).
std::string format_statistic(double value);

// Scores with three decimals.
std::string format_score(double score);
// The score as written (format_score read back): records are ranked by it, so that merged
// shards rank exactly as a single run and a reader of the file sees the order it was ranked in.
double score_as_written(double score);
// A statistic as written (format_statistic read back); NaN stays NaN.
double statistic_as_written(double statistic);

}  // namespace envsift
