// Reported elevation against the DEM.
// A label's elevation that the terrain nowhere near the point reaches is a strong sign of a wrong
// coordinate or a wrong label. The DEM's own vertical error (SRTM's specification: 16 m absolute,
// 90 % — from memory) and the habit of reading label elevations off maps or altimeters to the
// nearest 50-100 m are absorbed by the tolerance (default 100 m, envsift's choice).
#include "envsift/detect/reported_elevation.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace envsift {

Finding check_reported_elevation(const ReportedElevation& reported, const DemRange& dem, double tolerance_m,
                                 const std::string& dem_name) {
  Finding f;
  // nothing reported, or no DEM value: nothing to compare, and nothing wrong with the record
  if ((!reported.min_m && !reported.max_m) || !std::isfinite(dem.low) || !std::isfinite(dem.high)) return f;
  const double rmin = std::min(reported.min_m.value_or(*reported.max_m), reported.max_m.value_or(*reported.min_m));
  const double rmax = std::max(reported.min_m.value_or(*reported.max_m), reported.max_m.value_or(*reported.min_m));
  const double gap = std::max({rmin - dem.high, dem.low - rmax, 0.0});
  f.tested = true;
  f.statistic = gap;
  f.threshold = tolerance_m;
  f.severity = gap / tolerance_m;
  f.flagged = gap > tolerance_m;
  if (f.flagged) {
    char reported_text[64], dem_text[160];
    if (rmin == rmax) std::snprintf(reported_text, sizeof reported_text, "%.0f m", rmin);
    else std::snprintf(reported_text, sizeof reported_text, "%.0f to %.0f m", rmin, rmax);
    if (dem.radius_m > 0 && dem.low < dem.high)
      std::snprintf(dem_text, sizeof dem_text, "%s within %.0f m of the point spans %.0f to %.0f m", dem_name.c_str(),
                    dem.radius_m, dem.low, dem.high);
    else
      std::snprintf(dem_text, sizeof dem_text, "%s at the point is %.0f m", dem_name.c_str(), dem.low);
    f.reasons.push_back(std::string("reported elevation ") + reported_text + ", but " + dem_text + " (" +
                        std::to_string(static_cast<long>(std::lround(gap))) + " m apart)");
  }
  return f;
}

}  // namespace envsift
