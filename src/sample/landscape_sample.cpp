#include "envsift/sample/landscape_sample.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include <ogr_spatialref.h>

#include "envsift/geo/crs_transform.hpp"
#include "envsift/errors.hpp"
#include "envsift/median.hpp"
#include "envsift/geo/great_circle.hpp"
#include "envsift/seeded_random.hpp"
#include "envsift/stable_hash.hpp"

namespace envsift {
namespace {

double wrap_longitude(double lon) { return lon - 360 * std::floor((lon + 180) / 360); }

// A first-layer cell's size in metres (north-south): degrees on a geographic grid, else the
// CRS's linear unit.
double cell_size_m(const LayerInfo& layer) {
  const double size = std::fabs(layer.geotransform[5]);
  return layer.geographic ? size * M_PI / 180 * kEarthRadiusM : size;
}

// The shorter side of a layer's extent, metres (a geographic grid's east-west side at its
// middle latitude).
double short_side_m(const LayerInfo& layer) {
  const double w = layer.width * std::fabs(layer.geotransform[1]), h = layer.height * std::fabs(layer.geotransform[5]);
  if (!layer.geographic) return std::min(w, h);
  const double middle = layer.geotransform[3] + layer.geotransform[5] * layer.height / 2;
  const double metres_per_degree = M_PI / 180 * kEarthRadiusM;
  return std::min(w * metres_per_degree * std::cos(middle * M_PI / 180), h * metres_per_degree);
}

bool complete_row(const Eigen::MatrixXd& m, Eigen::Index r) { return m.row(r).array().isFinite().all(); }

std::string kilometres(double m) {
  char buf[64];
  std::snprintf(buf, sizeof buf, m < 10000 ? "%.1f km" : "%.0f km", m / 1000);
  return buf;
}

}  // namespace

LandscapeSampler::LandscapeSampler(RasterStack& stack, std::vector<LayerInfo> table_layers, std::vector<std::size_t> judged,
                                   Interpolation method, LandscapeOptions options)
    : stack_(stack), layers_(std::move(table_layers)), judged_(std::move(judged)), method_(method), options_(std::move(options)) {
  // the smallest radius is bounded by what the layers cover: on a reserve-scale study area (a
  // few km at 30 m) a 20 km buffer would fall mostly off the layers
  const LayerInfo& first = stack_.layers().at(0);
  min_radius_m_ = std::max(std::min(options_.min_radius_km * 1000, short_side_m(first) / 2), 10 * cell_size_m(first));
}

double LandscapeSampler::buffer_radius_m(const TaxonPlaces& t) const {
  if (t.longitude.empty()) return min_radius_m_;
  const double lon0 = median_of(t.longitude), lat0 = median_of(t.latitude);
  std::vector<double> distance;
  for (std::size_t i = 0; i < t.longitude.size(); ++i) distance.push_back(great_circle_m(lon0, lat0, t.longitude[i], t.latitude[i]));
  return std::max(min_radius_m_, options_.spread_factor * median_of(distance));
}

// The record table's columns for the judged layers: a stack layer's value, or a derived
// circular component computed from it as the records' are (circular_layers.cpp).
// Rows [first, first + rows) of the samples.
Eigen::MatrixXd LandscapeSampler::judged_values(const Samples& all, Eigen::Index first, Eigen::Index rows) const {
  const Eigen::MatrixXd s = all.values.block(first, rows);
  Eigen::MatrixXd out(rows, static_cast<Eigen::Index>(judged_.size()));
  for (std::size_t c = 0; c < judged_.size(); ++c) {
    const LayerInfo& layer = layers_[judged_[c]];
    if (layer.derived_from.empty()) {
      out.col(static_cast<Eigen::Index>(c)) = s.col(static_cast<Eigen::Index>(judged_[c]));
      continue;
    }
    Eigen::Index source = 0;
    while (layers_[static_cast<std::size_t>(source)].spec.name != layer.derived_from) ++source;
    const bool sine = layer.spec.name.size() >= 4 && layer.spec.name.compare(layer.spec.name.size() - 4, 4, "_sin") == 0;
    const Eigen::ArrayXd radians = s.col(source).array() * M_PI / 180;
    if (sine) out.col(static_cast<Eigen::Index>(c)) = radians.sin().matrix();
    else out.col(static_cast<Eigen::Index>(c)) = radians.cos().matrix();
  }
  return out;
}

void LandscapeSampler::draw_extent() {
  const LayerInfo& first = stack_.layers().at(0);
  const CrsTransformation to_wgs84 = new_transformation(first.crs_wkt, wgs84_wkt());
  if (!to_wgs84) throw InputError(first.spec.path, "cannot transform its CRS to WGS 84", "use --landscape-area buffer");
  SeededRandom random(stable_hash("landscape extent", options_.seed ^ kFnvBasis));
  const auto& g = first.geotransform;
  auto shared = std::make_shared<LandscapeValues>();
  shared->values.resize(static_cast<Eigen::Index>(options_.cells), static_cast<Eigen::Index>(judged_.size()));
  std::size_t kept = 0;
  for (int round = 0; round < kDrawRounds && kept < options_.cells; ++round) {  // only cells with every value
    std::vector<double> lon, lat;
    for (std::size_t tries = 0; kept + lon.size() < options_.cells && tries < 100 * options_.cells; ++tries) {
      const double col = random.uniform() * first.width, row = random.uniform() * first.height;
      double x = g[0] + col * g[1] + row * g[2], y = g[3] + col * g[4] + row * g[5];
      const double accept = random.uniform();
      int ok = 0;
      to_wgs84->Transform(1, &x, &y, nullptr, &ok);
      if (!ok) continue;
      if (first.geographic && accept > std::cos(y * M_PI / 180)) continue;  // equal area on the sphere
      lon.push_back(x), lat.push_back(y);
    }
    if (lon.empty()) break;
    const Samples all = stack_.sample(lon, lat, method_);
    const Eigen::MatrixXd values = judged_values(all, 0, all.values.rows());
    for (Eigen::Index k = 0; k < values.rows(); ++k)
      if (complete_row(values, k)) shared->values.row(static_cast<Eigen::Index>(kept++)) = values.row(k);
  }
  shared->values.conservativeResize(static_cast<Eigen::Index>(kept), Eigen::NoChange);
  shared->area = "in the layers' extent";
  extent_ = std::move(shared);
}

std::vector<LandscapeValues> LandscapeSampler::sample(const std::vector<TaxonPlaces>& taxa) {
  if (options_.area == LandscapeArea::extent) {
    if (!extent_) draw_extent();
    return std::vector<LandscapeValues>(taxa.size(), *extent_);
  }
  std::vector<std::string> area(taxa.size());
  std::vector<double> radius(taxa.size());
  std::vector<SeededRandom> random;
  for (std::size_t t = 0; t < taxa.size(); ++t) {
    radius[t] = buffer_radius_m(taxa[t]);
    area[t] = "within " + kilometres(radius[t]) + " of its records";
    random.emplace_back(stable_hash(taxa[t].taxon, options_.seed ^ 0x1a2d5ca9e5ull));
  }
  // Cells are kept only where every judged layer has a value (sea, nodata and the layers' edges
  // are not environments the taxon could have chosen); the missing ones are drawn again, for a
  // few rounds, each taxon from its own seeded sequence.
  std::vector<LandscapeValues> out(taxa.size());
  std::vector<std::size_t> kept(taxa.size(), 0);
  for (auto& o : out) o.values.resize(static_cast<Eigen::Index>(options_.cells), static_cast<Eigen::Index>(judged_.size()));
  for (int round = 0; round < kDrawRounds; ++round) {
    std::vector<double> lon, lat;
    std::vector<std::size_t> owner;
    for (std::size_t t = 0; t < taxa.size(); ++t) {
      const TaxonPlaces& places = taxa[t];
      if (places.longitude.empty()) continue;
      for (std::size_t k = kept[t]; k < options_.cells; ++k) {
        const std::size_t at = random[t].below(places.longitude.size());
        const double azimuth = 360 * random[t].uniform(), distance = radius[t] * std::sqrt(random[t].uniform());
        const auto [x, y] = destination(places.longitude[at], places.latitude[at], azimuth, distance);
        lon.push_back(wrap_longitude(x)), lat.push_back(y), owner.push_back(t);
      }
    }
    if (lon.empty()) break;
    // each draw visits the layers in the order opposite to the sample before it (the records',
    // then the previous batch's), so it begins on the blocks that one left in the cache
    last_layer_first_ = !last_layer_first_;
    const Samples all = stack_.sample(lon, lat, method_, last_layer_first_);
    const Eigen::MatrixXd values = judged_values(all, 0, static_cast<Eigen::Index>(lon.size()));
    for (std::size_t k = 0; k < owner.size(); ++k)
      if (complete_row(values, static_cast<Eigen::Index>(k)))
        out[owner[k]].values.row(static_cast<Eigen::Index>(kept[owner[k]]++)) = values.row(static_cast<Eigen::Index>(k));
  }
  for (std::size_t t = 0; t < taxa.size(); ++t) {
    out[t].values.conservativeResize(static_cast<Eigen::Index>(kept[t]), Eigen::NoChange);
    out[t].area = std::move(area[t]);
  }
  return out;
}

std::size_t LandscapeSampler::bytes_per_taxon() const {
  // while a batch is drawn: the points, the samples (value and status per layer), the taxa's copies
  return options_.cells * (3 * sizeof(double) + stack_.layers().size() * (sizeof(double) + sizeof(CellStatus)) +
                           judged_.size() * sizeof(double));
}

std::uint64_t locality_key(const TaxonPlaces& t) {
  if (t.longitude.empty()) return ~std::uint64_t{0};
  // the median place on a 2^16 × 2^16 grid of the globe, interleaved (a Z-order curve)
  auto step = [](double v, double lo, double span) {
    return static_cast<std::uint64_t>(std::clamp((v - lo) / span, 0.0, 1.0) * 65535);
  };
  const std::uint64_t x = step(median_of(t.longitude), -180, 360), y = step(median_of(t.latitude), -90, 180);
  std::uint64_t key = 0;
  for (int b = 0; b < 16; ++b) key |= ((x >> b) & 1) << (2 * b) | ((y >> b) & 1) << (2 * b + 1);
  return key;
}

}  // namespace envsift
