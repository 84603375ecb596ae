#include "gather_values.hpp"

#include <algorithm>
#include <cmath>
#include <chrono>
#include <cstring>
#include <tuple>

#include "envsift/errors.hpp"
#include "envsift/read/coordinates.hpp"
#include "envsift/read/elevation_text.hpp"
#include "envsift/reason_codes.hpp"

namespace envsift::detail {
namespace {

void check_unique_columns(const std::vector<std::string>& columns) {
  for (std::size_t i = 0; i < columns.size(); ++i)
    for (std::size_t j = 0; j < i; ++j)
      if (columns[i] == columns[j])
        throw UsageError("the output would have two columns named '" + columns[i] +
                         "' (an input column, a layer or an envsift column); rename the input column, or "
                         "name the layer with NAME=PATH");
}

std::string metres(double m) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.0f m", m);
  return buf;
}

}  // namespace

void CodeLists::set(std::size_t record, const std::vector<std::string>& codes) {
  auto [it, added] = lookup_.emplace(codes, static_cast<std::uint32_t>(lists_.size()));
  if (added) lists_.push_back(codes);
  index_[record] = it->second;
}

void CodeLists::add(std::size_t record, const std::string& code) {
  const auto& now = of(record);
  if (std::find(now.begin(), now.end(), code) != now.end()) return;
  std::vector<std::string> codes = now;
  codes.push_back(code);
  set(record, codes);
}

Gathered sample_rasters(const SampleOptions& o, const std::vector<std::string>& added_columns,
                        const std::function<bool(const PointTable&, std::size_t)>& keep) {
  Gathered g;
  auto clock = std::chrono::steady_clock::now();
  auto lap = [&](const std::string& stage) {
    const auto now = std::chrono::steady_clock::now();
    g.seconds.emplace_back(stage, std::chrono::duration<double>(now - clock).count());
    clock = now;
  };
  auto specs = expand_layer_arguments(o.layers);
  g.table = read_points(o.points, o.reader);
  lap("read points");
  const std::size_t n = g.table.records.size();
  g.has_discs = o.discs.enabled && (g.table.uncertainty_column || o.discs.default_radius_m > 0);
  std::vector<std::string> columns = g.table.columns;
  for (const auto& spec : specs) {
    columns.push_back(spec.name);
    if (g.has_discs)
      for (const char* s : {"_min", "_mean", "_max"}) columns.push_back(spec.name + s);
  }
  columns.insert(columns.end(), added_columns.begin(), added_columns.end());
  check_unique_columns(columns);

  // What stays in memory per record: its parsed values and indices (~100 bytes), and a double per
  // layer for the value (and three more per layer with discs).
  const double need_mb = n * (100.0 + 8.0 * specs.size() * (g.has_discs ? 4 : 1)) / (1 << 20) + o.cache_megabytes;
  if (need_mb > o.memory_limit_mb)
    g.warnings.push_back("these " + std::to_string(n) + " records and " + std::to_string(specs.size()) + " layers need about " +
                         std::to_string(static_cast<long>(need_mb)) + " MB, more than --memory-limit " +
                         std::to_string(o.memory_limit_mb) + " MB; split the run with --shard I/N");
  RasterStack stack(specs, o.cache_megabytes << 20, o.assume_crs);
  std::vector<double> lon(n), lat(n);
  for (std::size_t i = 0; i < n; ++i) {
    const bool kept = !keep || keep(g.table, i);
    lon[i] = kept ? g.table.records[i].longitude : std::nan("");
    lat[i] = kept ? g.table.records[i].latitude : std::nan("");
  }
  stack.set_chunk_records(o.chunk_records);
  stack.set_progress(o.progress);
  Samples samples = stack.sample(lon, lat, o.method);
  lap("sample");
  g.values = std::move(samples.values);
  g.cells = std::move(samples.cell);
  for (const auto& l : stack.layers()) {
    g.layer_names.push_back(l.spec.name);
    g.float32.push_back(o.method == Interpolation::nearest && l.float32_values);
  }
  g.status.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    std::vector<std::string> codes = g.table.problems(i);
    for (std::size_t l = 0; l < g.layer_names.size(); ++l) {
      const CellStatus c = samples.status_at(i, l);
      if (c == CellStatus::outside) codes.push_back(reason::on_layer(reason::outside_layer, g.layer_names[l]));
      if (c == CellStatus::nodata) codes.push_back(reason::on_layer(reason::nodata, g.layer_names[l]));
    }
    if (!codes.empty()) g.status.set(i, codes);
  }
  // A layer that no record falls on is almost always a CRS or extent mistake: say so.
  std::size_t with_coordinates = 0;
  for (std::size_t i = 0; i < n; ++i) with_coordinates += std::isfinite(lon[i]) && std::isfinite(lat[i]);
  for (std::size_t l = 0; l < g.layer_names.size() && with_coordinates > 0; ++l) {
    std::size_t inside = 0;
    for (std::size_t i = 0; i < n; ++i)
      inside += samples.status_at(i, l) != CellStatus::outside && std::isfinite(lon[i]) && std::isfinite(lat[i]);
    if (inside == 0)
      g.warnings.push_back("layer " + g.layer_names[l] + " (" + specs[l].path +
                           "): no record falls inside it; check its extent and CRS, and the records' coordinates");
  }
  // A record that no layer has a value for, but would with latitude and longitude swapped.
  std::vector<std::size_t> lost;
  for (std::size_t i = 0; i < n; ++i)
    if (std::isfinite(lon[i]) && std::isfinite(lat[i]) && !g.values.row(static_cast<Eigen::Index>(i)).array().isFinite().any() &&
        std::fabs(lat[i]) <= 180 && std::fabs(lon[i]) <= 90)
      lost.push_back(i);
  if (!lost.empty()) {
    std::vector<double> swapped_lon, swapped_lat;
    for (std::size_t i : lost) swapped_lon.push_back(lat[i]), swapped_lat.push_back(lon[i]);
    const Samples swapped = stack.sample(swapped_lon, swapped_lat, Interpolation::nearest);
    for (std::size_t k = 0; k < lost.size(); ++k)
      if (swapped.values.row(static_cast<Eigen::Index>(k)).array().isFinite().any())
        g.status.add(lost[k], reason::coord_possibly_swapped);  // reported, never corrected
  }
  g.radius_m.assign(n, 0.0);
  if (g.has_discs) {
    for (std::size_t i = 0; i < n; ++i) {
      const auto& u = g.table.records[i].uncertainty_m;
      double r = u ? *u : o.discs.default_radius_m;
      if (r > o.discs.max_radius_m) {
        g.status.add(i, reason::uncertainty_capped);
        g.notes[i].push_back("uncertainty " + metres(r) + " cut to " + metres(o.discs.max_radius_m));
        r = o.discs.max_radius_m;
      }
      g.radius_m[i] = r;
    }
    g.discs = stack.sample_discs(lon, lat, g.radius_m);
    lap("uncertainty discs");
  }
  return g;
}

