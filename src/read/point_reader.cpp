#include "envsift/read/point_reader.hpp"
#include "envsift/stable_hash.hpp"
#include "vsi_stream.hpp"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <memory>
#include <optional>
#include <unordered_map>

#include <gdal_priv.h>
#include <ogr_spatialref.h>
#include <ogrsf_frmts.h>

#include "envsift/errors.hpp"
#include "gdal_init.hpp"
#include "envsift/read/coordinates.hpp"
#include "envsift/read/csv_reader.hpp"
#include "envsift/read/darwin_core_archive.hpp"
#include "envsift/read/taxon_names.hpp"
#include "envsift/read/text_encoding.hpp"
#include "envsift/reason_codes.hpp"

namespace envsift {
namespace {

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return std::tolower(c); });
  return s;
}

std::string extension(const std::string& path) {
  auto dot = path.find_last_of('.');
  auto slash = path.find_last_of("/\\");
  if (dot == std::string::npos || (slash != std::string::npos && dot < slash)) return "";
  return lower(path.substr(dot + 1));
}

// Column index by exact name, else by a unique case-insensitive match.
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

std::string list_columns(const std::vector<std::string>& columns) {
  std::string s;
  for (const auto& c : columns) s += (s.empty() ? "" : ", ") + ("'" + c + "'");
  return s.empty() ? "none" : s;
}

struct ColumnIndex {
  std::optional<std::size_t> longitude, latitude;
  std::optional<std::size_t> id, taxon, uncertainty;
};

