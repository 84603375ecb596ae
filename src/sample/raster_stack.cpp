#include "envsift/sample/raster_stack.hpp"

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>
#include <map>
#include <set>

#include <gdal_priv.h>
#include <ogr_spatialref.h>
#include <omp.h>

#include "envsift/errors.hpp"
#include "envsift/spreadsheet_cells.hpp"
#include "gdal_init.hpp"
#include "layer_access.hpp"

namespace envsift {
namespace {

using detail::open_raster;

std::string file_stem(const std::string& path) {
  auto slash = path.find_last_of("/\\");
  std::string base = slash == std::string::npos ? path : path.substr(slash + 1);
  auto dot = base.find_last_of('.');
  return dot == std::string::npos || dot == 0 ? base : base.substr(0, dot);
}

// Decimals needed to write x exactly (up to 12): 0.1 → 1, 0.25 → 2, 2 → 0. A scaled integer
// layer (e.g. tenths of a degree stored as Int16) is rounded to that, so 112 × 0.1 reads 11.2,
// not 11.200000000000001.
int decimals_of(double x) {
  for (int d = 0; d < 12; ++d) {
    const double p = std::pow(10.0, d);
    if (std::fabs(std::round(x * p) - x * p) < 1e-9 * std::max(1.0, std::fabs(x * p))) return d;
  }
  return 12;
}

LayerInfo describe_layer(const LayerSpec& spec, const std::string& assume_crs) {
  auto ds = open_raster(spec.path);
  LayerInfo info;
  info.spec = spec;
  if (spec.band < 1 || spec.band > ds->GetRasterCount())
    throw InputError(spec.path, "has no band " + std::to_string(spec.band), "check the layer arguments");
  GDALRasterBand* band = ds->GetRasterBand(spec.band);
  info.width = ds->GetRasterXSize();
  info.height = ds->GetRasterYSize();
  if (ds->GetGeoTransform(info.geotransform.data()) != CE_None)
    throw InputError(spec.path, "has no georeferencing (no geotransform)",
                     "georeference the raster, e.g. with gdal_translate -a_ullr and -a_srs");
  if (info.geotransform[2] != 0 || info.geotransform[4] != 0)
    throw InputError(spec.path, "has a rotated geotransform, which envsift does not sample",
                     "warp it to a north-up grid first, e.g. gdalwarp in.tif out.tif");
  const OGRSpatialReference* srs = ds->GetSpatialRef();
  OGRSpatialReference assumed;
  if (!srs || srs->IsEmpty()) {
    if (assume_crs.empty())
      throw InputError(spec.path, "has no coordinate reference system",
                       "assign one (gdal_edit.py -a_srs EPSG:4326 FILE), or run with --assume-crs EPSG:4326");
    if (assumed.SetFromUserInput(assume_crs.c_str()) != OGRERR_NONE)
      throw UsageError("--assume-crs '" + assume_crs + "' is not a CRS GDAL knows; write e.g. EPSG:4326");
    srs = &assumed;
  }
  char* wkt = nullptr;
  srs->exportToWkt(&wkt, nullptr);
  info.crs_wkt = wkt ? wkt : "";
  CPLFree(wkt);
  info.geographic = srs->IsGeographic();
  int has_nodata = 0;
  double nodata = band->GetNoDataValue(&has_nodata);
  if (has_nodata) info.nodata = nodata;
  info.scale = band->GetScale();
  info.offset = band->GetOffset();
  info.data_type = GDALGetDataTypeName(band->GetRasterDataType());
  info.unit = band->GetUnitType();
  band->GetBlockSize(&info.block_width, &info.block_height);
  const GDALDataType type = band->GetRasterDataType();
  info.float32_values = type == GDT_Float32 && info.scale == 1 && info.offset == 0;
  info.float_cells = (type == GDT_Byte || type == GDT_UInt16 || type == GDT_Int16 || type == GDT_Float32) &&
                     info.scale == 1 && info.offset == 0;
  if (!GDALDataTypeIsFloating(type) && !GDALDataTypeIsComplex(type) && (info.scale != 1 || info.offset != 0))
    info.decimals = std::max(decimals_of(info.scale), decimals_of(info.offset));
  return info;
}

// Where one point falls in one layer.
struct Location {
  std::uint32_t record;
  int col, row;      // containing cell
  double px, py;     // position in pixel units (cell centres at .5)
  std::uint64_t block;
};

// Where a chunk of points falls on one grid: each point's cell, and the points inside the grid
// grouped by block (a counting sort by block: linear time, and stable, so input order within a
// block).
struct PointPlan {
  std::vector<Location> located;
  std::vector<std::size_t> group_start;  // located[group_start[g] .. group_start[g+1]) share a block
  std::vector<std::uint64_t> cell;       // per point: 1 + row * width + col, 0 when none
  std::vector<char> outside;             // per point: has coordinates, but off the grid
};

PointPlan plan_points(const detail::LayerAccess& layer, const std::vector<double>& longitude,
                      const std::vector<double>& latitude, std::size_t begin, std::size_t end) {
  const LayerInfo& info = layer.info();
  std::vector<double> x(longitude.begin() + static_cast<std::ptrdiff_t>(begin), longitude.begin() + static_cast<std::ptrdiff_t>(end));
  std::vector<double> y(latitude.begin() + static_cast<std::ptrdiff_t>(begin), latitude.begin() + static_cast<std::ptrdiff_t>(end));
  layer.to_layer(x, y);  // into the layer's CRS
  PointPlan plan;
  plan.cell.assign(end - begin, 0);
  plan.outside.assign(end - begin, 0);
  const std::uint64_t across = (static_cast<std::uint64_t>(info.width) + info.block_width - 1) / info.block_width;
  const std::uint64_t down = (static_cast<std::uint64_t>(info.height) + info.block_height - 1) / info.block_height;
  std::vector<Location> unsorted;
  unsorted.reserve(end - begin);
  std::vector<std::size_t> count(across * down + 1, 0);
  for (std::size_t i = begin; i < end; ++i) {
    if (!std::isfinite(longitude[i]) || !std::isfinite(latitude[i])) continue;  // no point
    double px, py;
    if (!layer.pixel(x[i - begin], y[i - begin], px, py)) {
      plan.outside[i - begin] = 1;
      continue;
    }
    const int col = static_cast<int>(std::floor(px)), row = static_cast<int>(std::floor(py));
    const std::uint64_t block = static_cast<std::uint64_t>(row / info.block_height) * across +
                                static_cast<std::uint64_t>(col / info.block_width);
    unsorted.push_back({static_cast<std::uint32_t>(i), col, row, px, py, block});
    plan.cell[i - begin] = 1 + static_cast<std::uint64_t>(row) * static_cast<std::uint64_t>(info.width) + static_cast<std::uint64_t>(col);
    ++count[block + 1];
  }
  for (std::size_t b = 1; b < count.size(); ++b) count[b] += count[b - 1];  // start of each block
  plan.located.resize(unsorted.size());
  for (const Location& p : unsorted) plan.located[count[p.block]++] = p;
  for (std::size_t k = 0; k < plan.located.size(); ++k)
    if (k == 0 || plan.located[k].block != plan.located[k - 1].block) plan.group_start.push_back(k);
  plan.group_start.push_back(plan.located.size());
  return plan;
}

bool same_grid(const LayerInfo& a, const LayerInfo& b) {
  return a.width == b.width && a.height == b.height && a.geotransform == b.geotransform &&
         a.block_width == b.block_width && a.block_height == b.block_height && a.crs_wkt == b.crs_wkt;
}

std::uint64_t mix(std::uint64_t h, std::uint64_t v) {
  h ^= v + 0x9E3779B97F4A7C15ull + (h << 6) + (h >> 2);
  return h;
}

// The points located[from, to) of one block of layer l: the block read once, each point's cell
// looked up there (bilinear neighbours across its edge come through the cache).
void sample_group(detail::LayerAccess& layer, const std::vector<Location>& located, std::size_t from, std::size_t to,
                  std::size_t l, Interpolation method, Samples& out) {
  const LayerInfo& info = layer.info();
  const Location& first = located[from];
  const int hbx = first.col / info.block_width, hby = first.row / info.block_height;
  const auto home = layer.block(hbx, hby);
  auto raw = [&](int col, int row) {
    const int bx = col / info.block_width, by = row / info.block_height;
    if (bx == hbx && by == hby) return home->at(col - bx * info.block_width, row - by * info.block_height);
    return layer.raw(col, row);
  };
  for (std::size_t k = from; k < to; ++k) {
    const Location& p = located[k];
    const double centre = raw(p.col, p.row);
    if (layer.missing(centre)) {
      out.status[p.record * out.layer_count + l] = CellStatus::nodata;
      continue;
    }
    double v = layer.value(centre, method == Interpolation::nearest);
    if (method == Interpolation::bilinear) {
      const double fx = p.px - 0.5, fy = p.py - 0.5;
      const int c0 = static_cast<int>(std::floor(fx)), r0 = static_cast<int>(std::floor(fy));
      const double tx = fx - c0, ty = fy - r0;
      if (c0 >= 0 && r0 >= 0 && c0 + 1 < info.width && r0 + 1 < info.height) {
        const double v00 = raw(c0, r0), v10 = raw(c0 + 1, r0), v01 = raw(c0, r0 + 1), v11 = raw(c0 + 1, r0 + 1);
        if (!layer.missing(v00) && !layer.missing(v10) && !layer.missing(v01) && !layer.missing(v11))
          v = layer.value((1 - tx) * (1 - ty) * v00 + tx * (1 - ty) * v10 + (1 - tx) * ty * v01 + tx * ty * v11,
                          false);
      }
    }
    out.status[p.record * out.layer_count + l] = CellStatus::ok;
    out.values.set(p.record, static_cast<Eigen::Index>(l), v);
  }
}

}  // namespace

std::vector<LayerSpec> expand_layer_arguments(const std::vector<std::string>& arguments) {
  std::vector<LayerSpec> specs;
  for (const auto& arg : arguments) {
    std::string name, path = arg;
    auto eq = arg.find('=');
    if (eq != std::string::npos && eq > 0 && arg.find_first_of("/\\") > eq) {
      name = arg.substr(0, eq);
      path = arg.substr(eq + 1);
    }
    if (name.empty()) name = file_stem(path);
    const int bands = open_raster(path)->GetRasterCount();
    if (bands == 0) throw InputError(path, "has no raster bands", "give a raster file with at least one band");
    for (int b = 1; b <= bands; ++b)
      specs.push_back({bands == 1 ? name : name + "_b" + std::to_string(b), path, b});
  }
  std::set<std::string> seen;
  for (const auto& s : specs)
    if (starts_like_formula(s.name))  // it heads a column and begins reasons: a spreadsheet would run it
      throw UsageError("the layer name '" + s.name + "' (" + s.path +
                       ") begins like a spreadsheet formula (= + - @); name the layer with NAME=PATH, e.g. layer1=" + s.path);
  for (const auto& s : specs)
    if (!seen.insert(s.name).second)
      throw UsageError("two layers are named '" + s.name + "'; name one explicitly with NAME=PATH, e.g. " +
                       s.name + "2=" + s.path);
  return specs;
}

RasterStack::RasterStack(std::vector<LayerSpec> specs, std::size_t cache_bytes, const std::string& assume_crs)
    : cache_(cache_bytes), impl_(std::make_unique<Impl>()) {
  for (const auto& s : specs) layers_.push_back(describe_layer(s, assume_crs));
}

RasterStack::~RasterStack() = default;

Samples RasterStack::sample(const std::vector<double>& longitude, const std::vector<double>& latitude,
                            Interpolation method, bool last_layer_first) {
  const std::size_t n = longitude.size(), L = layers_.size();
  Samples out;
  out.layer_count = L;
  std::vector<bool> as_float;  // a cell's own value, when a float holds it (value_table.hpp)
  for (const auto& layer : layers_) as_float.push_back(layer.float_cells && method == Interpolation::nearest);
  out.values = ValueTable(n, as_float);
  out.status.assign(n * L, CellStatus::no_point);
  out.cell.assign(n, 0);
  impl_->handles.reset(L);
  if (progress_) progress_->stage("sampling", n * L, "samples");

  // Records in chunks (all at once by default) so that the working set stays bounded; within a
  // chunk, layer by layer, points in block order.
  for (std::size_t begin = 0; begin < n; begin += chunk_records_) {
   const std::size_t end = std::min(n, begin + chunk_records_);
   PointPlan plan;
   const LayerInfo* plan_grid = nullptr;
   for (std::size_t visit = 0; visit < L; ++visit) {
    const std::size_t l = last_layer_first ? L - 1 - visit : visit;
    detail::LayerAccess layer(layers_[l], l, cache_, impl_->handles);
    const LayerInfo& info = layer.info();

    // 1-2. Where the chunk's points fall, in block order — computed once for all layers on the
    // same grid (climate stacks usually share one).
    if (!plan_grid || !same_grid(*plan_grid, info)) {
      plan = plan_points(layer, longitude, latitude, begin, end);
      plan_grid = &info;
    }
    for (std::size_t i = begin; i < end; ++i) {
      if (plan.outside[i - begin]) out.status[i * L + l] = CellStatus::outside;
      if (!last_layer_first) out.cell[i] = mix(out.cell[i], plan.cell[i - begin]);  // every layer's cell, in layer order
    }
    const std::vector<Location>& located = plan.located;
    const std::vector<std::size_t>& group_start = plan.group_start;

    // 3. Read blocks in parallel and look the points up. A cell of the block being visited is
    // read from it directly; bilinear neighbours across its edge come through the cache.
    const std::ptrdiff_t groups = static_cast<std::ptrdiff_t>(group_start.size()) - 1;
    std::vector<std::exception_ptr> errors(static_cast<std::size_t>(std::max<std::ptrdiff_t>(groups, 0)));
#pragma omp parallel for schedule(dynamic, 1)
    for (std::ptrdiff_t g = 0; g < groups; ++g) {
      try {
        sample_group(layer, located, group_start[static_cast<std::size_t>(g)], group_start[static_cast<std::size_t>(g) + 1], l,
                     method, out);
        if (progress_) progress_->advance(group_start[static_cast<std::size_t>(g) + 1] - group_start[static_cast<std::size_t>(g)]);
      } catch (...) {
        errors[static_cast<std::size_t>(g)] = std::current_exception();
      }
    }
    for (auto& e : errors)
      if (e) std::rethrow_exception(e);  // the first failing block, whatever the thread count
    if (progress_) progress_->advance(end - begin - located.size());  // records off this layer
   }
  }
  return out;
}

}  // namespace envsift