Gathered read_value_columns(const ScreenOptions& o, const std::vector<std::string>& added_columns) {
  Gathered g;
  ReaderOptions reader = o.reader;
  reader.coordinates_optional = true;
  g.table = read_points(o.points, reader);
  g.layers_are_columns = true;
  std::vector<std::string> columns = g.table.columns;
  columns.insert(columns.end(), added_columns.begin(), added_columns.end());
  check_unique_columns(columns);
  std::vector<std::size_t> index;
  for (const auto& name : o.value_columns) {
    auto it = std::find(g.table.columns.begin(), g.table.columns.end(), name);
    if (it == g.table.columns.end())
      throw InputError(o.points, 1, "no value column '" + name + "'", "check the names given to --value-columns");
    index.push_back(static_cast<std::size_t>(it - g.table.columns.begin()));
    g.layer_names.push_back(name);
    g.float32.push_back(false);
  }
  const std::size_t n = g.table.records.size();
  g.values = Eigen::MatrixXd::Constant(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(index.size()), std::nan(""));
  g.cells.assign(n, 0);
  g.status.resize(n);
  g.radius_m.assign(n, 0.0);
  std::vector<std::string> fields;
  for (std::size_t i = 0; i < n; ++i) {
    g.table.fields.read(i, fields);
    for (const auto& p : g.table.problems(i))
      if (p == reason::ragged_row || p == reason::uncertainty_not_numeric || p == reason::latin1_converted ||
          p == reason::duplicate_id)
        g.status.add(i, p);
    std::uint64_t key = 0xcbf29ce484222325ull;  // FNV-1a over the values' bits: equal values, equal key
    for (std::size_t l = 0; l < index.size(); ++l) {
      const ParsedNumber v = parse_number(fields[index[l]]);
      if (v.problem.empty()) {
        g.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l)) = v.value;
        std::uint64_t bits;
        std::memcpy(&bits, &v.value, sizeof bits);
        key = (key ^ bits) * 0x100000001b3ull;
      } else {
        g.status.add(i, reason::on_layer(v.problem == "empty" ? reason::value_missing : reason::value_not_numeric,
                                         g.layer_names[l]));
        key = (key ^ 0x9E3779B97F4A7C15ull) * 0x100000001b3ull;
      }
    }
    g.cells[i] = key;
  }
  return g;
}

std::vector<ReportedElevation> reported_elevations(Gathered& g, const ColumnNames& columns) {
  std::vector<ReportedElevation> out(g.table.records.size());
  std::vector<std::tuple<std::string, std::optional<double> ReportedElevation::*, std::size_t>> wanted;
  for (const auto& [name, member] : {std::pair{columns.min_elevation, &ReportedElevation::min_m},
                                     std::pair{columns.max_elevation, &ReportedElevation::max_m}}) {
    auto it = std::find(g.table.columns.begin(), g.table.columns.end(), name);
    if (!name.empty() && it != g.table.columns.end())
      wanted.emplace_back(name, member, static_cast<std::size_t>(it - g.table.columns.begin()));
  }
  if (wanted.empty()) return out;
  std::vector<std::string> fields;
  for (std::size_t i = 0; i < out.size(); ++i) {
    g.table.fields.read(i, fields);
    for (const auto& [name, member, col] : wanted) {
      const ParsedElevation e = parse_elevation(fields[col]);
      if (!e.problem.empty()) g.status.add(i, reason::on_layer(e.problem, name));
      else if (e.present) out[i].*member = e.metres;
    }
  }
  return out;
}

}  // namespace envsift::detail
