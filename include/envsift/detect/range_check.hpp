// A record against its taxon's published range (--ranges): how far outside the range it lies.
// Range maps are coarse — expert-drawn outlines miss fine detail and draw straight, wrong limits —
// so only a record well outside is flagged: farther than the tolerance (default 100 km, about a
// degree of latitude: range maps hold only at grains of about 1-2° and coarser, Hurlbert & Jetz
// 2007, PNAS 104:13384-13389, from memory). A record so far off is the gross georeferencing error
// (a country or district centroid, a swapped sign) that the environmental tests miss when the
// wrong place has a similar climate. The check needs only coordinates, so it judges records that
// fall off every layer or on nodata too.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "envsift/detect/record_check.hpp"
#include "envsift/read/range_layer.hpp"

namespace envsift {

// Its own settings in a run (TestSettings::own; --ranges, --range-taxon-field, --range-filter,
// --range-tolerance).
struct RangeSettings {
  std::string path;                           // the range layer; empty: no check
  std::string taxon_field = "scientificName";
  std::string filter;                         // OGR SQL WHERE clause on its features
  double tolerance_km = 100;                  // flag records farther than this outside the range
  RangeSource source() const { return {path, taxon_field, filter}; }
};

// The finding for a record `outside_m` metres beyond its taxon's range (0 inside), its uncertainty
// disc's edge considered (`radius_m` = 0 without one). Statistic: kilometres outside beyond the
// disc; threshold: the tolerance; severity: their ratio; flagged beyond the tolerance, with the
// reason "412 km outside the range of Taxon".
Finding judge_range_distance(double outside_m, double radius_m, double tolerance_km, const std::string& taxon);

class RangeCheck : public RecordCheck {
 public:
  static constexpr const char* kName = "outside_range";
  explicit RangeCheck(RangeSettings settings) : settings_(std::move(settings)) {}
  std::string name() const override { return kName; }
  // Reads each taxon's range once (in parallel, one taxon at a time per thread) and measures its
  // records; warns of names that look like a range's but do not match it.
  void prepare(RecordTable& table) override;
  Finding judge(std::size_t record) const override;

 private:
  RangeSettings settings_;
  const RecordTable* table_ = nullptr;
  std::vector<float> outside_m_;  // per record: metres outside its taxon's range; NaN: not measured
  std::vector<float> radius_m_;   // per record: its disc's radius (0: none)
  std::vector<char> has_range_;   // per record: its taxon has a range
};

}  // namespace envsift
