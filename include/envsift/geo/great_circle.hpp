// Distances on a spherical Earth, for uncertainty discs.
#pragma once
#include <utility>

namespace envsift {

// Mean Earth radius R1 = (2a + b)/3 of GRS 80 / WGS 84, 6 371 008.8 m (IUGG; Moritz 2000,
// "Geodetic Reference System 1980", Journal of Geodesy 74:128-133).
constexpr double kEarthRadiusM = 6371008.8;

// Great-circle distance in metres between two longitude/latitude points (degrees), by the
// haversine formula, which stays accurate for small distances (Sinnott 1984, Sky and Telescope
// 68:159).
double great_circle_m(double lon1, double lat1, double lon2, double lat2);

// The point `distance_m` from (lon, lat) along the great circle leaving at `azimuth_deg`
// (clockwise from north), on the same sphere: the destination formula.
std::pair<double, double> destination(double lon, double lat, double azimuth_deg, double distance_m);

}  // namespace envsift
