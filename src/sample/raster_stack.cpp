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
#include "gdal_init.hpp"

namespace envsift {
namespace {

std::string file_stem(const std::string& path) {
  auto slash = path.find_last_of("/\\");
  std::string base = slash == std::string::npos ? path : path.substr(slash + 1);
  auto dot = base.find_last_of('.');
  return dot == std::string::npos || dot == 0 ? base : base.substr(0, dot);
}

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

OGRSpatialReference wgs84_lon_lat() {
  OGRSpatialReference srs;
  srs.SetWellKnownGeogCS("WGS84");
  srs.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  return srs;
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

LayerInfo describe_layer(const LayerSpec& spec) {
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
  if (!srs || srs->IsEmpty())
    throw InputError(spec.path, "has no coordinate reference system",
                     "assign one, e.g. gdal_edit.py -a_srs EPSG:4326 FILE");
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
  band->GetBlockSize(&info.block_width, &info.block_height);
  const GDALDataType type = band->GetRasterDataType();
  info.float32_values = type == GDT_Float32 && info.scale == 1 && info.offset == 0;
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

double round_to(double v, int decimals) {
  const double p = std::pow(10.0, decimals);
  return std::round(v * p) / p;
}

std::uint64_t mix(std::uint64_t h, std::uint64_t v) {
  h ^= v + 0x9E3779B97F4A7C15ull + (h << 6) + (h >> 2);
  return h;
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
    if (!seen.insert(s.name).second)
      throw UsageError("two layers are named '" + s.name + "'; name one explicitly with NAME=PATH, e.g. " +
                       s.name + "2=" + s.path);
  return specs;
}

struct RasterStack::Impl {
  // GDAL datasets are not thread-safe: every thread reads through handles of its own.
  std::vector<std::vector<std::unique_ptr<GDALDataset>>> handles;  // [thread][layer]

  GDALRasterBand* band(const LayerInfo& layer, std::size_t index) {
    auto& mine = handles[static_cast<std::size_t>(omp_get_thread_num())];
    if (!mine[index]) mine[index] = open_raster(layer.spec.path);
    return mine[index]->GetRasterBand(layer.spec.band);
  }
};

RasterStack::RasterStack(std::vector<LayerSpec> specs, std::size_t cache_bytes)
    : cache_(cache_bytes), impl_(std::make_unique<Impl>()) {
  for (const auto& s : specs) layers_.push_back(describe_layer(s));
}

RasterStack::~RasterStack() = default;

Samples RasterStack::sample(const std::vector<double>& longitude, const std::vector<double>& latitude,
                            Interpolation method) {
  const std::size_t n = longitude.size(), L = layers_.size();
  Samples out;
  out.layer_count = L;
  out.values = Eigen::MatrixXd::Constant(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(L),
                                         std::numeric_limits<double>::quiet_NaN());
  out.status.assign(n * L, CellStatus::no_point);
  out.cell.assign(n, 0);
  std::vector<std::uint64_t> cell_index(n * L, 0);  // 1 + row * width + col; 0 = none
  const int threads = omp_get_max_threads();
  impl_->handles.resize(static_cast<std::size_t>(threads));
  for (auto& h : impl_->handles) h.resize(L);

  for (std::size_t l = 0; l < L; ++l) {
    const LayerInfo& layer = layers_[l];
    const auto& gt = layer.geotransform;

    // 1. Into the layer's CRS (one transformation per thread: they are not thread-safe).
    std::vector<double> x(longitude), y(latitude);
    OGRSpatialReference target;
    target.importFromWkt(layer.crs_wkt.c_str());
    target.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
    const OGRSpatialReference source = wgs84_lon_lat();
    if (!target.IsSame(&source)) {
      const std::ptrdiff_t chunk = 4096;
#pragma omp parallel
      {
        std::unique_ptr<OGRCoordinateTransformation> ct(OGRCreateCoordinateTransformation(&source, &target));
#pragma omp for schedule(static)
        for (std::ptrdiff_t start = 0; start < static_cast<std::ptrdiff_t>(n); start += chunk) {
          const std::size_t count = std::min<std::size_t>(chunk, n - start);
          std::vector<int> ok(count);
          if (ct) ct->Transform(count, &x[start], &y[start], nullptr, ok.data());
          for (std::size_t k = 0; k < count; ++k)
            if (!ct || !ok[k]) x[start + k] = y[start + k] = std::numeric_limits<double>::quiet_NaN();
        }
      }
    }

    // 2. Cell of each point; points ordered by block so every block is visited once.
    std::vector<Location> located;
    located.reserve(n);
    const std::uint64_t blocks_across = (layer.width + layer.block_width - 1) / layer.block_width;
    for (std::size_t i = 0; i < n; ++i) {
      if (!std::isfinite(longitude[i]) || !std::isfinite(latitude[i])) continue;
      double px = (x[i] - gt[0]) / gt[1], py = (y[i] - gt[3]) / gt[5];
      if (layer.geographic && std::isfinite(px) && (px < 0 || px >= layer.width)) {
        // a 0..360° raster, or a point across the antimeridian
        for (double shift : {360.0, -360.0}) {
          double alt = (x[i] + shift - gt[0]) / gt[1];
          if (alt >= 0 && alt < layer.width) { px = alt; break; }
        }
      }
      if (!(px >= 0 && px < layer.width && py >= 0 && py < layer.height)) {
        out.status[i * L + l] = CellStatus::outside;
        continue;
      }
      const int col = static_cast<int>(std::floor(px)), row = static_cast<int>(std::floor(py));
      const std::uint64_t block = static_cast<std::uint64_t>(row / layer.block_height) * blocks_across +
                                  static_cast<std::uint64_t>(col / layer.block_width);
      located.push_back({static_cast<std::uint32_t>(i), col, row, px, py, block});
      cell_index[i * L + l] = 1 + static_cast<std::uint64_t>(row) * layer.width + col;
    }
    std::stable_sort(located.begin(), located.end(),
                     [](const Location& a, const Location& b) { return a.block < b.block; });
    std::vector<std::size_t> group_start;
    for (std::size_t k = 0; k < located.size(); ++k)
      if (k == 0 || located[k].block != located[k - 1].block) group_start.push_back(k);
    group_start.push_back(located.size());

    // 3. Read blocks in parallel and look the points up.
    auto fetch = [&](int col, int row) {
      const int bx = col / layer.block_width, by = row / layer.block_height;
      return cache_.get({static_cast<std::uint32_t>(l), static_cast<std::uint32_t>(bx), static_cast<std::uint32_t>(by)},
                        [&]() {
                          GDALRasterBand* band = impl_->band(layer, l);
                          Block b;
                          b.width = layer.block_width;
                          b.height = layer.block_height;
                          const GDALDataType type = band->GetRasterDataType();
                          const std::size_t cells = static_cast<std::size_t>(b.width) * b.height;
                          std::vector<unsigned char> raw(cells * GDALGetDataTypeSizeBytes(type));
                          if (band->ReadBlock(bx, by, raw.data()) != CE_None)
                            throw InputError(layer.spec.path,
                                             "cannot read block " + std::to_string(bx) + "," + std::to_string(by) +
                                                 " (" + CPLGetLastErrorMsg() + ")",
                                             "the file may be truncated or corrupt; copy or download it again");
                          b.values.resize(cells);
                          GDALCopyWords64(raw.data(), type, GDALGetDataTypeSizeBytes(type), b.values.data(),
                                          GDT_Float64, sizeof(double), static_cast<GPtrDiff_t>(cells));
                          return b;
                        });
    };
    // Cell value from `home` (the block being visited) when it holds the cell, else from the cache.
    auto raw_value = [&](int col, int row, const BlockCache::BlockPtr& home, int home_bx, int home_by) {
      const int bx = col / layer.block_width, by = row / layer.block_height;
      const int lc = col - bx * layer.block_width, lr = row - by * layer.block_height;
      return (bx == home_bx && by == home_by ? home : fetch(col, row))->at(lc, lr);
    };
    auto is_missing = [&](double raw) {
      return std::isnan(raw) || (layer.nodata && raw == *layer.nodata);
    };

    const std::ptrdiff_t groups = static_cast<std::ptrdiff_t>(group_start.size()) - 1;
    std::vector<std::exception_ptr> errors(static_cast<std::size_t>(std::max<std::ptrdiff_t>(groups, 0)));
#pragma omp parallel for schedule(dynamic, 1)
    for (std::ptrdiff_t g = 0; g < groups; ++g) {
      try {
        const Location& first = located[group_start[g]];
        const auto home = fetch(first.col, first.row);
        const int hbx = first.col / layer.block_width, hby = first.row / layer.block_height;
        for (std::size_t k = group_start[g]; k < group_start[g + 1]; ++k) {
          const Location& p = located[k];
          const double centre = raw_value(p.col, p.row, home, hbx, hby);
          double value = centre;
          CellStatus status = is_missing(centre) ? CellStatus::nodata : CellStatus::ok;
          if (status == CellStatus::ok && method == Interpolation::bilinear) {
            const double fx = p.px - 0.5, fy = p.py - 0.5;
            const int c0 = static_cast<int>(std::floor(fx)), r0 = static_cast<int>(std::floor(fy));
            const double tx = fx - c0, ty = fy - r0;
            if (c0 >= 0 && r0 >= 0 && c0 + 1 < layer.width && r0 + 1 < layer.height) {
              const double v00 = raw_value(c0, r0, home, hbx, hby), v10 = raw_value(c0 + 1, r0, home, hbx, hby);
              const double v01 = raw_value(c0, r0 + 1, home, hbx, hby);
              const double v11 = raw_value(c0 + 1, r0 + 1, home, hbx, hby);
              if (!is_missing(v00) && !is_missing(v10) && !is_missing(v01) && !is_missing(v11))
                value = (1 - tx) * (1 - ty) * v00 + tx * (1 - ty) * v10 + (1 - tx) * ty * v01 + tx * ty * v11;
            }
          }
          out.status[p.record * L + l] = status;
          if (status == CellStatus::ok) {
            double v = value * layer.scale + layer.offset;
            if (layer.decimals >= 0 && method == Interpolation::nearest) v = round_to(v, layer.decimals);
            out.values(p.record, static_cast<Eigen::Index>(l)) = v;
          }
        }
      } catch (...) {
        errors[static_cast<std::size_t>(g)] = std::current_exception();
      }
    }
    for (auto& e : errors)
      if (e) std::rethrow_exception(e);  // the first failing block, whatever the thread count
  }

  for (std::size_t i = 0; i < n; ++i) {
    std::uint64_t h = 0;
    for (std::size_t l = 0; l < L; ++l) h = mix(h, cell_index[i * L + l]);
    out.cell[i] = h;
  }
  return out;
}

}  // namespace envsift
