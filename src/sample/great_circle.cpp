#include "envsift/sample/great_circle.hpp"

#include <algorithm>
#include <cmath>

namespace envsift {

double great_circle_m(double lon1, double lat1, double lon2, double lat2) {
  constexpr double rad = 3.14159265358979323846 / 180.0;
  const double dlat = (lat2 - lat1) * rad, dlon = (lon2 - lon1) * rad;
  const double a = std::sin(dlat / 2) * std::sin(dlat / 2) +
                   std::cos(lat1 * rad) * std::cos(lat2 * rad) * std::sin(dlon / 2) * std::sin(dlon / 2);
  return 2 * kEarthRadiusM * std::asin(std::min(1.0, std::sqrt(a)));
}

}  // namespace envsift
