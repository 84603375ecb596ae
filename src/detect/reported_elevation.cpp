// Reported elevation against the DEM.
// A label's elevation that the terrain nowhere near the point reaches is a strong sign of a wrong
// coordinate or a wrong label. The DEM's own vertical error (SRTM's specification: 16 m absolute,
// 90 % — from memory) and the habit of reading label elevations off maps or altimeters to the
// nearest 50-100 m are absorbed by the tolerance (default 100 m, envsift's choice).
#include "envsift/detect/reported_elevation.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace envsift {

Finding check_reported_elevation(const ReportedElevation& reported, const DemRange& dem, double tolerance_m,
                                 const std::string& dem_name) {
  Finding f;
  // nothing reported, or no DEM value: nothing to compare, and nothing wrong with the record
  if ((!reported.min_m && !reported.max_m) || !std::isfinite(dem.low) || !std::isfinite(dem.high)) return f;
  const double rmin = std::min(reported.min_m.value_or(*reported.max_m), reported.max_m.value_or(*reported.min_m));
  const double rmax = std::max(reported.min_m.value_or(*reported.max_m), reported.max_m.value_or(*reported.min_m));
  const double gap = std::max({rmin - dem.high, dem.low - rmax, 0.0});
  f.tested = true;
  f.statistic = gap;
  f.threshold = tolerance_m;
  f.severity = gap / tolerance_m;
  f.flagged = gap > tolerance_m;
  if (f.flagged) {
    char reported_text[64], dem_text[160];
    if (rmin == rmax) std::snprintf(reported_text, sizeof reported_text, "%.0f m", rmin);
    else std::snprintf(reported_text, sizeof reported_text, "%.0f to %.0f m", rmin, rmax);
    if (dem.radius_m > 0 && dem.low < dem.high)
      std::snprintf(dem_text, sizeof dem_text, "%s within %.0f m of the point spans %.0f to %.0f m", dem_name.c_str(),
                    dem.radius_m, dem.low, dem.high);
    else
      std::snprintf(dem_text, sizeof dem_text, "%s at the point is %.0f m", dem_name.c_str(), dem.low);
    f.reasons.push_back(std::string("reported elevation ") + reported_text + ", but " + dem_text + " (" +
                        std::to_string(static_cast<long>(std::lround(gap))) + " m apart)");
  }
  return f;
}

}  // namespace envsift

// The check in a run, and its registry entry (detect/test_registry.cpp).
#include <tuple>

#include "envsift/detect/test_registry.hpp"
#include "envsift/errors.hpp"
#include "envsift/read/elevation_text.hpp"
#include "envsift/reason_codes.hpp"
#include "envsift/table/record_table.hpp"

namespace envsift {

const char* const kVerbatimElevation = "verbatimElevation";  // Darwin Core: the elevation as written

DemRange dem_range(const RecordTable& t, std::size_t i, std::size_t dem) {
  const auto r = static_cast<Eigen::Index>(i), c = static_cast<Eigen::Index>(dem);
  const double point = t.values(r, c);
  if (t.has_discs && t.radius_m[i] > 0 && std::isfinite(t.discs.min(r, c)))
    return {std::min(point, t.discs.min(r, c)), std::max(point, t.discs.max(r, c)), t.radius_m[i]};
  return {point, point, 0.0};
}

void ReportedElevationCheck::prepare(RecordTable& t) {
  const auto dem = t.layer_index(settings_.dem_layer);
  if (!dem) {
    std::string names;
    for (const auto& n : t.layer_names()) names += (names.empty() ? "" : ", ") + n;
    throw UsageError("--dem " + settings_.dem_layer + " is not one of the layers (" + names + ")");
  }
  const std::size_t n = t.size();
  dem_.resize(n);
  for (std::size_t i = 0; i < n; ++i) dem_[i] = dem_range(t, i, *dem);
  reported_.assign(n, {});
  const auto& columns = t.points.columns;
  auto column = [&](const std::string& name) -> std::optional<std::size_t> {
    const auto it = std::find(columns.begin(), columns.end(), name);
    if (name.empty() || it == columns.end()) return std::nullopt;
    return static_cast<std::size_t>(it - columns.begin());
  };
  std::string found;
  for (const auto& c : columns) found += (found.empty() ? "'" : ", '") + c + "'";
  const ElevationSettings standard;
  for (const auto& [name, standard_name, option] : {std::tuple{settings_.min_column, standard.min_column, "--min-elevation-column"},
                                                    std::tuple{settings_.max_column, standard.max_column, "--max-elevation-column"}})
    if (name != standard_name && !column(name))
      throw InputError(t.points.source, 1, "no reported elevation column '" + name + "' (columns found: " + found + ")",
                       std::string("name the column with ") + option + ", or leave the option out");
  const auto low = column(settings_.min_column), high = column(settings_.max_column);
  const auto verbatim = low || high ? std::nullopt : column(kVerbatimElevation);
  if (!low && !high && !verbatim) {
    t.warnings.push_back("--dem " + settings_.dem_layer + ": the points have no reported elevation (no column " +
                         settings_.min_column + ", " + settings_.max_column + " or " + kVerbatimElevation +
                         "), so the elevation check judged no record; name the columns with --min-elevation-column");
    return;
  }
  if (verbatim)
    t.warnings.push_back("--dem " + settings_.dem_layer + ": reported elevations read from " + kVerbatimElevation + " (no " +
                         settings_.min_column + " or " + settings_.max_column + " column)");
  std::vector<std::string> fields;
  for (std::size_t i = 0; i < n; ++i) {
    t.points.fields.read(i, fields);
    if (verbatim) {
      const ParsedElevationRange e = parse_elevation_range(fields[*verbatim]);
      if (!e.problem.empty()) t.codes.add(i, reason::on_layer(e.problem, kVerbatimElevation));
      else if (e.present) reported_[i] = {e.low_m, e.high_m};
      continue;
    }
    for (const auto& [col, member] : {std::pair{low, &ReportedElevation::min_m}, std::pair{high, &ReportedElevation::max_m}}) {
      if (!col) continue;
      const ParsedElevation e = parse_elevation(fields[*col]);
      if (!e.problem.empty()) t.codes.add(i, reason::on_layer(e.problem, columns[*col]));
      else if (e.present) reported_[i].*member = e.metres;
      if (e.approximate) t.codes.add(i, reason::on_layer(reason::elevation_approximate, columns[*col]));
    }
  }
}

Finding ReportedElevationCheck::judge(std::size_t i) const {
  return check_reported_elevation(reported_[i], dem_[i], settings_.tolerance_m, settings_.dem_layer);
}

}  // namespace envsift
