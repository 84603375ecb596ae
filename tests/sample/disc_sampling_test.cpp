// Disc min / mean / max against a brute force made only with outside tools: every cell centre
// in a window around the point is turned into longitude/latitude (by the geotransform for the
// geographic DEM, by GDAL's gdaltransform for the UTM rainfall layer), its distance to the point
// measured by PROJ's geod on the same sphere, and its value read by gdallocationinfo (gdal-bin).
#include <cmath>
#include <sstream>

#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

struct Brute {
  double min = INFINITY, max = -INFINITY, sum = 0;
  int count = 0;
};

std::vector<double> numbers(const std::string& text) {
  std::istringstream in(text);
  std::vector<double> v;
  double x;
  while (in >> x) v.push_back(x);
  return v;
}

Brute brute_force(const LayerInfo& layer, double lon, double lat, double radius, int home_col, int home_row,
                  const std::string& dir) {
  const auto& gt = layer.geotransform;
  const int window = 12;
  std::ostringstream centres, pixels;
  centres.precision(15);
  std::vector<std::pair<int, int>> cells;
  for (int r = home_row - window; r <= home_row + window; ++r)
    for (int c = home_col - window; c <= home_col + window; ++c) {
      if (c < 0 || r < 0 || c >= layer.width || r >= layer.height) continue;
      cells.emplace_back(c, r);
      centres << gt[0] + (c + 0.5) * gt[1] << " " << gt[3] + (r + 0.5) * gt[5] << "\n";
      pixels << c << " " << r << "\n";
    }
  write_file(dir + "/centres.txt", centres.str());
  write_file(dir + "/pixels.txt", pixels.str());
  std::vector<double> lonlat;
  if (layer.geographic) {
    lonlat = numbers(centres.str());
  } else {
    auto t = run("gdaltransform -s_srs EPSG:32631 -t_srs EPSG:4326 -output_xy < " + dir + "/centres.txt");
    EXPECT_EQ(t.exit_code, 0) << t.output;
    lonlat = numbers(t.output);
  }
  std::ostringstream pairs;
  pairs.precision(15);
  for (std::size_t k = 0; k < cells.size(); ++k) pairs << lat << " " << lon << " " << lonlat[2 * k + 1] << " " << lonlat[2 * k] << "\n";
  write_file(dir + "/pairs.txt", pairs.str());
  const auto geod = numbers(run("geod +a=6371008.8 +es=0 -I -f %.9f -F %.6f < " + dir + "/pairs.txt").output);
  const auto values = run("gdallocationinfo -valonly " + layer.spec.path + " < " + dir + "/pixels.txt");
  std::istringstream vin(values.output);
  Brute b;
  for (std::size_t k = 0; k < cells.size(); ++k) {
    std::string line;
    std::getline(vin, line);
    const bool home = cells[k].first == home_col && cells[k].second == home_row;
    if (!home && geod[3 * k + 2] > radius) continue;
    const double v = std::stod(line);
    if (layer.nodata && v == *layer.nodata) continue;
    b.min = std::min(b.min, v), b.max = std::max(b.max, v), b.sum += v, ++b.count;
  }
  return b;
}

TEST(DiscSampling, MatchesABruteForceWithGdalAndGeod) {
  const auto dir = temp_dir("discs");
  RasterStack stack(expand_layer_arguments({source_path("demo-rasters/dem.tif"), source_path("demo-rasters/rainfall.tif")}));
  // on the ridge's flank, in the dry valley, beside the lake (nodata cells), and a tiny disc
  const std::vector<double> lon{0.55, 0.81, -0.17, 0.3}, lat{0.4, 0.33, -0.2, 0.3}, radius{3000, 4500, 2500, 10};
  const DiscSamples d = stack.sample_discs(lon, lat, radius);
  const Samples point = stack.sample(lon, lat, Interpolation::nearest);
  for (std::size_t l = 0; l < 2; ++l) {
    const LayerInfo& layer = stack.layers()[l];
    for (std::size_t i = 0; i < lon.size(); ++i) {
      SCOPED_TRACE(layer.spec.name + " point " + std::to_string(i));
      // the containing cell, by gdallocationinfo itself
      auto where = run("gdallocationinfo -wgs84 " + layer.spec.path + " " + std::to_string(lon[i]) + " " + std::to_string(lat[i]));
      const auto at = where.output.find("Location: (");
      ASSERT_NE(at, std::string::npos) << where.output;
      const int col = std::stoi(where.output.substr(at + 11)), row = std::stoi(where.output.substr(where.output.find(',', at) + 1));
      const Brute b = brute_force(layer, lon[i], lat[i], radius[i], col, row, dir);
      ASSERT_GT(b.count, 0);
      const auto r = static_cast<Eigen::Index>(i), c = static_cast<Eigen::Index>(l);
      if (layer.float32_values) {  // gdallocationinfo prints a float32 cell with 15 digits
        EXPECT_EQ(static_cast<float>(d.min(r, c)), static_cast<float>(b.min));
        EXPECT_EQ(static_cast<float>(d.max(r, c)), static_cast<float>(b.max));
      } else {
        EXPECT_EQ(d.min(r, c), b.min);
        EXPECT_EQ(d.max(r, c), b.max);
      }
      EXPECT_NEAR(d.mean(r, c), b.sum / b.count, 1e-6 * std::fabs(b.sum / b.count));
      if (radius[i] < 100) {  // smaller than a cell: just the point's own value
        EXPECT_EQ(d.min(r, c), point.values(r, c));
        EXPECT_EQ(d.max(r, c), point.values(r, c));
      }
    }
  }
}

// Performance contract: within one run and layer a block is loaded once (the default cache
// holds the demo's working set).
TEST(DiscSampling, EachBlockIsReadOnce) {
  RasterStack stack(expand_layer_arguments({source_path("demo-rasters/dem.tif")}));
  std::vector<double> lon, lat, radius;
  for (int i = 0; i < 400; ++i) {
    lon.push_back(-0.9 + 0.0045 * i);
    lat.push_back(0.9 - 0.0045 * i);
    radius.push_back(5000);
  }
  stack.sample(lon, lat, Interpolation::nearest);
  stack.sample_discs(lon, lat, radius);
  const int blocks = ((400 + 63) / 64) * ((400 + 63) / 64);  // dem.tif: 400 × 400 cells in 64 × 64 tiles
  EXPECT_LE(stack.cache().loads(), static_cast<std::size_t>(blocks));
  EXPECT_EQ(stack.cache().evictions(), 0u);
}

}  // namespace
}  // namespace envsift
