// Private to the sampling step: one layer's geometry and cell values, shared by point and disc
// sampling.
#pragma once
#include <array>
#include <memory>
#include <vector>

#include <gdal_priv.h>
#include <ogr_spatialref.h>

#include "envsift/geo/crs_transform.hpp"
#include "envsift/sample/block_cache.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift::detail {

std::unique_ptr<GDALDataset> open_raster(const std::string& path);

// GDAL datasets are not thread-safe: every thread reads through handles of its own.
class ThreadHandles {
 public:
  void reset(std::size_t layers);
  GDALRasterBand* band(const LayerInfo& layer, std::size_t index);  // the calling thread's

 private:
  std::vector<std::vector<std::unique_ptr<GDALDataset>>> handles_;  // [thread][layer]
};

class LayerAccess {
 public:
  LayerAccess(const LayerInfo& layer, std::size_t index, BlockCache& cache, ThreadHandles& handles);

  const LayerInfo& info() const { return layer_; }
  bool same_crs_as_wgs84() const { return same_as_wgs84_; }
  // A new transformation WGS 84 lon/lat → layer CRS (forward) or back, for the calling thread
  // only (crs_transform.hpp: never shared between threads).
  CrsTransformation transformation(bool forward) const;
  // Transforms lon/lat to layer coordinates in parallel; NaN where it fails.
  void to_layer(std::vector<double>& x, std::vector<double>& y) const;
  // Pixel position of layer coordinates (cell centres at .5), with a ±360° retry on geographic
  // layers (0…360° rasters, points across the antimeridian). `shift` receives the retry used.
  // Computed through the inverse geotransform exactly as gdallocationinfo does, so that a point
  // on a cell edge (coordinates rounded to a multiple of the cell size) falls in the same cell.
  bool pixel(double x, double y, double& px, double& py, double* shift = nullptr) const;

  BlockCache::BlockPtr block(int bx, int by);
  double raw(int col, int row);  // through the cache
  bool missing(double raw) const { return std::isnan(raw) || (layer_.nodata && raw == *layer_.nodata); }
  // Scale/offset applied; a scaled integer layer rounded to its scale's decimals.
  double value(double raw, bool round = true) const;

 private:
  const LayerInfo& layer_;
  std::uint32_t index_;
  BlockCache& cache_;
  ThreadHandles& handles_;
  bool same_as_wgs84_ = false;
  std::array<double, 6> inverse_{};  // the inverse geotransform, as GDAL's tools compute it
};

}  // namespace envsift::detail

namespace envsift {
struct RasterStack::Impl {
  detail::ThreadHandles handles;
};
}  // namespace envsift
