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

struct Compared {
  std::size_t compared = 0, outside = 0, nodata = 0;
};

// Samples the points on every demo layer and compares each with gdallocationinfo's value.
Compared compare_with_gdallocationinfo(const std::string& dir, const std::vector<double>& lon, const std::vector<double>& lat) {
  std::vector<std::string> args;
  for (const std::string name : {"dem", "temperature", "rainfall", "dry_months"})
    args.push_back(source_path("demo-rasters/" + name + ".tif"));
  RasterStack stack(expand_layer_arguments(args), 8u << 20);
  std::ostringstream points;
  points.precision(17);
  for (std::size_t i = 0; i < lon.size(); ++i) points << lon[i] << " " << lat[i] << "\n";
  write_file(dir + "/points.txt", points.str());

  const Samples s = stack.sample(lon, lat, Interpolation::nearest);
  Compared c;
  for (std::size_t l = 0; l < stack.layers().size(); ++l) {
    const LayerInfo& layer = stack.layers()[l];
    SCOPED_TRACE(layer.spec.name);
    auto r = run("gdallocationinfo -valonly -wgs84 " + layer.spec.path + " < " + dir + "/points.txt");
    EXPECT_EQ(r.exit_code, 0) << r.output;
    std::istringstream lines(r.output);
    std::string line;
    for (std::size_t i = 0; i < lon.size(); ++i) {
      if (!std::getline(lines, line)) {
        ADD_FAILURE() << "gdallocationinfo printed too few lines";
        return c;
      }
      const double mine = s.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l));
      if (line.empty()) {
        EXPECT_EQ(s.status_at(i, l), CellStatus::outside) << "point " << lon[i] << " " << lat[i];
        ++c.outside;
        continue;
      }
      const double raw = std::stod(line);
      if (layer.nodata && raw == *layer.nodata) {
        EXPECT_EQ(s.status_at(i, l), CellStatus::nodata) << "point " << lon[i] << " " << lat[i];
        ++c.nodata;
        continue;
      }
      EXPECT_EQ(s.status_at(i, l), CellStatus::ok) << "point " << lon[i] << " " << lat[i];
      if (layer.float32_values) {
        EXPECT_EQ(static_cast<float>(mine), static_cast<float>(raw)) << "point " << lon[i] << " " << lat[i];
      } else {
        double expected = raw * layer.scale + layer.offset;
        if (layer.decimals >= 0) expected = std::round(expected * std::pow(10, layer.decimals)) / std::pow(10, layer.decimals);
        EXPECT_EQ(mine, expected) << "point " << lon[i] << " " << lat[i];
      }
      ++c.compared;
    }
  }
  return c;
}

TEST(NearestSampling, EqualsGdallocationinfoOnEveryDemoLayer) {
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
  const Compared c = compare_with_gdallocationinfo(temp_dir("nearest"), lon, lat);
  EXPECT_GT(c.compared, 3000u);
  EXPECT_GT(c.outside, 0u);
  EXPECT_GT(c.nodata, 0u);
}

// Coordinates rounded to 0.1°, 0.01° or the DEM's 0.005° cell lie on cell edges of the
// geographic layers, where (x − x0) / Δx can evaluate just below a whole number: the cell must
// still be the one gdallocationinfo (gdal-bin) reports, on the geographic and the projected
// layers (UTM Int16 with scale, Byte with a larger extent) alike.
TEST(NearestSampling, PointsOnCellEdgesEqualGdallocationinfo) {
  std::vector<double> lon, lat;
  for (int i = -44; i <= 44; ++i)       // every 0.025°: multiples of the 0.005° DEM cell
    for (int j = -44; j <= 44; ++j) lon.push_back(i * 0.025), lat.push_back(j * 0.025);
  std::mt19937_64 rng(11);
  std::uniform_int_distribution<int> hundredths(-110, 110), two_hundredths(-220, 220);
  for (int k = 0; k < 1000; ++k) {     // rounded to 0.01° and to 0.005°, as occurrence data often are
    lon.push_back(hundredths(rng) / 100.0), lat.push_back(hundredths(rng) / 100.0);
    lon.push_back(two_hundredths(rng) * 0.005), lat.push_back(two_hundredths(rng) * 0.005);
  }
  lon.push_back(-0.8), lat.push_back(0.8);  // (x − x0)/Δx = 39.99999999999999 on the DEM
  lon.push_back(0.81), lat.push_back(0.33);
  const Compared c = compare_with_gdallocationinfo(temp_dir("nearest-edges"), lon, lat);
  EXPECT_GT(c.compared, 30000u);
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
