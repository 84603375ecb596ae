// Bilinear sampling: the four cell centres around a point, weighted by distance along each axis.
#include <cmath>

#include <gdal_priv.h>
#include <gtest/gtest.h>

#include "../raster_support.hpp"
#include "../support.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

// A 2 x 2 north-up grid, cells 1° wide, west edge 0, north edge 2 (centres at x 0.5/1.5, y 1.5/0.5):
//   10 20
//   30 40
std::string two_by_two(const std::string& dir, double nodata = -9999) {
  return write_raster(dir + "/grid.tif", 2, 2, GDT_Float64, {0, 1, 0, 2, 0, -1}, {10, 20, 30, 40}, nodata);
}

TEST(BilinearSampling, HandComputedTwoByTwo) {
  const auto dir = temp_dir("bilinear-hand");
  RasterStack stack(expand_layer_arguments({two_by_two(dir)}));
  // (1.0, 1.0) is equidistant from all four centres: (10+20+30+40)/4 = 25.
  // (0.75, 1.25): a quarter of a cell east of the west centres and a quarter south of the north
  // ones, so weights (1-¼)(1-¼), ¼(1-¼), (1-¼)¼, ¼·¼ on 10, 20, 30, 40:
  //   0.5625·10 + 0.1875·20 + 0.1875·30 + 0.0625·40 = 17.5
  // (0.5, 1.5) is the centre of the first cell: exactly 10.
  const Samples s = stack.sample({1.0, 0.75, 0.5}, {1.0, 1.25, 1.5}, Interpolation::bilinear);
  EXPECT_DOUBLE_EQ(s.values(0, 0), 25.0);
  EXPECT_DOUBLE_EQ(s.values(1, 0), 17.5);
  EXPECT_DOUBLE_EQ(s.values(2, 0), 10.0);
}

TEST(BilinearSampling, FallsBackToNearestAtEdgesAndBesideNodata) {
  const auto dir = temp_dir("bilinear-edge");
  RasterStack edge(expand_layer_arguments({two_by_two(dir)}));
  // (0.2, 1.8) lies west of the first centre: no four centres surround it → its cell, 10.
  EXPECT_DOUBLE_EQ(edge.sample({0.2}, {1.8}, Interpolation::bilinear).values(0, 0), 10.0);
  const auto dir2 = temp_dir("bilinear-nodata");
  RasterStack holed(expand_layer_arguments({two_by_two(dir2, 40)}));  // the 40 cell is nodata
  const Samples s = holed.sample({0.75, 1.6}, {1.25, 0.4}, Interpolation::bilinear);
  EXPECT_DOUBLE_EQ(s.values(0, 0), 10.0);  // one neighbour is nodata → the containing cell
  EXPECT_EQ(s.status_at(1, 0), CellStatus::nodata);
}

// Reference: R's terra::extract(method = "bilinear") (Debian r-cran-terra 1.7-3), fixture made by
// tests/reference/bilinear/make_fixture.R on interior points of a small non-linear grid.
TEST(BilinearSampling, AgreesWithTerraExtract) {
  const std::string dir = source_path("tests/reference/bilinear");
  RasterStack stack(expand_layer_arguments({dir + "/grid.tif"}));
  Table expected = read_csv(dir + "/expected.csv");
  ASSERT_GE(expected.rows.size(), 50u);
  std::vector<double> lon, lat;
  for (const auto& row : expected.rows) {
    lon.push_back(std::stod(row[0]));
    lat.push_back(std::stod(row[1]));
  }
  const Samples s = stack.sample(lon, lat, Interpolation::bilinear);
  for (std::size_t i = 0; i < expected.rows.size(); ++i)
    EXPECT_NEAR(s.values(static_cast<Eigen::Index>(i), 0), std::stod(expected.rows[i][2]), 1e-8) << "point " << i;
}

}  // namespace
}  // namespace envsift
