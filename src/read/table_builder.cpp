#include "table_builder.hpp"

#include <algorithm>
#include <cctype>

#include "envsift/geo/crs_transform.hpp"
#include "envsift/errors.hpp"

namespace envsift::detail {
namespace {

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return std::tolower(c); });
  return s;
}

std::string list_columns(const std::vector<std::string>& columns) {
  std::string s;
  for (const auto& c : columns) s += (s.empty() ? "" : ", ") + ("'" + c + "'");
  return s.empty() ? "none" : s;
}

}  // namespace

std::optional<std::size_t> find_column(const std::vector<std::string>& columns, const std::string& name) {
  if (name.empty()) return std::nullopt;
  for (std::size_t i = 0; i < columns.size(); ++i)
    if (columns[i] == name) return i;
  std::optional<std::size_t> found;
  for (std::size_t i = 0; i < columns.size(); ++i) {
    if (lower(columns[i]) == lower(name)) {
      if (found) return std::nullopt;
      found = i;
    }
  }
  return found;
}

ColumnIndex locate_columns(const PointTable& table, const ReaderOptions& o) {
  // every output column needs its own name, so the header may not repeat one
  for (std::size_t i = 0; i < table.columns.size(); ++i)
    for (std::size_t j = 0; j < i; ++j)
      if (table.columns[i] == table.columns[j])
        throw InputError(table.source, 1,
                         "the header names two columns '" + table.columns[i] + "' (columns " + std::to_string(j + 1) + " and " +
                             std::to_string(i + 1) + ")",
                         "rename one of them in the file: every column of the output needs its own name");
  // a name that matches several columns once letter case is ignored is not guessed at
  auto refuse_ambiguous = [&](const std::string& name, const std::string& role, const std::string& option) {
    if (name.empty() || std::find(table.columns.begin(), table.columns.end(), name) != table.columns.end()) return;
    std::vector<std::string> alike;
    for (const auto& c : table.columns)
      if (lower(c) == lower(name)) alike.push_back(c);
    if (alike.size() > 1)
      throw InputError(table.source, 1,
                       "columns " + list_columns(alike) + " could each be the " + role + " column '" + name +
                           "' (they differ from it only in letter case)",
                       "name the one to use exactly with " + option);
  };
  refuse_ambiguous(o.columns.longitude, "longitude", "--longitude-column");
  refuse_ambiguous(o.columns.latitude, "latitude", "--latitude-column");
  refuse_ambiguous(o.columns.id, "record identifier", "--id-column");
  refuse_ambiguous(o.columns.uncertainty, "coordinate uncertainty", "--uncertainty-column");
  refuse_ambiguous(o.columns.taxon, "taxon", "--taxon-column");
  auto required = [&](const std::string& name, const std::string& role, const std::string& option) {
    auto i = find_column(table.columns, name);
    if (!i)
      throw InputError(table.source, 1,
                       "no " + role + " column '" + name + "' (columns found: " + list_columns(table.columns) + ")",
                       "name the column holding the " + role + " with " + option);
    return *i;
  };
  ColumnIndex ix;
  if (o.coordinates_optional) {
    ix.longitude = find_column(table.columns, o.columns.longitude);
    ix.latitude = find_column(table.columns, o.columns.latitude);
    if (!ix.longitude || !ix.latitude) ix.longitude = ix.latitude = std::nullopt;
  } else {
    ix.longitude = required(o.columns.longitude, "longitude", "--longitude-column");
    ix.latitude = required(o.columns.latitude, "latitude", "--latitude-column");
  }
  // An optional column is looked for under its Darwin Core name; one named by an option must exist.
  const ColumnNames standard;
  auto optional = [&](const std::string& name, const std::string& standard_name, const std::string& role,
                      const std::string& option) {
    return name == standard_name ? find_column(table.columns, name) : std::optional<std::size_t>(required(name, role, option));
  };
  ix.id = optional(o.columns.id, standard.id, "record identifier", "--id-column");
  ix.uncertainty = optional(o.columns.uncertainty, standard.uncertainty, "coordinate uncertainty", "--uncertainty-column");
  if (o.require_taxon) ix.taxon = required(o.columns.taxon, "taxon", "--taxon-column");
  else ix.taxon = optional(o.columns.taxon, standard.taxon, "taxon", "--taxon-column");
  return ix;
}

std::unique_ptr<OGRCoordinateTransformation> points_crs_transformation(const std::string& crs) {
  if (crs.empty()) return nullptr;
  OGRSpatialReference from;
  if (from.SetFromUserInput(crs.c_str()) != OGRERR_NONE)
    throw UsageError("--points-crs " + crs + " is not a CRS GDAL/PROJ knows; give e.g. EPSG:32631, a WKT string or a .prj file");
  // x = easting (the longitude column), y = northing
  CrsTransformation t = new_transformation(crs_text(&from), wgs84_wkt());
  if (!t) throw UsageError("--points-crs " + crs + ": no transformation to WGS 84 is known; check the CRS");
  return t;
}

}  // namespace envsift::detail
