// Writes small WGS 84 GeoTIFFs for the sampling tests.
#pragma once
#include <array>
#include <optional>
#include <string>
#include <vector>

#include <gdal_priv.h>
#include <gtest/gtest.h>
#include <ogr_spatialref.h>

namespace envsift::testing {

// `cells` row by row (north first), written as `type`; returns `path`.
inline std::string write_raster(const std::string& path, int width, int height, GDALDataType type,
                                std::array<double, 6> geotransform, std::vector<double> cells,
                                std::optional<double> nodata = std::nullopt, double scale = 1) {
  GDALAllRegister();
  GDALDataset* ds = GetGDALDriverManager()->GetDriverByName("GTiff")->Create(path.c_str(), width, height, 1, type, nullptr);
  ds->SetGeoTransform(geotransform.data());
  OGRSpatialReference srs;
  srs.importFromEPSG(4326);
  ds->SetSpatialRef(&srs);
  if (nodata) ds->GetRasterBand(1)->SetNoDataValue(*nodata);
  if (scale != 1) ds->GetRasterBand(1)->SetScale(scale);
  if (ds->GetRasterBand(1)->RasterIO(GF_Write, 0, 0, width, height, cells.data(), width, height, GDT_Float64, 0, 0) != CE_None)
    ADD_FAILURE() << "cannot write " << path;
  GDALClose(ds);
  return path;
}

}  // namespace envsift::testing
