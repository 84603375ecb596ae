// Step 2 of the pipeline: sample a stack of rasters at every point. Each layer is handled on its
// own terms (CRS, resolution, extent, data type, nodata, scale/offset): points are transformed
// into the layer's CRS, cells are found by inverting the geotransform (pixel-is-area), whole
// blocks are read through a shared block cache, and points are visited in block order.
#pragma once
#include <array>
#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include <Eigen/Core>

#include "envsift/progress.hpp"
#include "envsift/sample/block_cache.hpp"
#include "envsift/sample/sampling_settings.hpp"
#include "envsift/value_table.hpp"

namespace envsift {

// One layer = one band of one raster file.
struct LayerSpec {
  std::string name;
  std::string path;
  int band = 1;
};

// Turns command-line layer arguments into layer specs. An argument is a path, or NAME=PATH to
// choose the column name. A layer is named after its file without the extension; every band of a
// multi-band file becomes a layer NAME_b1, NAME_b2, ... Throws on duplicate names.
std::vector<LayerSpec> expand_layer_arguments(const std::vector<std::string>& arguments);

struct LayerInfo {
  LayerSpec spec;
  int width = 0, height = 0;
  std::array<double, 6> geotransform{};
  std::string crs_wkt;
  bool geographic = false;
  std::optional<double> nodata;
  double scale = 1, offset = 0;
  std::string data_type;      // GDAL's name, e.g. "Float32"
  std::string unit;           // as the raster declares it (GDAL unit type); may be empty
  int block_width = 0, block_height = 0;
  bool float32_values = false;  // unscaled Float32: values are printed as 32-bit floats
  bool float_cells = false;     // unscaled Byte, UInt16, Int16 or Float32: a float holds every cell
  int decimals = -1;  // integer cells with scale/offset: values are rounded to this many decimals
  bool judged = true;         // false for a circular layer: the tests see its sine and cosine instead
  std::string derived_from;   // a derived component (LAYER_sin, LAYER_cos): the layer it comes from
};

enum class CellStatus : std::uint8_t { ok, no_point, outside, nodata };

struct Samples {
  ValueTable values;                // records × layers, NaN where missing
  std::vector<CellStatus> status;   // records × layers, row-major
  std::vector<std::uint64_t> cell;  // per record: identifies the set of cells it fell in, across layers
  std::size_t layer_count = 0;
  CellStatus status_at(std::size_t record, std::size_t layer) const { return status[record * layer_count + layer]; }
};

// Values inside each record's uncertainty disc: every cell whose centre lies within the radius
// (great-circle distance on the sphere of radius 6 371 008.8 m), plus the cell containing the
// point itself, so a disc smaller than a cell still holds the point's value. NaN where a record
// has no disc or no valid cell in it.
struct DiscSamples {
  Eigen::MatrixXd min, mean, max;  // records × layers
};

class RasterStack {
 public:
  // Opens and checks every layer. Throws InputError for a file that is not a readable raster,
  // has no georeferencing, has a rotated geotransform, or has no CRS (unless `assume_crs`, e.g.
  // "EPSG:4326", is given for such layers).
  explicit RasterStack(std::vector<LayerSpec> specs, std::size_t cache_bytes = std::size_t(256) << 20,
                       const std::string& assume_crs = "");
  ~RasterStack();
  RasterStack(const RasterStack&) = delete;
  RasterStack& operator=(const RasterStack&) = delete;

  const std::vector<LayerInfo>& layers() const { return layers_; }

  // Samples every layer at WGS 84 longitude/latitude points (NaN = no point). Parallel with
  // OpenMP; the result does not depend on the thread count.
  // Bilinear uses the four cell centres around the point; where one of them is outside the
  // raster or nodata, the value falls back to the containing cell (nearest).
  // `last_layer_first`: visit the layers from the last, so that a sample right after another one
  // starts on the blocks still in the cache (the values do not change; `cell` is left 0, as a
  // cell key is built in layer order).
  Samples sample(const std::vector<double>& longitude, const std::vector<double>& latitude,
                 Interpolation method, bool last_layer_first = false);

  // `radius_m[i]` ≤ 0 or NaN: no disc for record i. Parallel, thread-count independent.
  DiscSamples sample_discs(const std::vector<double>& longitude, const std::vector<double>& latitude,
                           const std::vector<double>& radius_m);

  const BlockCache& cache() const { return cache_; }
  // Sample at most this many records at a time (bounds memory; results do not change).
  void set_chunk_records(std::size_t records) { chunk_records_ = records ? records : 1; }
  void set_progress(Progress* progress) { progress_ = progress; }

 private:
  Progress* progress_ = nullptr;
  std::size_t chunk_records_ = static_cast<std::size_t>(-1);
  struct Impl;
  std::vector<LayerInfo> layers_;
  BlockCache cache_;
  std::unique_ptr<Impl> impl_;
};

}  // namespace envsift
