#include "envsift/table/sample_records.hpp"

#include <cmath>
#include <cstdio>

#include "envsift/reason_codes.hpp"
#include "envsift/stopwatch.hpp"

namespace envsift {
namespace {

std::string metres(double m) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.0f m", m);
  return buf;
}

// Reason codes from reading and from each layer's cell.
void collect_codes(RecordTable& t, const Samples& samples) {
  t.codes.resize(t.size());
  for (std::size_t i = 0; i < t.size(); ++i) {
    std::vector<std::string> codes = t.points.problems(i);
    for (std::size_t l = 0; l < t.layers.size(); ++l) {
      const CellStatus c = samples.status_at(i, l);
      if (c == CellStatus::outside) codes.push_back(reason::on_layer(reason::outside_layer, t.layers[l].spec.name));
      if (c == CellStatus::nodata) codes.push_back(reason::on_layer(reason::nodata, t.layers[l].spec.name));
    }
    if (!codes.empty()) t.codes.set(i, codes);
  }
}

// A layer that no record falls on is almost always a CRS or extent mistake: say so.
void warn_of_empty_layers(RecordTable& t, const Samples& samples, const std::vector<double>& lon,
                          const std::vector<double>& lat) {
  std::size_t with_coordinates = 0;
  for (std::size_t i = 0; i < t.size(); ++i) with_coordinates += std::isfinite(lon[i]) && std::isfinite(lat[i]);
  for (std::size_t l = 0; l < t.layers.size() && with_coordinates > 0; ++l) {
    std::size_t inside = 0;
    for (std::size_t i = 0; i < t.size(); ++i)
      inside += samples.status_at(i, l) != CellStatus::outside && std::isfinite(lon[i]) && std::isfinite(lat[i]);
    if (inside == 0)
      t.warnings.push_back("layer " + t.layers[l].spec.name + " (" + t.layers[l].spec.path +
                           "): no record falls inside it; check its extent and CRS, and the records' coordinates");
  }
}

// A record that no layer has a value for, but would with latitude and longitude swapped:
// reported, never corrected.
void mark_possible_swaps(RecordTable& t, RasterStack& stack, const std::vector<double>& lon, const std::vector<double>& lat) {
  std::vector<std::size_t> lost;
  for (std::size_t i = 0; i < t.size(); ++i)
    if (std::isfinite(lon[i]) && std::isfinite(lat[i]) && !t.has_any_value(i) && std::fabs(lat[i]) <= 180 &&
        std::fabs(lon[i]) <= 90)
      lost.push_back(i);
  if (lost.empty()) return;
  std::vector<double> swapped_lon, swapped_lat;
  for (std::size_t i : lost) swapped_lon.push_back(lat[i]), swapped_lat.push_back(lon[i]);
  const Samples swapped = stack.sample(swapped_lon, swapped_lat, Interpolation::nearest);
  for (std::size_t k = 0; k < lost.size(); ++k)
    if (swapped.values.row(static_cast<Eigen::Index>(k)).array().isFinite().any())
      t.codes.add(lost[k], reason::position_maybe_swapped);
}

}  // namespace

RecordTable sample_records(PointTable points, const InputSettings& input, const SamplingSettings& sampling,
                           Progress* progress, const std::vector<std::string>& added_columns,
                           const std::function<bool(const PointTable&, std::size_t)>& keep) {
  RecordTable t;
  Stopwatch clock;
  const SamplingPlan plan = sampling_plan(sampling);
  const auto specs = expand_layer_arguments(input.layers);
  t.points = std::move(points);
  t.warnings = t.points.warnings;
  const std::size_t n = t.size();
  t.has_discs = sampling.discs && (t.points.uncertainty_column || sampling.default_radius_m > 0);
  std::vector<std::string> columns = t.points.columns;
  for (const auto& spec : specs) {
    columns.push_back(spec.name);
    if (t.has_discs)
      for (const char* suffix : {"_min", "_mean", "_max"}) columns.push_back(spec.name + suffix);
  }
  columns.insert(columns.end(), added_columns.begin(), added_columns.end());
  check_unique_columns(columns);

  t.stack = std::make_shared<RasterStack>(specs, plan.cache_bytes, input.assume_crs);
  RasterStack& stack = *t.stack;
  std::vector<double> lon(n), lat(n);
  for (std::size_t i = 0; i < n; ++i) {
    const bool kept = !keep || keep(t.points, i);
    lon[i] = kept ? t.points.records[i].longitude : std::nan("");
    lat[i] = kept ? t.points.records[i].latitude : std::nan("");
  }
  stack.set_chunk_records(plan.chunk_records);
  stack.set_progress(progress);
  Samples samples = stack.sample(lon, lat, plan.method);
  clock.lap(t.seconds, "sample");
  t.values = std::move(samples.values);
  t.cells = std::move(samples.cell);
  t.layers = stack.layers();
  // values are printed as 32-bit floats only where they are a cell's own value
  if (plan.method != Interpolation::nearest)
    for (auto& l : t.layers) l.float32_values = false;
  collect_codes(t, samples);
  warn_of_empty_layers(t, samples, lon, lat);
  mark_possible_swaps(t, stack, lon, lat);
  if (t.has_discs) {
    t.radius_m.assign(n, 0.0);
    for (std::size_t i = 0; i < n; ++i) {
      const auto& u = t.points.records[i].uncertainty_m;
      double r = u ? *u : sampling.default_radius_m;
      if (r > sampling.max_radius_m) {
        t.codes.add(i, reason::uncertainty_capped);
        t.notes[i].push_back("uncertainty " + metres(r) + " cut to " + metres(sampling.max_radius_m));
        r = sampling.max_radius_m;
      }
      t.radius_m[i] = r;
    }
    t.discs = stack.sample_discs(lon, lat, t.radius_m);
    clock.lap(t.seconds, "uncertainty discs");
  }
  stack.set_progress(nullptr);  // the landscape sample reports as part of screening
  return t;
}

}  // namespace envsift
