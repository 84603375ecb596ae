// Distances from points to taxa's ranges, against R's sf with s2 (Debian r-cran-sf, r-cran-s2) on
// Natural Earth 1:110 m country outlines (Debian r-cran-rnaturalearthdata) as stand-in ranges:
// tests/reference/ranges/make_fixture.R made ranges.gpkg and expected.csv (293 points: inside,
// outside, across the antimeridian, up to 0.1° from a pole, in a hole, around multi-part ranges).
// Also: a reprojected copy of the layer (GDAL's ogr2ogr) gives the same answers as the WGS 84
// one; and small cases by hand (a meridian arc is a quarter of a great circle: arithmetic).
#include <cmath>
#include <map>
#include <memory>

#include <Eigen/Geometry>

#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/geo/range_distance.hpp"
#include "envsift/read/range_layer.hpp"
#include "envsift/geo/great_circle.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

const std::string kFixture = "tests/reference/ranges/";

struct Expected {
  std::string taxon;
  double lon, lat, angle;
};

std::vector<Expected> expected() {
  const Table t = read_csv(source_path(kFixture + "expected.csv"));
  std::vector<Expected> out;
  for (const auto& row : t.rows)
    out.push_back({row[t.column("taxon")], std::stod(row[t.column("lon")]), std::stod(row[t.column("lat")]),
                   std::stod(row[t.column("expected_rad")])});
  return out;
}

// Angles (radians) from envsift for every expected point, read from `layer`.
std::vector<double> measured(const std::string& layer, const std::vector<Expected>& points) {
  RangeLayer ranges(RangeSource{layer, "scientificName", ""});
  std::map<std::string, std::unique_ptr<TaxonRange>> loaded;
  std::vector<double> out;
  for (const auto& p : points) {
    auto& range = loaded[p.taxon];
    if (!range) range = ranges.load(p.taxon);
    out.push_back(range->distance_m(p.lon, p.lat) / kEarthRadiusM);
  }
  return out;
}

TEST(RangeDistance, EqualsS2OnNaturalEarthOutlines) {
  const auto points = expected();
  ASSERT_EQ(points.size(), 293u);
  const auto ours = measured(source_path(kFixture + "ranges.gpkg"), points);
  std::size_t inside = 0, across = 0, polar = 0;
  for (std::size_t k = 0; k < points.size(); ++k) {
    const Expected& p = points[k];
    SCOPED_TRACE(p.taxon + " " + std::to_string(p.lon) + " " + std::to_string(p.lat));
    if (p.angle == 0) {
      EXPECT_EQ(ours[k], 0.0);
      ++inside;
    } else {
      // 1e-6 rad is 6 m: both follow the drawn edges within about a metre
      EXPECT_NEAR(ours[k], p.angle, 1e-6 + 1e-6 * p.angle);
    }
    across += std::fabs(p.lon) > 179;
    polar += std::fabs(p.lat) > 85;
  }
  EXPECT_GT(inside, 20u);
  EXPECT_GE(across, 4u);
  EXPECT_GE(polar, 4u);
}

TEST(RangeDistance, APointInAHoleIsOutsideByTheDistanceToTheHolesEdge) {
  // (28.2 E, 29.6 S) is inside Lesotho, a hole in South Africa's outline
  const auto points = expected();
  const auto hole = std::find_if(points.begin(), points.end(), [](const Expected& p) { return p.lon == 28.2 && p.lat == -29.6; });
  ASSERT_NE(hole, points.end());
  EXPECT_GT(hole->angle, 0);
  EXPECT_LT(hole->angle * kEarthRadiusM, 120000);  // Lesotho is about 230 km across
  const auto ours = measured(source_path(kFixture + "ranges.gpkg"), {*hole});
  EXPECT_NEAR(ours[0], hole->angle, 1e-6);
}

