// Great-circle distances against PROJ's geod (Debian proj-bin) on the same sphere
// (`geod +a=6371008.8 +es=0 -I`), and a worked haversine example.
#include "envsift/geo/great_circle.hpp"

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

struct GeodResult {
  double azimuth, back_azimuth, distance;
};

// PROJ's geod, inverse problem on the same sphere, for (lon1, lat1, lon2, lat2) pairs.
std::vector<GeodResult> geod_inverse(const std::vector<std::array<double, 4>>& pairs, const std::string& dir) {
  std::ostringstream in;
  in.precision(15);
  for (const auto& p : pairs) in << p[1] << " " << p[0] << " " << p[3] << " " << p[2] << "\n";  // geod: lat lon lat lon
  write_file(dir + "/pairs.txt", in.str());
  auto r = run("geod +a=6371008.8 +es=0 -I -f %.9f -F %.6f < " + dir + "/pairs.txt");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  std::istringstream out(r.output);
  std::vector<GeodResult> results;
  GeodResult g;
  while (out >> g.azimuth >> g.back_azimuth >> g.distance) results.push_back(g);
  EXPECT_EQ(results.size(), pairs.size());
  results.resize(pairs.size(), GeodResult{NAN, NAN, NAN});
  return results;
}

TEST(GreatCircle, MatchesGeodOnTheSameSphere) {
  std::mt19937_64 rng(3);
  std::uniform_real_distribution<double> lat(-89, 89), lon(-180, 180), small(-0.05, 0.05);
  std::vector<std::array<double, 4>> pairs;
  for (int i = 0; i < 200; ++i) {
    const double la = lat(rng), lo = lon(rng);
    // half long distances, half within a few km (uncertainty discs)
    pairs.push_back(i % 2 ? std::array<double, 4>{lo, la, lon(rng), lat(rng)}
                          : std::array<double, 4>{lo, la, lo + small(rng), std::clamp(la + small(rng), -90.0, 90.0)});
  }
  const auto geod = geod_inverse(pairs, temp_dir("geod"));
  for (std::size_t k = 0; k < pairs.size(); ++k) {
    const auto& p = pairs[k];
    const double d = geod[k].distance;
    EXPECT_NEAR(great_circle_m(p[0], p[1], p[2], p[3]), d, 1e-6 * std::max(1.0, d) + 1e-3);
  }
}

// Disc outlines (GIS output): each destination point lies at the radius and azimuth asked, as
// PROJ's geod measures them on the same sphere.
TEST(GreatCircle, DestinationsMatchGeod) {
  std::vector<std::array<double, 4>> cases, pairs;  // cases: lon, lat, azimuth, distance
  for (double lat : {0.0, 45.0, -70.0})
    for (double azimuth : {0.0, 35.0, 90.0, 200.0, 315.0})
      for (double distance : {1000.0, 25000.0, 500000.0}) cases.push_back({10.0, lat, azimuth, distance});
  for (const auto& c : cases) {
    const auto [lon2, lat2] = destination(c[0], c[1], c[2], c[3]);
    pairs.push_back({c[0], c[1], lon2, lat2});
  }
  const auto geod = geod_inverse(pairs, temp_dir("destination"));
  for (std::size_t k = 0; k < cases.size(); ++k) {
    EXPECT_NEAR(geod[k].distance, cases[k][3], 1e-3);
    EXPECT_NEAR(std::remainder(geod[k].azimuth - cases[k][2], 360.0), 0.0, 1e-6) << cases[k][2];
  }
}

}  // namespace
}  // namespace envsift
