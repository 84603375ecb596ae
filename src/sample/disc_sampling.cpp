// Uncertainty discs: min / mean / max of every cell whose centre lies within a record's
// coordinate uncertainty (great-circle distance), per layer.
#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>
#include <map>
#include <numeric>

#include "envsift/geo/great_circle.hpp"
#include "envsift/sample/raster_stack.hpp"
#include "layer_access.hpp"

namespace envsift {
namespace {

constexpr double kDegree = 3.14159265358979323846 / 180.0;

struct CellRange {
  int col0, row0, col1, row1;  // inclusive
  bool empty() const { return col1 < col0 || row1 < row0; }
};

// The pixel range covering a disc: its lon/lat bounding box (a cap across a pole covers all
// longitudes), traced along its edges into the layer's CRS, widened by a cell.
CellRange disc_cells(const detail::LayerAccess& layer, OGRCoordinateTransformation* forward, double lon, double lat,
                     double radius_m, double shift) {
  const double dlat = radius_m / kEarthRadiusM / kDegree;
  const double south = std::max(-90.0, lat - dlat), north = std::min(90.0, lat + dlat);
  const double widest = std::max(std::fabs(south), std::fabs(north));
  double west = -180, east = 180;
  if (north < 90 && south > -90) {
    const double dlon = std::asin(std::min(1.0, std::sin(radius_m / kEarthRadiusM) / std::cos(widest * kDegree))) / kDegree;
    if (dlon < 180) west = lon - dlon, east = lon + dlon;
  }
  std::vector<double> x, y;
  const int steps = 8;
  for (int k = 0; k <= steps; ++k) {
    const double fx = west + (east - west) * k / steps, fy = south + (north - south) * k / steps;
    for (auto [px, py] : {std::pair{fx, south}, std::pair{fx, north}, std::pair{west, fy}, std::pair{east, fy}}) {
      x.push_back(px + shift);
      y.push_back(py);
    }
  }
  std::vector<int> ok(x.size(), 1);
  if (forward) forward->Transform(x.size(), x.data(), y.data(), nullptr, ok.data());
  const auto& info = layer.info();
  const auto& gt = info.geotransform;
  double c0 = std::numeric_limits<double>::infinity(), c1 = -c0, r0 = c0, r1 = -c0;
  for (std::size_t k = 0; k < x.size(); ++k) {
    if (!ok[k] || !std::isfinite(x[k]) || !std::isfinite(y[k])) continue;
    const double px = (x[k] - gt[0]) / gt[1], py = (y[k] - gt[3]) / gt[5];
    c0 = std::min(c0, px), c1 = std::max(c1, px), r0 = std::min(r0, py), r1 = std::max(r1, py);
  }
  if (!(c0 <= c1)) return {0, 0, -1, -1};
  auto clip = [](double v, int hi) { return static_cast<int>(std::clamp(v, -1.0, static_cast<double>(hi))); };
  return {std::max(0, clip(std::floor(c0), info.width) - 1), std::max(0, clip(std::floor(r0), info.height) - 1),
          std::min(info.width - 1, clip(std::floor(c1), info.width) + 1),
          std::min(info.height - 1, clip(std::floor(r1), info.height) + 1)};
}

// The values of a layer over one disc: every cell whose centre lies within the radius, plus the
// cell holding the point (a disc smaller than a cell still holds the point's value).
struct DiscStats {
  double lo = std::numeric_limits<double>::infinity(), hi = -std::numeric_limits<double>::infinity(), sum = 0;
  std::size_t count = 0;
};

DiscStats disc_values(detail::LayerAccess& layer, OGRCoordinateTransformation* forward,
                      OGRCoordinateTransformation* inverse, double x, double y, double lon, double lat, double radius_m) {
  const LayerInfo& info = layer.info();
  const auto& gt = info.geotransform;
  double px, py, shift = 0;
  const bool inside = layer.pixel(x, y, px, py, &shift);
  const CellRange range = disc_cells(layer, forward, lon, lat, radius_m, shift);
  // Cell centres → lon/lat, then keep those within the radius.
  std::vector<int> cols, rows;
  std::vector<double> cx, cy;
  for (int r = range.row0; !range.empty() && r <= range.row1; ++r)
    for (int c = range.col0; c <= range.col1; ++c) {
      cols.push_back(c);
      rows.push_back(r);
      cx.push_back(gt[0] + (c + 0.5) * gt[1]);
      cy.push_back(gt[3] + (r + 0.5) * gt[5]);
    }
  std::vector<int> ok(cx.size(), 1);
  if (inverse && !cx.empty()) inverse->Transform(cx.size(), cx.data(), cy.data(), nullptr, ok.data());
  const int home_col = inside ? static_cast<int>(std::floor(px)) : -1, home_row = inside ? static_cast<int>(std::floor(py)) : -1;
  // Group kept cells by block so each block is fetched once per disc.
  std::map<std::pair<int, int>, std::vector<std::pair<int, int>>> by_block;
  bool home_kept = false;
  for (std::size_t c = 0; c < cx.size(); ++c) {
    const bool home = cols[c] == home_col && rows[c] == home_row;
    if (!home && !(ok[c] && great_circle_m(lon, lat, cx[c] - shift, cy[c]) <= radius_m)) continue;
    home_kept = home_kept || home;
    by_block[{cols[c] / info.block_width, rows[c] / info.block_height}].emplace_back(cols[c], rows[c]);
  }
  if (inside && !home_kept)
    by_block[{home_col / info.block_width, home_row / info.block_height}].emplace_back(home_col, home_row);
  DiscStats d;
  for (const auto& [b, cells] : by_block) {
    const auto block = layer.block(b.first, b.second);
    for (const auto& [c, r] : cells) {
      const double raw = block->at(c - b.first * info.block_width, r - b.second * info.block_height);
      if (layer.missing(raw)) continue;
      const double v = layer.value(raw);
      d.lo = std::min(d.lo, v), d.hi = std::max(d.hi, v), d.sum += v, ++d.count;
    }
  }
  return d;
}

}  // namespace

DiscSamples RasterStack::sample_discs(const std::vector<double>& longitude, const std::vector<double>& latitude,
                                      const std::vector<double>& radius_m) {
  const std::size_t n = longitude.size(), L = layers_.size();
  const double nan = std::numeric_limits<double>::quiet_NaN();
  DiscSamples out{Eigen::MatrixXd::Constant(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(L), nan),
                  Eigen::MatrixXd::Constant(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(L), nan),
                  Eigen::MatrixXd::Constant(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(L), nan)};
  impl_->handles.reset(L);
  std::vector<std::size_t> with_disc;
  for (std::size_t i = 0; i < n; ++i)
    if (std::isfinite(longitude[i]) && std::isfinite(latitude[i]) && radius_m[i] > 0) with_disc.push_back(i);

  if (progress_ && !with_disc.empty()) progress_->stage("uncertainty discs", with_disc.size() * L, "discs");
  for (std::size_t l = 0; l < L; ++l) {
    detail::LayerAccess layer(layers_[l], l, cache_, impl_->handles);
    const LayerInfo& info = layer.info();
    std::vector<double> x(longitude), y(latitude);
    layer.to_layer(x, y);
    // Visit records in the block order of their points, so that neighbouring discs share blocks
    // while they are cached.
    std::vector<std::pair<std::uint64_t, std::size_t>> order;
    for (std::size_t i : with_disc) {
      double px, py;
      const bool inside = layer.pixel(x[i], y[i], px, py);
      const std::uint64_t key = inside ? static_cast<std::uint64_t>(py / info.block_height) * 1000003u +
                                             static_cast<std::uint64_t>(px / info.block_width)
                                       : std::numeric_limits<std::uint64_t>::max();
      order.emplace_back(key, i);
    }
    std::stable_sort(order.begin(), order.end(), [](const auto& a, const auto& b) { return a.first < b.first; });

    std::vector<std::exception_ptr> errors(order.size());
#pragma omp parallel
    {
      auto forward = layer.same_crs_as_wgs84() ? nullptr : layer.transformation(true);
      auto inverse = layer.same_crs_as_wgs84() ? nullptr : layer.transformation(false);
#pragma omp for schedule(dynamic, 16)
      for (std::ptrdiff_t k = 0; k < static_cast<std::ptrdiff_t>(order.size()); ++k) {
        const std::size_t i = order[static_cast<std::size_t>(k)].second;
        try {
          const DiscStats d = disc_values(layer, forward.get(), inverse.get(), x[i], y[i], longitude[i], latitude[i], radius_m[i]);
          const double lo = d.lo, hi = d.hi, sum = d.sum;
          const std::size_t count = d.count;
          if (count) {
            const auto row = static_cast<Eigen::Index>(i), col = static_cast<Eigen::Index>(l);
            out.min(row, col) = lo;
            out.max(row, col) = hi;
            out.mean(row, col) = sum / static_cast<double>(count);
          }
          if (progress_) progress_->advance(1);
        } catch (...) {
          errors[static_cast<std::size_t>(k)] = std::current_exception();
        }
      }
    }
    for (auto& e : errors)
      if (e) std::rethrow_exception(e);
  }
  return out;
}

}  // namespace envsift
