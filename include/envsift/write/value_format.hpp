// Number formatting for outputs: the shortest text that reads back to the same number, so
// outputs are exact, compact and identical on every run. Each format has a form that writes into
// a caller's buffer (std::to_chars, no allocation: the writers format millions of rows) and one
// that returns a string.
#pragma once
#include <string>

namespace envsift {

// Room for any number these functions write (%.3f of the largest double has 313 characters).
constexpr int kNumberChars = 320;

// NaN → empty. `as_float32`: the value came from a Float32 cell; print the shortest text that
// reads back to that 32-bit float (what GDAL's tools show), not its 17-digit double expansion.
// Writes into [out, out + kNumberChars) and returns the end.
char* put_value(char* out, double value, bool as_float32 = false);
std::string format_value(double value, bool as_float32 = false);

// Test statistics and cutoffs: six significant digits, as printf's %.6g (NaN → empty).
char* put_statistic(char* out, double value);
std::string format_statistic(double value);

// Probabilities: three significant digits, as printf's %.3g (NaN → empty).
char* put_probability(char* out, double p);

// Scores with three decimals, as printf's %.3f.
char* put_score(char* out, double score);
std::string format_score(double score);
// The score as written (format_score read back): records are ranked by it, so that merged
// shards rank exactly as a single run and a reader of the file sees the order it was ranked in.
double score_as_written(double score);
// A statistic as written (format_statistic read back); NaN stays NaN.
double statistic_as_written(double statistic);

}  // namespace envsift
