// outside_range in the catalog (test_registry.cpp): asked for by --ranges, and its options.
#include <cstdio>

#include "envsift/detect/range_check.hpp"
#include "envsift/detect/test_registry.hpp"
#include "envsift/read/range_layer.hpp"

namespace envsift {

TestEntry range_check_entry() {
  using R = RangeSettings;
  TestEntry e;
  e.name = RangeCheck::kName;
  e.own_defaults = R{};
  e.options.push_back(text_option("ranges", "FILE",
                                  "taxa's published ranges: an OGR polygon layer (GeoPackage, Shapefile, GeoJSON; any "
                                  "CRS) with a taxon field; flag records farther than --range-tolerance outside their "
                                  "taxon's range (outside_range)",
                                  own(&R::path)));
  e.options.push_back(text_option("range-taxon-field", "NAME", "the range layer's field naming the taxon",
                                  own(&R::taxon_field)));
  e.options.push_back(text_option("range-filter", "SQL",
                                  "use only the range features this OGR SQL WHERE clause selects, e.g. "
                                  "\"season = 'resident'\" (a field of your layer) for the parts where the taxon lives all year",
                                  own(&R::filter)));
  e.options.push_back(real_option("range-tolerance", "KM",
                                  "flag only records more than KM kilometres outside their taxon's range, beyond their "
                                  "uncertainty (range maps hold only at grains of about 1-2 degrees)",
                                  own(&R::tolerance_km), above(0)));
  e.describe = [](const TestSettings& s) {
    const R& r = s.own.get<R>();
    char tolerance[32];
    std::snprintf(tolerance, sizeof tolerance, "%.0f", r.tolerance_km);
    return std::string(RangeCheck::kName) + ": the record lies more than " + tolerance + " km outside its taxon's range in " +
           r.path + " (great-circle distance from its uncertainty disc)";
  };
  e.make_check = [](const TestSettings& s) -> std::unique_ptr<RecordCheck> {
    return std::make_unique<RangeCheck>(s.own.get<R>());
  };
  e.wanted_check = [](const TestSettings& s) { return !s.own.get<R>().path.empty(); };
  e.validate = [](const TestSettings& s, const TestContext&) {
    const R& r = s.own.get<R>();
    if (!r.path.empty()) RangeLayer{r.source()};  // a layer that cannot be used stops the run now
  };
  return e;
}

}  // namespace envsift
