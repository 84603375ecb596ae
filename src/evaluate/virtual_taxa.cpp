// Virtual taxa. Source of the approach: Hirzel, A.H., Helfer, V. & Metral, F. (2001) Assessing
// habitat-suitability models with a virtual species. Ecological Modelling 145:111-121 (reference
// from memory). The Gaussian response and its parameters are envsift's choices (header).
#include "envsift/evaluate/virtual_taxa.hpp"

#include <algorithm>
#include <cstdio>
#include <cmath>
#include <memory>
#include <unordered_set>

#include <ogr_spatialref.h>

#include "envsift/detect/skew_scale.hpp"
#include "envsift/geo/crs_transform.hpp"
#include "envsift/errors.hpp"
#include "envsift/seeded_random.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift {
namespace {

double response(const Response& r, const Eigen::VectorXd& x) {
  const Eigen::ArrayXd d = (x - r.optimum).array() / r.width.array();
  return std::exp(-0.5 * d.square().sum());
}

// `count` records drawn from the cells with probability ∝ the response.
void draw(const StudyArea& area, const Response& r, std::size_t count, SeededRandom& random, std::vector<std::size_t>& out) {
  const auto cells = static_cast<std::size_t>(area.values.rows());
  std::vector<double> cumulative(cells);
  double total = 0;
  for (std::size_t c = 0; c < cells; ++c) cumulative[c] = total += response(r, area.values.row(static_cast<Eigen::Index>(c)).transpose());
  for (std::size_t k = 0; k < count; ++k) {
    const double u = random.uniform() * total;
    const auto at = std::upper_bound(cumulative.begin(), cumulative.end(), u) - cumulative.begin();
    out.push_back(std::min(static_cast<std::size_t>(at), cells - 1));
  }
}

Response random_response(const StudyArea& area, std::size_t optimum_cell, double width_low, double width_high,
                         SeededRandom& random) {
  Response r;
  r.optimum = area.values.row(static_cast<Eigen::Index>(optimum_cell)).transpose();
  r.width.resize(area.values.cols());
  for (Eigen::Index l = 0; l < area.values.cols(); ++l)
    r.width[l] = std::max(random.uniform(width_low, width_high) * std::max(area.sd[l], 1e-12), area.resolution[l]);
  return r;
}

}  // namespace

double VirtualTaxon::suitability(const Eigen::VectorXd& x) const {
  if (!x.allFinite()) return std::nan("");
  double best = 0;
  for (const auto& r : responses) best = std::max(best, response(r, x));
  return best;
}

StudyArea study_area(const std::vector<std::string>& layers, std::size_t max_cells, std::uint64_t seed,
                     const std::string& assume_crs) {
  RasterStack stack(expand_layer_arguments(layers), std::size_t(256) << 20, assume_crs);
  const LayerInfo& first = stack.layers().at(0);
  const std::uint64_t total = static_cast<std::uint64_t>(first.width) * static_cast<std::uint64_t>(first.height);
  std::vector<std::uint64_t> picked;
  if (total <= max_cells) {
    for (std::uint64_t i = 0; i < total; ++i) picked.push_back(i);
  } else {  // Floyd's algorithm: max_cells distinct cells, each set equally likely
    SeededRandom random(seed ^ 0x5eed5a3e1ull);
    std::unordered_set<std::uint64_t> chosen;
    for (std::uint64_t j = total - max_cells; j < total; ++j) {
      const std::uint64_t t = random.below(j + 1);
      chosen.insert(chosen.count(t) ? j : t);
    }
    picked.assign(chosen.begin(), chosen.end());
    std::sort(picked.begin(), picked.end());
  }
  const CrsTransformation to_wgs84 = new_transformation(first.crs_wkt, wgs84_wkt());
  if (!to_wgs84) throw InputError(first.spec.path, "cannot transform its CRS to WGS 84", "give a layer with a usual CRS first");
  std::vector<double> x(picked.size()), y(picked.size());
  const auto& g = first.geotransform;
  for (std::size_t i = 0; i < picked.size(); ++i) {
    const double col = static_cast<double>(picked[i] % static_cast<std::uint64_t>(first.width)) + 0.5;
    const double row = static_cast<double>(picked[i] / static_cast<std::uint64_t>(first.width)) + 0.5;
    x[i] = g[0] + col * g[1] + row * g[2];
    y[i] = g[3] + col * g[4] + row * g[5];
  }
  std::vector<int> ok(picked.size(), 0);
  if (!picked.empty()) to_wgs84->Transform(static_cast<int>(picked.size()), x.data(), y.data(), nullptr, ok.data());
  for (std::size_t i = 0; i < picked.size(); ++i)
    if (!ok[i]) x[i] = y[i] = std::nan("");
  const Samples s = stack.sample(x, y, Interpolation::nearest);
  StudyArea area;
  for (const auto& l : stack.layers()) area.layer_names.push_back(l.spec.name);
  std::vector<Eigen::Index> keep;
  for (Eigen::Index i = 0; i < s.values.rows(); ++i)
    if (s.values.row(i).allFinite()) keep.push_back(i);
  if (keep.size() < 100)
    throw InputError(first.spec.path, "fewer than 100 of its cells have a value on every layer",
                     "give layers that overlap over a study area");
  area.values.resize(static_cast<Eigen::Index>(keep.size()), s.values.cols());
  for (std::size_t k = 0; k < keep.size(); ++k) {
    area.values.row(static_cast<Eigen::Index>(k)) = s.values.row(keep[k]);
    area.longitude.push_back(x[static_cast<std::size_t>(keep[k])]);
    area.latitude.push_back(y[static_cast<std::size_t>(keep[k])]);
  }
  const Eigen::RowVectorXd mean = area.values.colwise().mean();
  area.sd = ((area.values.rowwise() - mean).array().square().colwise().sum() / static_cast<double>(keep.size() - 1))
                .sqrt()
                .transpose();
  area.resolution.resize(area.values.cols());
  for (Eigen::Index l = 0; l < area.values.cols(); ++l)
    area.resolution[l] = resolution(std::vector<double>(area.values.col(l).data(), area.values.col(l).data() + area.values.rows()));
  return area;
}

