// Great-circle distances against PROJ's geod (Debian proj-bin) on the same sphere
// (`geod +a=6371008.8 +es=0 -I`), and a worked haversine example.
#include "envsift/sample/great_circle.hpp"

#include <array>
#include <cmath>
#include <random>
#include <sstream>

#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(GreatCircle, OneDegreeOfLatitude) {
  // Worked example: one degree along a meridian is R·π/180 = 6371008.8 m × 0.01745329252 = 111195.08 m.
  EXPECT_NEAR(great_circle_m(10, 0, 10, 1), 111195.08, 0.01);
  EXPECT_DOUBLE_EQ(great_circle_m(5, 5, 5, 5), 0.0);
}

TEST(GreatCircle, MatchesGeodOnTheSameSphere) {
  const auto dir = temp_dir("geod");
  std::mt19937_64 rng(3);
  std::uniform_real_distribution<double> lat(-89, 89), lon(-180, 180), small(-0.05, 0.05);
  std::ostringstream in;
  in.precision(12);
  std::vector<std::array<double, 4>> pairs;
  for (int i = 0; i < 200; ++i) {
    const double la = lat(rng), lo = lon(rng);
    // half long distances, half within a few km (uncertainty discs)
    const std::array<double, 4> p = i % 2 ? std::array<double, 4>{lo, la, lon(rng), lat(rng)}
                                          : std::array<double, 4>{lo, la, lo + small(rng), std::clamp(la + small(rng), -90.0, 90.0)};
    pairs.push_back(p);
    in << p[1] << " " << p[0] << " " << p[3] << " " << p[2] << "\n";  // geod reads lat lon lat lon
  }
  write_file(dir + "/pairs.txt", in.str());
  auto r = run("geod +a=6371008.8 +es=0 -I -f %.9f -F %.6f < " + dir + "/pairs.txt");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  std::istringstream out(r.output);
  for (const auto& p : pairs) {
    double az1, az2, d;
    ASSERT_TRUE(out >> az1 >> az2 >> d);
    EXPECT_NEAR(great_circle_m(p[0], p[1], p[2], p[3]), d, 1e-6 * std::max(1.0, d) + 1e-3);
  }
}

// Disc outlines (GIS output): each destination point lies at the radius and azimuth asked, as
// PROJ's geod measures them on the same sphere.
TEST(GreatCircle, DestinationsMatchGeod) {
  const auto dir = temp_dir("destination");
  std::ostringstream in;
  in.precision(15);
  std::vector<std::array<double, 4>> cases;  // lon, lat, azimuth, distance
  for (double lat : {0.0, 45.0, -70.0})
    for (double azimuth : {0.0, 35.0, 90.0, 200.0, 315.0})
      for (double distance : {1000.0, 25000.0, 500000.0}) cases.push_back({10.0, lat, azimuth, distance});
  for (const auto& c : cases) {
    const auto [lon2, lat2] = destination(c[0], c[1], c[2], c[3]);
    in << c[1] << " " << c[0] << " " << lat2 << " " << lon2 << "\n";
  }
  write_file(dir + "/pairs.txt", in.str());
  auto r = run("geod +a=6371008.8 +es=0 -I -f %.9f -F %.6f < " + dir + "/pairs.txt");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  std::istringstream out(r.output);
  for (const auto& c : cases) {
    double az1, az2, d;
    ASSERT_TRUE(out >> az1 >> az2 >> d);
    EXPECT_NEAR(d, c[3], 1e-3);
    EXPECT_NEAR(std::remainder(az1 - c[2], 360.0), 0.0, 1e-6) << c[2];
  }
}

}  // namespace
}  // namespace envsift
