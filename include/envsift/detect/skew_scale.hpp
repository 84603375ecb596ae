// Skew-aware spread for one layer: the medcouple and the adjusted boxplot's fences, and from them
// a robust scale on each side of the median (see the .cpp for the paper and the formulas).
#pragma once
#include <vector>

namespace envsift {

// The medcouple MC of the finite values (0 for fewer than 3), as robustbase::mc computes it:
// the fast O(n log n) algorithm, and for n ≤ 100 the mean of MC(x) and −MC(−x).
double medcouple(std::vector<double> values);
// The same by its definition, O(n²): for tests.
double medcouple_by_definition(std::vector<double> values);

// Tukey's hinges and the adjusted boxplot's fences.
struct AdjustedFences {
  double lower_hinge, median, upper_hinge, medcouple, low, high;
};
AdjustedFences adjusted_fences(std::vector<double> values, double multiplier = 1.5);

// A robust scale on each side of the median: the distance from the median to the adjusted
// fence on that side, divided by the distance the fence has for a normal distribution
// (0.6745 + 1.5 × 1.349 = 2.698 SD), so both equal the SD for normal data. A side whose fence
// lies on the median (the hinges tied with it) gets `fallback`.
struct SideScales {
  double median, below, above;
  double z(double x) const { return (x - median) / (x < median ? below : above); }
};
SideScales side_scales(std::vector<double> values, double fallback);

// The resolution of the values: the smallest positive gap between two of them (0 when all are
// equal). A spread below it is an artefact of ties (a layer of whole months, classes, rounded
// values) and would make neighbouring classes look like outliers, so the tests never use one.
double resolution(std::vector<double> values);

}  // namespace envsift
