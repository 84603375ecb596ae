// Private to the reader: the columns a points table is read by, and the builder that turns
// each row's fields into a record (parsed coordinates, interned taxon and codes, the original
// fields on disk), shared by the text and the vector readers.
#pragma once
#include <algorithm>
#include <cmath>
#include <memory>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

#include <ogr_spatialref.h>

#include "envsift/read/coordinates.hpp"
#include "envsift/read/point_reader.hpp"
#include "envsift/read/taxon_names.hpp"
#include "envsift/reason_codes.hpp"
#include "envsift/stable_hash.hpp"

namespace envsift::detail {

// Column index by exact name, else by a unique case-insensitive match.
std::optional<std::size_t> find_column(const std::vector<std::string>& columns, const std::string& name);

struct ColumnIndex {
  std::optional<std::size_t> longitude, latitude;
  std::optional<std::size_t> id, taxon, uncertainty;
};

// The columns of the table the options name; throws InputError for a required or named column
// that is missing, listing the columns found.
ColumnIndex locate_columns(const PointTable& table, const ReaderOptions& o);

// WGS 84 lon/lat from the CRS of --points-crs (anything GDAL/PROJ reads: EPSG:32631, WKT, a .prj
// file); null when the coordinates are lon/lat already.
std::unique_ptr<OGRCoordinateTransformation> points_crs_transformation(const std::string& crs);

// Every record of an OGR vector source (point geometry reprojected to WGS 84, or lon/lat fields).
PointTable read_vector(const std::string& path, const ReaderOptions& o);

// Adds records to a table: parses the fields it needs, interns taxon names and code sets, and
// stores the original fields on disk.
class TableBuilder {
 public:
  // `to_wgs84`: the coordinate columns are in another CRS (--points-crs); null for lon/lat.
  TableBuilder(PointTable& table, const ColumnIndex& ix, OGRCoordinateTransformation* to_wgs84 = nullptr)
      : t_(table), ix_(ix), to_wgs84_(to_wgs84) {}

  // Records whose coordinates are out of range for degrees but look like metres.
  std::size_t metre_like() const { return metre_like_; }

  // `problems`: codes found before (a vector reader's position_geometry_disagrees); a code among them
  // that prevents scoring also keeps the record's location unused.
  void add(std::vector<std::string>& fields, std::size_t line, std::vector<std::string> problems) {
    const bool withheld = std::any_of(problems.begin(), problems.end(), [](const std::string& c) { return reason::prevents_scoring(c); });
    Occurrence r;
    r.line = line;
    if (fields.size() != t_.columns.size()) {
      problems.push_back(reason::ragged_row);
      fields.resize(t_.columns.size());  // keeps columns aligned in every output
    }
    if (ix_.longitude && ix_.latitude && to_wgs84_) {
      projected(fields[*ix_.longitude], fields[*ix_.latitude], r, problems);
    } else if (ix_.longitude && ix_.latitude) {
      auto lon = parse_coordinate(fields[*ix_.longitude], Axis::longitude);
      auto lat = parse_coordinate(fields[*ix_.latitude], Axis::latitude);
      if ((lon.problem == reason::position_off_globe || lat.problem == reason::position_off_globe) &&
          (std::fabs(lon.value) > 1000 || std::fabs(lat.value) > 1000))
        ++metre_like_;
      for (const auto* p : {&lon, &lat})
        for (const auto* code : {&p->problem, &p->note})
          if (!code->empty() && std::find(problems.begin(), problems.end(), *code) == problems.end())
            problems.push_back(*code);
      if (lon.problem.empty() && lat.problem.empty() && lon.value == 0 && lat.value == 0) {
        problems.push_back(reason::position_zero_zero);  // what broken exports write for "no coordinates"
      } else if (lon.problem.empty() && lat.problem.empty() && !withheld) {
        r.longitude = lon.value;
        r.latitude = lat.value;
      } else if (lat.problem == reason::position_off_globe && lon.problem.empty() && std::fabs(lon.value) <= 90) {
        problems.push_back(reason::position_maybe_swapped);  // reported, never corrected
      }
    }
    if (ix_.id && !fields[*ix_.id].empty()) r.id_hash = id_hash(fields[*ix_.id]);
    if (ix_.taxon) r.taxon = intern_taxon(normalise_taxon_name(fields[*ix_.taxon]));
    if (ix_.uncertainty) {
      auto u = parse_number(fields[*ix_.uncertainty]);
      if (u.problem.empty() && u.value >= 0) r.uncertainty_m = u.value;
      else if (u.problem != "empty") problems.push_back(reason::uncertainty_not_numeric);
    }
    r.problems = intern_problems(problems);
    t_.fields.append(fields);
    t_.records.push_back(r);
  }

 private:
  // Coordinates in the CRS of --points-crs: plain numbers, transformed to WGS 84 lon/lat.
  void projected(const std::string& x_text, const std::string& y_text, Occurrence& r, std::vector<std::string>& problems) {
    const ParsedNumber x = parse_number(x_text), y = parse_number(y_text);
    for (const auto* p : {&x, &y})
      if (!p->problem.empty()) {
        const std::string code = p->problem == "empty" ? reason::position_empty : p->problem;
        if (std::find(problems.begin(), problems.end(), code) == problems.end()) problems.push_back(code);
      }
    if (!x.problem.empty() || !y.problem.empty()) return;
    if (x.value == 0 && y.value == 0) {  // the CRS's origin: a placeholder, as 0/0 in degrees
      problems.push_back(reason::position_zero_zero);
      return;
    }
    double lon = x.value, lat = y.value;
    if (!to_wgs84_->Transform(1, &lon, &lat) || !std::isfinite(lon) || !std::isfinite(lat) || std::fabs(lat) > 90 ||
        std::fabs(lon) > 180) {
      problems.push_back(reason::position_off_globe);  // outside the area the CRS can be transformed from
      return;
    }
    r.longitude = lon, r.latitude = lat;
  }

 private:
  static std::uint64_t id_hash(const std::string& id) {  // FNV-1a, never 0
    const std::uint64_t h = stable_hash(id);
    return h ? h : 1;
  }
  std::uint32_t intern_taxon(std::string name) {
    if (name.empty()) return 0;
    if (const auto known = taxon_index_.find(name); known != taxon_index_.end()) return known->second;  // no node built
    auto [it, added] = taxon_index_.emplace(std::move(name), static_cast<std::uint32_t>(t_.taxa.size()));
    if (added) t_.taxa.push_back(it->first);
    return it->second;
  }
  std::uint32_t intern_problems(const std::vector<std::string>& codes) {
    if (codes.empty()) return 0;
    std::string key;
    for (const auto& c : codes) key += c + '\n';
    if (const auto known = problem_index_.find(key); known != problem_index_.end()) return known->second;
    auto [it, added] = problem_index_.emplace(key, static_cast<std::uint32_t>(t_.problem_sets.size()));
    if (added) t_.problem_sets.push_back(codes);
    return it->second;
  }

  PointTable& t_;
  const ColumnIndex& ix_;
  OGRCoordinateTransformation* to_wgs84_;
  std::size_t metre_like_ = 0;
  std::unordered_map<std::string, std::uint32_t> taxon_index_, problem_index_;
};


}  // namespace envsift::detail
