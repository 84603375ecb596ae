// The elevation a record's label reports, against the DEM around its coordinates.
#pragma once
#include <optional>
#include <string>

#include <vector>

#include "envsift/detect/detector.hpp"
#include "envsift/detect/record_check.hpp"

namespace envsift {

// Its own settings in a run (TestSettings::own; --dem, --elevation-tolerance and the reported
// elevation columns, Darwin Core terms by default).
struct ElevationSettings {
  std::string dem_layer;  // empty: no check
  double tolerance_m = 100;
  std::string min_column = "minimumElevationInMeters";
  std::string max_column = "maximumElevationInMeters";
};

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

// The DEM around record i: its disc's range (when it has a disc), else its point value.
struct RecordTable;
DemRange dem_range(const RecordTable& table, std::size_t record, std::size_t dem_layer);

// The check as a run uses it: reported elevations read from the label columns (an unreadable
// one gets elevation_unreadable:COLUMN), the DEM range from the sampled layer.
class ReportedElevationCheck : public RecordCheck {
 public:
  static constexpr const char* kName = "elevation_mismatch";
  explicit ReportedElevationCheck(ElevationSettings settings) : settings_(std::move(settings)) {}
  std::string name() const override { return kName; }
  void prepare(RecordTable& table) override;
  Finding judge(std::size_t record) const override;

 private:
  ElevationSettings settings_;
  std::vector<ReportedElevation> reported_;
  std::vector<DemRange> dem_;
};

}  // namespace envsift
