// Step 1 of the pipeline: read occurrence records from delimited text (CSV/TSV) or from any
// vector source GDAL/OGR can open (GeoPackage, GeoJSON, Shapefile, ...).
#pragma once
#include <istream>
#include <optional>
#include <string>

#include "envsift/read/csv_reader.hpp"
#include "envsift/read/occurrence.hpp"
#include "envsift/progress.hpp"

namespace envsift {

// Which input columns hold what. Defaults are Darwin Core terms (TDWG standard).
struct ColumnNames {
  std::string id = "occurrenceID";
  std::string taxon = "scientificName";
  std::string longitude = "decimalLongitude";
  std::string latitude = "decimalLatitude";
  std::string uncertainty = "coordinateUncertaintyInMeters";
};

struct ReaderOptions {
  ColumnNames columns;
  char delimiter = 0;          // 0: '\t' for .tsv/.tab, else sniffed from the header line
  // empty (auto): tab-separated text is read literally (a quote is a character, as in data-portal
  // exports and Darwin Core Archives), other delimiters with RFC 4180 quoting.
  std::optional<Quoting> quoting;
  // The CRS of the coordinate columns of a text file (EPSG:32631, WKT, a .prj file): x in the
  // longitude column, y in the latitude column, transformed to WGS 84. Empty: lon/lat degrees.
  std::string points_crs;
  bool require_taxon = false;  // screening needs a taxon column; sampling does not
  std::string vector_layer;    // layer of a multi-layer vector source; empty = the first
  bool coordinates_optional = false;  // screening pre-sampled values: coordinates are not needed
  Progress* progress = nullptr;       // told of the records read (a stage of unknown total)
};

// Reads every record; none is dropped. Records with unusable coordinates carry reason codes in
// `problems`. Throws InputError when the file cannot be read or a required column is missing.
// For vector sources with point geometry, coordinates come from the geometry (reprojected to
// WGS 84 longitude/latitude) and two columns decimalLongitude/decimalLatitude are appended to
// `columns` when the source has no such fields.
PointTable read_points(const std::string& path, const ReaderOptions& options);

// Delimited text from a stream (what read_points does for a .csv/.tsv file); `source_name` is
// used in error messages and to pick the delimiter by extension.
PointTable read_points_from_text(std::istream& in, const std::string& source_name, const ReaderOptions& options);

// True when the path is read as delimited text rather than through OGR.
bool is_delimited_text(const std::string& path);

}  // namespace envsift
