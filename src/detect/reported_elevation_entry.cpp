// elevation_mismatch in the catalog (test_registry.cpp): asked for by --dem, its options, and the
// elevation layer it names for the report and the summary.
#include <cstdio>

#include "envsift/detect/reported_elevation.hpp"
#include "envsift/detect/test_registry.hpp"
#include "envsift/errors.hpp"

namespace envsift {

TestEntry reported_elevation_entry() {
  using E = ElevationSettings;
  TestEntry e;
  e.name = ReportedElevationCheck::kName;
  e.own_defaults = E{};
  e.options.push_back(text_option("dem", "LAYER",
                                  "the layer holding elevation in metres: compare each record's reported elevation "
                                  "with it (flag elevation_mismatch)",
                                  own(&E::dem_layer)));
  e.options.push_back(real_option("elevation-tolerance", "M",
                                  "flag only when the reported elevation and the DEM's range within the record's "
                                  "uncertainty are more than M metres apart (DEM error, and label elevations rounded "
                                  "to 50-100 m)",
                                  own(&E::tolerance_m), above(0)));
  e.options.push_back(text_option("min-elevation-column", "NAME",
                                  "reported minimum elevation (metres, or with a unit: '1200 m', '3900 ft')",
                                  own(&E::min_column)));
  e.options.push_back(text_option("max-elevation-column", "NAME", "reported maximum elevation", own(&E::max_column)));
  e.describe = [](const TestSettings& s) {
    const E& el = s.own.get<E>();
    char tolerance[32];
    std::snprintf(tolerance, sizeof tolerance, "%.0f", el.tolerance_m);
    return std::string(ReportedElevationCheck::kName) + ": the reported elevation is more than " + tolerance +
           " m outside the range of " + el.dem_layer + " within the record's uncertainty disc";
  };
  e.make_check = [](const TestSettings& s) -> std::unique_ptr<RecordCheck> {
    return std::make_unique<ReportedElevationCheck>(s.own.get<E>());
  };
  e.wanted_check = [](const TestSettings& s) { return !s.own.get<E>().dem_layer.empty(); };
  e.validate = [](const TestSettings& s, const TestContext& c) {
    if (!s.own.get<E>().dem_layer.empty() && c.values_from_columns)
      throw UsageError("--dem needs --layers: the elevation check compares with a sampled DEM");
  };
  e.elevation_layer = [](const TestSettings& s) { return s.own.get<E>().dem_layer; };
  return e;
}

}  // namespace envsift
