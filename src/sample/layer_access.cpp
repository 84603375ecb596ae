#include "layer_access.hpp"

#include <cmath>
#include <limits>

#include <omp.h>

#include "envsift/errors.hpp"
#include "gdal_init.hpp"

namespace envsift::detail {

std::unique_ptr<GDALDataset> open_raster(const std::string& path) {
  ensure_gdal_registered();
  CPLErrorReset();
  std::unique_ptr<GDALDataset> ds(
      GDALDataset::Open(path.c_str(), GDAL_OF_RASTER | GDAL_OF_READONLY, nullptr, nullptr, nullptr));
  if (!ds) {
    std::string detail = CPLGetLastErrorMsg();
    throw InputError(path, "cannot open as a raster" + (detail.empty() ? std::string() : " (" + detail + ")"),
                     "check the path and that the file is a complete GeoTIFF or other GDAL raster");
  }
  return ds;
}

void ThreadHandles::reset(std::size_t layers) {
  handles_.resize(static_cast<std::size_t>(omp_get_max_threads()));
  for (auto& h : handles_) h.resize(layers);
}

GDALRasterBand* ThreadHandles::band(const LayerInfo& layer, std::size_t index) {
  auto& mine = handles_[static_cast<std::size_t>(omp_get_thread_num())];
  if (!mine[index]) mine[index] = open_raster(layer.spec.path);
  return mine[index]->GetRasterBand(layer.spec.band);
}

LayerAccess::LayerAccess(const LayerInfo& layer, std::size_t index, BlockCache& cache, ThreadHandles& handles)
    : layer_(layer), index_(static_cast<std::uint32_t>(index)), cache_(cache), handles_(handles) {
  same_as_wgs84_ = is_wgs84_lon_lat(layer.crs_wkt);
  if (!GDALInvGeoTransform(const_cast<double*>(layer.geotransform.data()), inverse_.data()))
    throw InputError(layer.spec.path, "has a geotransform that cannot be inverted", "check its georeferencing (gdalinfo)");
}

CrsTransformation LayerAccess::transformation(bool forward) const {
  return forward ? new_transformation(wgs84_wkt(), layer_.crs_wkt) : new_transformation(layer_.crs_wkt, wgs84_wkt());
}

void LayerAccess::to_layer(std::vector<double>& x, std::vector<double>& y) const {
  if (same_as_wgs84_) return;
  const std::ptrdiff_t n = static_cast<std::ptrdiff_t>(x.size()), chunk = 4096;
#pragma omp parallel
  {
    auto ct = transformation(true);
#pragma omp for schedule(static)
    for (std::ptrdiff_t start = 0; start < n; start += chunk) {
      const std::size_t count = static_cast<std::size_t>(std::min(chunk, n - start));
      std::vector<int> ok(count);
      if (ct) ct->Transform(count, &x[start], &y[start], nullptr, ok.data());
      for (std::size_t k = 0; k < count; ++k)
        if (!ct || !ok[k]) x[start + k] = y[start + k] = std::numeric_limits<double>::quiet_NaN();
    }
  }
}

bool LayerAccess::pixel(double x, double y, double& px, double& py, double* shift) const {
  const auto& inv = inverse_;  // geotransforms are never rotated here (refused when read)
  px = inv[0] + inv[1] * x + inv[2] * y;
  py = inv[3] + inv[4] * x + inv[5] * y;
  if (shift) *shift = 0;
  if (layer_.geographic && std::isfinite(px) && (px < 0 || px >= layer_.width)) {
    for (double s : {360.0, -360.0}) {
      const double alt = inv[0] + inv[1] * (x + s) + inv[2] * y;
      if (alt >= 0 && alt < layer_.width) {
        px = alt;
        if (shift) *shift = s;
        break;
      }
    }
  }
  return px >= 0 && px < layer_.width && py >= 0 && py < layer_.height;
}

BlockCache::BlockPtr LayerAccess::block(int bx, int by) {
  return cache_.get({index_, static_cast<std::uint32_t>(bx), static_cast<std::uint32_t>(by)}, [&]() {
    GDALRasterBand* band = handles_.band(layer_, index_);
    Block b;
    b.width = layer_.block_width;
    b.height = layer_.block_height;
    const GDALDataType type = band->GetRasterDataType();
    const std::size_t cells = static_cast<std::size_t>(b.width) * static_cast<std::size_t>(b.height);
    std::vector<unsigned char> raw(cells * static_cast<std::size_t>(GDALGetDataTypeSizeBytes(type)));
    if (band->ReadBlock(bx, by, raw.data()) != CE_None)
      throw InputError(layer_.spec.path,
                       "cannot read block " + std::to_string(bx) + "," + std::to_string(by) + " (" +
                           CPLGetLastErrorMsg() + ")",
                       "the file may be truncated or corrupt; copy or download it again");
    const bool float_exact = type == GDT_Byte || type == GDT_UInt16 || type == GDT_Int16 || type == GDT_Float32;
    if (float_exact) {
      b.floats.resize(cells);
      GDALCopyWords64(raw.data(), type, GDALGetDataTypeSizeBytes(type), b.floats.data(), GDT_Float32, sizeof(float),
                      static_cast<GPtrDiff_t>(cells));
    } else {
      b.values.resize(cells);
      GDALCopyWords64(raw.data(), type, GDALGetDataTypeSizeBytes(type), b.values.data(), GDT_Float64, sizeof(double),
                      static_cast<GPtrDiff_t>(cells));
    }
    return b;
  });
}

double LayerAccess::raw(int col, int row) {
  const int bx = col / layer_.block_width, by = row / layer_.block_height;
  return block(bx, by)->at(col - bx * layer_.block_width, row - by * layer_.block_height);
}

double LayerAccess::value(double raw, bool round) const {
  double v = raw * layer_.scale + layer_.offset;
  if (round && layer_.decimals >= 0) {
    const double p = std::pow(10.0, layer_.decimals);
    v = std::round(v * p) / p;
  }
  return v;
}

}  // namespace envsift::detail
