// The elevation a record's label reports, against the DEM around its coordinates.
#pragma once
#include <optional>
#include <string>

#include "envsift/detect/detector.hpp"

namespace envsift {

struct ReportedElevation {
  std::optional<double> min_m, max_m;  // minimumElevationInMeters / maximumElevationInMeters
};

// The DEM around the record: its disc's range, or its point value (low == high) without a disc.
struct DemRange {
  double low, high;
  double radius_m;  // 0: no disc
};

// Flags `elevation_mismatch` when the reported range and the DEM range are more than
// `tolerance_m` apart. Statistic: that gap in metres; threshold: the tolerance; severity: gap /
// tolerance. Not tested (and no reason code) when the record reports no elevation or the DEM has
// no value there.
Finding check_reported_elevation(const ReportedElevation& reported, const DemRange& dem, double tolerance_m,
                                 const std::string& dem_name);

}  // namespace envsift
