// Nearest sampling must equal what GDAL itself reports for the same point:
// `gdallocationinfo -valonly -wgs84 FILE` (gdal-bin), fed lon/lat pairs on stdin, prints each
// cell's raw value, or an empty line for a point off the raster. Scale/offset are applied to the
// raw value as in the GDAL data model (value = raw * scale + offset).
#include <cmath>
#include <random>
#include <sstream>

#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(NearestSampling, EqualsGdallocationinfoOnEveryDemoLayer) {
  const auto dir = temp_dir("nearest");
  std::vector<std::string> args;
  for (const std::string name : {"dem", "temperature", "rainfall", "dry_months"})
    args.push_back(source_path("demo-rasters/" + name + ".tif"));
  RasterStack stack(expand_layer_arguments(args), 8u << 20);

  // 1,000 random points over and around the island (some fall off every layer), plus the lake
  // (nodata) and cell corners, where floor() decides.
  std::mt19937_64 rng(7);
  std::uniform_real_distribution<double> coord(-1.15, 1.15);
  std::vector<double> lon, lat;
  for (int i = 0; i < 1000; ++i) {
    lon.push_back(coord(rng));
    lat.push_back(coord(rng));
  }
  for (double c : {-0.2, -0.195, 0.0, 0.005, 0.5}) {
    lon.push_back(c);
    lat.push_back(c);
  }
  std::ostringstream points;
  points.precision(17);
  for (std::size_t i = 0; i < lon.size(); ++i) points << lon[i] << " " << lat[i] << "\n";
  write_file(dir + "/points.txt", points.str());

  const Samples s = stack.sample(lon, lat, Interpolation::nearest);
  std::size_t compared = 0, outside = 0, nodata = 0;
  for (std::size_t l = 0; l < stack.layers().size(); ++l) {
    const LayerInfo& layer = stack.layers()[l];
    SCOPED_TRACE(layer.spec.name);
    auto r = run("gdallocationinfo -valonly -wgs84 " + layer.spec.path + " < " + dir + "/points.txt");
    ASSERT_EQ(r.exit_code, 0) << r.output;
    std::istringstream lines(r.output);
    std::string line;
    for (std::size_t i = 0; i < lon.size(); ++i) {
      ASSERT_TRUE(std::getline(lines, line)) << "gdallocationinfo printed too few lines";
      const double mine = s.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l));
      if (line.empty()) {
        EXPECT_EQ(s.status_at(i, l), CellStatus::outside) << "point " << i;
        ++outside;
        continue;
      }
      const double raw = std::stod(line);
      if (layer.nodata && raw == *layer.nodata) {
        EXPECT_EQ(s.status_at(i, l), CellStatus::nodata) << "point " << i;
        ++nodata;
        continue;
      }
      ASSERT_EQ(s.status_at(i, l), CellStatus::ok) << "point " << i;
      if (layer.float32_values) {
        EXPECT_EQ(static_cast<float>(mine), static_cast<float>(raw)) << "point " << i;
      } else {
        double expected = raw * layer.scale + layer.offset;
        if (layer.decimals >= 0) expected = std::round(expected * std::pow(10, layer.decimals)) / std::pow(10, layer.decimals);
        EXPECT_EQ(mine, expected) << "point " << i;
      }
      ++compared;
    }
  }
  EXPECT_GT(compared, 3000u);
  EXPECT_GT(outside, 0u);
  EXPECT_GT(nodata, 0u);
}

// The scale and offset envsift applies are the ones gdalinfo reports for the band.
TEST(NearestSampling, ScaleAndOffsetAreThoseGdalinfoReports) {
  const std::string path = source_path("demo-rasters/temperature.tif");
  auto r = run("gdalinfo " + path);
  ASSERT_EQ(r.exit_code, 0);
  EXPECT_NE(r.output.find("Offset: 0,   Scale:0.1"), std::string::npos) << r.output;
  RasterStack stack(expand_layer_arguments({path}));
  EXPECT_DOUBLE_EQ(stack.layers()[0].scale, 0.1);
  EXPECT_DOUBLE_EQ(stack.layers()[0].offset, 0.0);
  EXPECT_EQ(stack.layers()[0].decimals, 1);
}

}  // namespace
}  // namespace envsift
