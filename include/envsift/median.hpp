// The median, once for every step that needs it (robust z, the adjusted boxplot, the population
// split, the MCD scales, the landscape buffer): the middle value, or the mean of the two middle values.
#pragma once
#include <algorithm>
#include <cstddef>
#include <vector>

namespace envsift {

// Of values in any order; reorders them. Not for an empty vector.
inline double median_in_place(std::vector<double>& v) {
  const std::size_t n = v.size(), mid = n / 2;
  std::nth_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(mid), v.end());
  const double upper = v[mid];
  if (n % 2) return upper;
  const double lower = *std::max_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(mid));
  return (lower + upper) / 2;
}

// Of a copy of the values.
inline double median_of(std::vector<double> v) { return median_in_place(v); }

// Of values sorted either way.
inline double median_of_sorted(const std::vector<double>& x) {
  const std::size_t n = x.size();
  return n % 2 ? x[n / 2] : (x[n / 2 - 1] + x[n / 2]) / 2;
}

}  // namespace envsift
