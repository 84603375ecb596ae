// landscape in the catalog (test_registry.cpp): its options, and the landscape it asks the run to
// draw around each taxon.
#include <algorithm>
#include <cstdio>

#include "envsift/detect/landscape.hpp"
#include "envsift/detect/test_registry.hpp"

namespace envsift {

TestEntry landscape_entry() {
  using L = LandscapeSettings;
  TestEntry e;
  e.name = LandscapeTest::kName;
  e.is_default = true;
  e.needs_layers = true;
  e.help = "all layers together against the landscape around the taxon: flags a record whose environment is common "
           "there but rare among the taxon's records (presence against availability, needs layers, not value columns);";
  e.own_defaults = L{};
  e.options.push_back(real_option(
      "landscape-ratio", "R",
      "landscape flags a record whose environment is more than R times as common in the taxon's landscape as among its "
      "records (a fitted presence-against-landscape model). R = (1 - share of errors) / share: 5 says a record is "
      "more likely an error than not where errors are 1 in 6 of the records in such environments; 5 measured best "
      "(docs/evaluation.md, envsift evaluate)",
      own(&L::ratio), above(1)));
  e.options.push_back(choice_option(
      "landscape-area",
      "where a taxon's landscape is drawn. buffer: within a radius of its records (--landscape-spread times the "
      "taxon's spread, the median distance of its places from their centre, at least --landscape-min-km and 10 "
      "cells); extent: anywhere in the first layer's extent, the same for every taxon",
      own(&L::area), Choices<LandscapeArea>{{"buffer", LandscapeArea::buffer}, {"extent", LandscapeArea::extent}}));
  e.options.push_back(real_option("landscape-spread", "F", "buffer radius in units of the taxon's spread (see --landscape-area)",
                                  own(&L::spread), above(0)));
  e.options.push_back(real_option("landscape-min-km", "KM", "the smallest buffer radius, kilometres", own(&L::min_km),
                                  at_least(0)));
  e.options.push_back(count_option("landscape-cells", "N", "cells drawn from each taxon's landscape (50 to 100000)",
                                   own(&L::cells), between(50, 100000)));
  e.describe = [](const TestSettings& s) {
    const L& l = s.own.get<L>();
    char buf[300];
    std::snprintf(buf, sizeof buf,
                  "%s: flags a record whose environment is more than %s times as common in the taxon's landscape (%s) "
                  "as among its records",
                  LandscapeTest::kName, number_text(l.ratio).c_str(),
                  l.area == LandscapeArea::extent
                      ? "the layers' extent"
                      : (number_text(l.spread) + " x its spread around its records, at least " + number_text(l.min_km) +
                         " km")
                            .c_str());
    return std::string(buf);
  };
  e.make_detector = [](const TestSettings& s) -> std::unique_ptr<Detector> {
    LandscapeTestOptions o;
    o.ratio_cutoff = s.own.get<L>().ratio;
    o.min_records = std::max<std::size_t>(s.min_records, 20);
    o.normal_scores = s.scale == Scale::skew;
    return std::make_unique<LandscapeTest>(o);
  };
  e.landscape = [](const TestSettings& s) {
    const L& l = s.own.get<L>();
    LandscapeOptions o;
    o.area = l.area;
    o.spread_factor = l.spread;
    o.min_radius_km = l.min_km;
    o.cells = l.cells;
    o.seed = s.seed;
    return o;
  };
  return e;
}

}  // namespace envsift