TEST(RangeDistance, AReprojectedLayerGivesTheSameAnswers) {
  const auto dir = temp_dir("ranges-reprojected");
  // densified in longitude/latitude first, so that the projected copy draws the same outline
  const auto r = run("ogr2ogr -q -segmentize 0.05 -t_srs EPSG:6933 " + dir + "/ease.gpkg " +
                     source_path(kFixture + "ranges.gpkg"));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const auto points = expected();
  const auto wgs84 = measured(source_path(kFixture + "ranges.gpkg"), points);
  const auto ease = measured(dir + "/ease.gpkg", points);
  std::size_t compared = 0;
  for (std::size_t k = 0; k < points.size(); ++k) {
    SCOPED_TRACE(points[k].taxon + " " + std::to_string(points[k].lon) + " " + std::to_string(points[k].lat));
    // within 100 m (1.6e-5 rad): the copy's coordinates went through two projections
    EXPECT_NEAR(ease[k], wgs84[k], 1.6e-5);
    ++compared;
  }
  EXPECT_EQ(compared, points.size());
}

TEST(RangeDistance, ByHandOnAMeridianAndAtThePole) {
  // a thin ring along the 10° E meridian from the equator to 60° N
  const RangeEdges edges({{{10, 0}, {10, 60}, {10.0001, 60}, {10.0001, 0}}});
  // the pole is 30° beyond the ring's top end: π/6
  EXPECT_NEAR(edges.nearest_angle(10, 90), M_PI / 6, 1e-9);
  // a point on the equator 20° east of the meridian: 20° away along the equator
  EXPECT_NEAR(edges.nearest_angle(30.0001, 0), 20 * M_PI / 180, 1e-9);
  // across the antimeridian, at the ring's antipode (10° E, 0°): every point of the ring is
  // π − its angle from (10° E, 0°) away, so the nearest is the top end at 60° N: π − π/3
  EXPECT_NEAR(edges.nearest_angle(-170, 0), 2 * M_PI / 3, 1e-9);
  // on the meridian, halfway up: on the edge
  EXPECT_NEAR(edges.nearest_angle(10, 30), 0, 1e-9);
  EXPECT_TRUE(std::isinf(RangeEdges({}).nearest_angle(0, 0)));
}

TEST(RangeDistance, EdgesFollowTheLineDrawnInLongitudeLatitudeToAMetre) {
  // long edges where great circles and the drawn lines part most (|sin 2φ| = 1 at 45°), a diagonal
  // one, and one across the equator; points on each drawn line (linear in longitude and latitude)
  // must lie within 1 m of the arcs, and the line's midpoint on a 10° parallel is far (≈ 12 km,
  // from the bulge formula Δλ² sin 2φ / 16 · R) from the single great circle through its ends
  for (const auto& [a, b] : std::vector<std::pair<LonLat, LonLat>>{
           {{0, 45}, {10, 45}}, {{-30, 40}, {25, 50}}, {{100, -20}, {120, 15}}, {{-179, 60}, {179, 60}}}) {
    const RangeEdges edges({{a, b, {b.lon, b.lat + 0.001}, {a.lon, a.lat + 0.001}}});
    double worst = 0;
    for (int k = 0; k <= 1000; ++k) {
      const double t = k / 1000.0;
      worst = std::max(worst, edges.nearest_angle(a.lon + t * (b.lon - a.lon), a.lat + t * (b.lat - a.lat)) * kEarthRadiusM);
    }
    EXPECT_LT(worst, 1.0) << a.lon << " " << a.lat;
  }
  const Eigen::Vector3d p = unit_vector(0, 45), q = unit_vector(10, 45);
  const Eigen::Vector3d normal = p.cross(q).normalized();
  const double bulge = std::asin(std::fabs(unit_vector(5, 45).dot(normal))) * kEarthRadiusM;
  EXPECT_NEAR(bulge, std::pow(10 * M_PI / 180, 2) / 16 * kEarthRadiusM, 0.02 * bulge);
}

}  // namespace
}  // namespace envsift
