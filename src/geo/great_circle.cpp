#include "envsift/geo/great_circle.hpp"

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

std::pair<double, double> destination(double lon, double lat, double azimuth_deg, double distance_m) {
  constexpr double rad = 3.14159265358979323846 / 180.0;
  const double d = distance_m / kEarthRadiusM, phi1 = lat * rad, theta = azimuth_deg * rad;
  const double phi2 = std::asin(std::sin(phi1) * std::cos(d) + std::cos(phi1) * std::sin(d) * std::cos(theta));
  const double lambda2 =
      lon * rad + std::atan2(std::sin(theta) * std::sin(d) * std::cos(phi1), std::cos(d) - std::sin(phi1) * std::sin(phi2));
  return {lambda2 / rad, phi2 / rad};
}

}  // namespace envsift
