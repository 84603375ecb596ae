// Values kept as floats must read back as the layer's own cell values. Reference: GDAL's own
// RasterIO into Float64 (the library every GIS reads these files with), on a Float32, an Int16
// and a UInt16 raster, nearest and bilinear; and which layers are stored as floats at all.
#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include <gdal_priv.h>

#include "../raster_support.hpp"
#include "../support.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

std::string make_raster(const std::string& path, GDALDataType type, double scale) {
  std::mt19937 rng(7);
  std::uniform_real_distribution<double> u(-3000, 3000);
  std::vector<double> cells(50 * 40);
  for (auto& c : cells) c = type == GDT_Float32 ? u(rng) / 7 : std::round(std::fabs(u(rng)));
  return write_raster(path, 50, 40, type, {10, 0.1, 0, 50, 0, -0.1}, cells, std::nullopt, scale);
}

TEST(ValueTable, FloatColumnsHoldTheCellsOwnValues) {
  const auto dir = temp_dir("value-table");
  const std::vector<LayerSpec> specs{{"f32", make_raster(dir + "/f32.tif", GDT_Float32, 1)},
                                     {"i16", make_raster(dir + "/i16.tif", GDT_Int16, 1)},
                                     {"u16", make_raster(dir + "/u16.tif", GDT_UInt16, 1)},
                                     {"scaled", make_raster(dir + "/scaled.tif", GDT_Int16, 0.1)}};
  RasterStack stack(specs);
  std::vector<double> lon, lat;
  for (int i = 0; i < 500; ++i) lon.push_back(10.005 + (i % 50) * 0.1), lat.push_back(49.995 - (i / 50) * 0.1 * 3.9);
  const Samples nearest = stack.sample(lon, lat, Interpolation::nearest);
  EXPECT_TRUE(nearest.values.as_float(0));
  EXPECT_TRUE(nearest.values.as_float(1));
  EXPECT_TRUE(nearest.values.as_float(2));
  EXPECT_FALSE(nearest.values.as_float(3));  // scale 0.1: a double, as the scaled value is
  for (std::size_t l = 0; l < specs.size(); ++l) {
    GDALDataset* ds = static_cast<GDALDataset*>(GDALOpen(specs[l].path.c_str(), GA_ReadOnly));
    const double scale = ds->GetRasterBand(1)->GetScale();
    for (std::size_t i = 0; i < lon.size(); ++i) {
      const int col = static_cast<int>((lon[i] - 10) / 0.1), row = static_cast<int>((50 - lat[i]) / 0.1);
      double cell = 0;
      ASSERT_EQ(ds->GetRasterBand(1)->RasterIO(GF_Read, col, row, 1, 1, &cell, 1, 1, GDT_Float64, 0, 0), CE_None);
      // a scaled integer is rounded to its scale's decimals (docs/usage.md, sampling): 1636 × 0.1 is 163.6
      const double expected = scale == 1 ? cell : std::round(cell * scale * 10) / 10;
      EXPECT_EQ(nearest.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l)), expected) << specs[l].name << " " << i;
    }
    GDALClose(ds);
  }
  const Samples bilinear = stack.sample(lon, lat, Interpolation::bilinear);
  for (Eigen::Index l = 0; l < 4; ++l) EXPECT_FALSE(bilinear.values.as_float(l));  // interpolated: doubles
}

TEST(ValueTable, ColumnsAddedAndRowsGathered) {
  ValueTable t(3, {true, false});
  t.set(0, 0, 1.5), t.set(2, 1, 0.1);
  t.add_column(false);
  t.set(1, 2, -2);
  EXPECT_EQ(t.cols(), 3);
  EXPECT_TRUE(std::isnan(t(1, 0)));
  EXPECT_EQ(t(2, 1), 0.1);  // a double column keeps every bit
  EXPECT_TRUE(t.any_finite(1));
  EXPECT_FALSE(ValueTable(1, {true}).any_finite(0));
  const Eigen::MatrixXd b = t.block(1, 2, {2, 1});
  EXPECT_EQ(b(0, 0), -2);
  EXPECT_EQ(b(1, 1), 0.1);
  EXPECT_EQ(t.bytes(), 3 * (4 + 8 + 8u));
}

}  // namespace
}  // namespace envsift