std::vector<VirtualTaxon> make_virtual_taxa(const StudyArea& area, const VirtualTaxaOptions& o) {
  std::vector<VirtualTaxon> taxa;
  const auto cells = static_cast<std::uint64_t>(area.values.rows());
  for (std::size_t t = 0; t < o.taxa; ++t) {
    SeededRandom random(o.seed * 0x9e3779b97f4a7c15ull + t + 1);
    char name[32];
    std::snprintf(name, sizeof name, "Virtualis %03zu", t + 1);
    const double log_size = random.uniform(std::log(static_cast<double>(o.min_records)), std::log(static_cast<double>(o.max_records)));
    const auto size = static_cast<std::size_t>(std::lround(std::exp(log_size)));
    if (random.uniform() < o.two_population_share) {
      taxa.push_back(two_population_taxon(area, size, random.uniform(0.3, 0.5), 0, random.uniform(o.width_low, o.width_high),
                                          random.next(), name));
      continue;
    }
    VirtualTaxon v;
    v.name = name;
    v.responses.push_back(random_response(area, random.below(cells), o.width_low, o.width_high, random));
    draw(area, v.responses[0], size, random, v.cells);
    v.population.assign(v.cells.size(), 0);
    taxa.push_back(std::move(v));
  }
  return taxa;
}

VirtualTaxon two_population_taxon(const StudyArea& area, std::size_t records, double second_share, double separation,
                                  double width, std::uint64_t seed, const std::string& name) {
  SeededRandom random(seed);
  const auto cells = static_cast<std::uint64_t>(area.values.rows());
  VirtualTaxon v;
  v.name = name;
  const std::size_t a = random.below(cells);
  std::size_t b = a;
  double best = -1;
  for (int attempt = 0; attempt < 2000 && best < separation; ++attempt) {
    const std::size_t c = random.below(cells);
    const double apart = ((area.values.row(static_cast<Eigen::Index>(c)) - area.values.row(static_cast<Eigen::Index>(a))).array() /
                          area.sd.transpose().array()).abs().maxCoeff();
    if (apart > best) best = apart, b = c;
  }
  v.responses.push_back(random_response(area, a, width, width, random));
  v.responses.push_back(random_response(area, b, width, width, random));
  const auto second = static_cast<std::size_t>(std::lround(second_share * static_cast<double>(records)));
  draw(area, v.responses[0], records - second, random, v.cells);
  draw(area, v.responses[1], second, random, v.cells);
  v.population.assign(v.cells.size(), 0);
  std::fill(v.population.end() - static_cast<std::ptrdiff_t>(second), v.population.end(), 1);
  return v;
}

}  // namespace envsift