ColumnIndex locate_columns(const PointTable& table, const ReaderOptions& o) {
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

// Adds records to a table: parses the fields it needs, interns taxon names and code sets, and
// stores the original fields on disk.
class TableBuilder {
 public:
  // `to_wgs84`: the coordinate columns are in another CRS (--points-crs); null for lon/lat.
  TableBuilder(PointTable& table, const ColumnIndex& ix, OGRCoordinateTransformation* to_wgs84 = nullptr)
      : t_(table), ix_(ix), to_wgs84_(to_wgs84) {}

  // Records whose coordinates are out of range for degrees but look like metres.
  std::size_t metre_like() const { return metre_like_; }

  void add(std::vector<std::string>& fields, std::size_t line, std::vector<std::string> problems) {
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
      if ((lon.problem == reason::coord_out_of_range || lat.problem == reason::coord_out_of_range) &&
          (std::fabs(lon.value) > 1000 || std::fabs(lat.value) > 1000))
        ++metre_like_;
      for (const auto* p : {&lon, &lat})
        for (const auto* code : {&p->problem, &p->note})
          if (!code->empty() && std::find(problems.begin(), problems.end(), *code) == problems.end())
            problems.push_back(*code);
      if (lon.problem.empty() && lat.problem.empty()) {
        r.longitude = lon.value;
        r.latitude = lat.value;
      } else if (lat.problem == reason::coord_out_of_range && lon.problem.empty() && std::fabs(lon.value) <= 90) {
        problems.push_back(reason::coord_possibly_swapped);  // reported, never corrected
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
        const std::string code = p->problem == "empty" ? reason::coord_missing : p->problem;
        if (std::find(problems.begin(), problems.end(), code) == problems.end()) problems.push_back(code);
      }
    if (!x.problem.empty() || !y.problem.empty()) return;
    double lon = x.value, lat = y.value;
    if (!to_wgs84_->Transform(1, &lon, &lat) || !std::isfinite(lon) || !std::isfinite(lat) || std::fabs(lat) > 90 ||
        std::fabs(lon) > 180) {
      problems.push_back(reason::coord_out_of_range);  // outside the area the CRS can be transformed from
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
    auto [it, added] = taxon_index_.emplace(std::move(name), static_cast<std::uint32_t>(t_.taxa.size()));
    if (added) t_.taxa.push_back(it->first);
    return it->second;
  }
  std::uint32_t intern_problems(const std::vector<std::string>& codes) {
    if (codes.empty()) return 0;
    std::string key;
    for (const auto& c : codes) key += c + '\n';
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

// WGS 84 lon/lat from the CRS of --points-crs (anything GDAL/PROJ reads: EPSG:32631, WKT, a .prj
// file); null when the coordinates are lon/lat already.
std::unique_ptr<OGRCoordinateTransformation> points_crs_transformation(const std::string& crs) {
  if (crs.empty()) return nullptr;
  OGRSpatialReference from, to;
  if (from.SetFromUserInput(crs.c_str()) != OGRERR_NONE)
    throw UsageError("--points-crs " + crs + " is not a CRS GDAL/PROJ knows; give e.g. EPSG:32631, a WKT string or a .prj file");
  from.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);  // x = easting (longitude column), y = northing
  to.SetWellKnownGeogCS("WGS84");
  to.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  std::unique_ptr<OGRCoordinateTransformation> t(OGRCreateCoordinateTransformation(&from, &to));
  if (!t) throw UsageError("--points-crs " + crs + ": no transformation to WGS 84 is known; check the CRS");
  return t;
}

// `archive`: the text is a Darwin Core Archive's core, laid out as its meta.xml says.
PointTable read_delimited(std::istream& in, const std::string& path, const ReaderOptions& o,
                          const ArchiveCore* archive = nullptr) {
  char delimiter = archive ? archive->delimiter : o.delimiter;
  if (!delimiter) {
    auto ext = extension(path);
    if (ext == "tsv" || ext == "tab") {
      delimiter = '\t';
    } else {
      std::string first;  // the header line, ended by LF, CR or CRLF
      for (int c = in.get(); c != std::char_traits<char>::eof() && c != '\n' && c != '\r' && first.size() < (1u << 20);
           c = in.get())
        first += static_cast<char>(c);
      delimiter = sniff_delimiter(first);
      in.clear();
      in.seekg(0);
    }
  }
  PointTable table;
  table.source = path;
  Quoting quoting = o.quoting == "literal" || (o.quoting == "auto" && delimiter == '\t') ? Quoting::literal
                                                                                          : Quoting::rfc4180;
  if (archive && o.quoting == "auto") quoting = archive->quoted ? Quoting::rfc4180 : Quoting::literal;
  CsvReader reader(in, delimiter, path, quoting);
  std::size_t line = 0;
  if (archive) {
    std::vector<std::string> skipped;
    for (std::size_t k = 0; k < archive->header_lines; ++k) reader.next(skipped, line);
    table.columns = archive->columns;
    for (const auto& [term, value] : archive->defaults) table.columns.push_back(term);
    table.warnings = archive->notes;
  } else if (!reader.next(table.columns, line)) {
    throw InputError(path, 1, "the file is empty", "give a file with a header line and one record per line");
  }
  if (!table.columns.empty() && !table.columns.back().empty() && table.columns.back().back() == '\r')
    table.columns.back().pop_back();
  for (auto& c : table.columns) {
    bool changed;
    c = to_utf8(c, changed);
  }
  const ColumnIndex ix = locate_columns(table, o);
  table.uncertainty_column = ix.uncertainty;
  const auto to_wgs84 = points_crs_transformation(o.points_crs);
  TableBuilder builder(table, ix, to_wgs84.get());
  std::vector<std::string> fields;
  std::vector<std::string> spanning;  // "5-7": the lines of records that span several
  std::size_t spans = 0;
  while (reader.next(fields, line)) {
    if (fields.size() == 1 && fields[0].empty()) continue;  // blank line: not a record
    std::vector<std::string> codes;
    bool converted = false;
    for (auto& f : fields) {
      bool changed;
      f = to_utf8(f, changed);
      converted = converted || changed;
    }
    if (converted) codes.push_back(reason::latin1_converted);
    if (archive && !archive->defaults.empty()) {  // fields given only a default value in meta.xml
      const std::size_t core = archive->columns.size();
      if (fields.size() != core) codes.push_back(reason::ragged_row);
      fields.resize(core);
      for (const auto& [term, value] : archive->defaults) fields.push_back(value);
    }
    if (reader.last_line() > line) {  // never merged without a word: the code, and the lines in a warning
      codes.push_back(reason::spans_lines);
      if (spans++ < 10) spanning.push_back(std::to_string(line) + "-" + std::to_string(reader.last_line()));
    }
    builder.add(fields, line, codes);
  }
  if (!to_wgs84 && builder.metre_like() * 2 > table.records.size())
    table.warnings.push_back(path + ": " + std::to_string(builder.metre_like()) + " of " + std::to_string(table.records.size()) +
                             " records have coordinates out of range for degrees that look like metres: if the file "
                             "holds projected coordinates, give their CRS with --points-crs (e.g. EPSG:32631)");
  if (spans > 0) {
    std::string lines;
    for (const auto& l : spanning) lines += (lines.empty() ? "" : ", ") + l;
    table.warnings.push_back(path + ": " + std::to_string(spans) + " record(s) span several lines, a quoted field holding a " +
                             "line break (lines " + lines + (spans > spanning.size() ? ", ..." : "") +
                             "; code spans_lines); if the file is a portal export or a Darwin Core Archive, quotes are "
                             "plain characters there: read it with --quoting literal");
  }
  return table;
}

std::string shortest(double v) {
  char buf[32];
  auto res = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, res.ptr);
}

PointTable read_vector(const std::string& path, const ReaderOptions& o) {
  ensure_gdal_registered();
  std::unique_ptr<GDALDataset> ds(
      GDALDataset::Open(path.c_str(), GDAL_OF_VECTOR | GDAL_OF_READONLY, nullptr, nullptr, nullptr));
  if (!ds)
    throw InputError(path, "cannot open as a points file (not CSV/TSV and not a vector format GDAL reads)",
                     "give a .csv/.tsv file or a GeoPackage, GeoJSON or Shapefile");
  OGRLayer* layer = o.vector_layer.empty() ? ds->GetLayer(0) : ds->GetLayerByName(o.vector_layer.c_str());
  if (!layer)
    throw InputError(path, o.vector_layer.empty() ? "has no layers" : "has no layer '" + o.vector_layer + "'",
                     "name the points layer with --points-layer");
  PointTable table;
  table.source = path;
  OGRFeatureDefn* defn = layer->GetLayerDefn();
  for (int i = 0; i < defn->GetFieldCount(); ++i) table.columns.push_back(defn->GetFieldDefn(i)->GetNameRef());
  const std::size_t attribute_count = table.columns.size();

  // Longitude/latitude attributes win when present (they are the original data); otherwise a point
  // geometry supplies them, reprojected to WGS 84 lon/lat, in two appended columns.
  const bool has_attributes = find_column(table.columns, o.columns.longitude) &&
                              find_column(table.columns, o.columns.latitude);
  const bool use_geometry = !has_attributes && wkbFlatten(layer->GetGeomType()) == wkbPoint;
  std::unique_ptr<OGRCoordinateTransformation> to_wgs84;
  if (use_geometry) {
    table.columns.push_back(o.columns.longitude);
    table.columns.push_back(o.columns.latitude);
    const OGRSpatialReference* src = layer->GetSpatialRef();
    if (src) {
      OGRSpatialReference wgs84, source(*src);
      wgs84.SetWellKnownGeogCS("WGS84");
      wgs84.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
      source.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
      if (!source.IsSame(&wgs84)) to_wgs84.reset(OGRCreateCoordinateTransformation(&source, &wgs84));
    }
  }
  const ColumnIndex ix = locate_columns(table, o);
  table.uncertainty_column = ix.uncertainty;

  std::size_t feature_number = 0;
  TableBuilder builder(table, ix);
  std::vector<std::string> fields;
  layer->ResetReading();
  for (auto& feature : *layer) {
    fields.clear();
    for (std::size_t i = 0; i < attribute_count; ++i)
      fields.push_back(feature->IsFieldSetAndNotNull(static_cast<int>(i)) ? feature->GetFieldAsString(static_cast<int>(i))
                                                                           : "");
    if (use_geometry) {
      fields.resize(table.columns.size());
      const OGRGeometry* g = feature->GetGeometryRef();
      if (g && !g->IsEmpty()) {
        double x = g->toPoint()->getX(), y = g->toPoint()->getY();
        if (!to_wgs84 || to_wgs84->Transform(1, &x, &y)) {
          fields[*ix.longitude] = shortest(x);
          fields[*ix.latitude] = shortest(y);
        }
      }
    }
    builder.add(fields, ++feature_number, {});
  }
  return table;
}

// Every record sharing an ID with another is kept and marked. IDs are compared by a 64-bit
// hash: sorted hashes find the duplicates in O(n log n) with 8 bytes per record.
void mark_duplicate_ids(PointTable& t) {
  std::vector<std::uint64_t> hashes;
  for (const auto& r : t.records)
    if (r.id_hash) hashes.push_back(r.id_hash);
  std::sort(hashes.begin(), hashes.end());
  std::unordered_map<std::uint32_t, std::uint32_t> with_duplicate;  // problem set → the same plus duplicate_id
  for (auto& r : t.records) {
    if (!r.id_hash) continue;
    const auto range = std::equal_range(hashes.begin(), hashes.end(), r.id_hash);
    if (range.second - range.first < 2) continue;
    auto it = with_duplicate.find(r.problems);
    if (it == with_duplicate.end()) {
      std::vector<std::string> codes = t.problem_sets[r.problems];
      codes.push_back(reason::duplicate_id);
      t.problem_sets.push_back(std::move(codes));
      it = with_duplicate.emplace(r.problems, static_cast<std::uint32_t>(t.problem_sets.size() - 1)).first;
    }
    r.problems = it->second;
  }
}

// Taxon names that look like one (letter case, authorship) are screened apart and listed together.
void list_lookalike_names(PointTable& t) {
  const auto groups = names_that_look_alike(t.taxa);
  t.similar_names.assign(t.taxa.size(), "");
  if (groups.empty()) return;
  std::unordered_map<std::string, std::size_t> index;
  for (std::size_t i = 0; i < t.taxa.size(); ++i) index[t.taxa[i]] = i;
  std::string shown;
  for (std::size_t g = 0; g < groups.size(); ++g) {
    std::string all;
    for (const auto& name : groups[g]) all += (all.empty() ? "'" : "', '") + name;
    if (g < 5) shown += (shown.empty() ? "" : "; ") + all + "'";
    for (const auto& name : groups[g]) {
      std::string others;
      for (const auto& other : groups[g])
        if (other != name) others += (others.empty() ? "" : "; ") + other;
      t.similar_names[index[name]] = others;
    }
  }
  t.warnings.push_back(t.source + ": " + std::to_string(groups.size()) +
                       " group(s) of taxon names look like one taxon (they differ only by letter case or an "
                       "authorship) and are screened apart: " + shown + (groups.size() > 5 ? "; ..." : "") +
                       "; if they are one taxon, write them alike in the source (the summary's similar_names lists them)");
}

// What every points table gets once read: duplicate IDs marked, look-alike names listed.
void finish_table(PointTable& t) {
  mark_duplicate_ids(t);  // every record sharing an ID is kept and marked
  list_lookalike_names(t);
}

}  // namespace

PointTable read_points_from_text(std::istream& in, const std::string& source_name, const ReaderOptions& options) {
  PointTable t = read_delimited(in, source_name, options);
  finish_table(t);
  return t;
}

bool is_delimited_text(const std::string& path) {
  auto ext = extension(path);
  return ext == "csv" || ext == "tsv" || ext == "tab" || ext == "txt";
}

PointTable read_points(const std::string& path, const ReaderOptions& options) {
  std::error_code ec;
  if (path != "-" && std::filesystem::is_directory(path, ec) && !std::filesystem::exists(path + "/meta.xml", ec))
    throw InputError(path, "is not a file (a directory?)", "give the path of the points file itself, or of a Darwin Core Archive folder");
  if (path != "-")
    if (const auto core = read_archive_meta(path)) {  // a Darwin Core Archive (zip or folder)
      detail::VsiInput in(core->vsi_path);
      if (!in) throw InputError(core->name, "cannot open the archive's core file", "check the archive");
      PointTable t = read_delimited(in, core->name, options, &*core);
      finish_table(t);
      return t;
    }
  const detail::TextSource source = detail::locate_text(path);  // plain, gzip, one file in a zip, stdin
  if (!source.text) {
    PointTable t = read_vector(path, options);
    finish_table(t);
    return t;
  }
  detail::VsiInput in(source.vsi_path);
  if (!in) throw InputError(source.name, "cannot open the points file", "check the path and its read permission");
  return read_points_from_text(in, source.name, options);
}

}  // namespace envsift
