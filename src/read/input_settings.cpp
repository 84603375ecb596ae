#include "envsift/read/input_settings.hpp"

#include "envsift/errors.hpp"

namespace envsift {
namespace {

using I = InputSettings;

Option<I> column_option(const std::string& name, const std::string& help, std::string ColumnNames::*member) {
  return text_option<I>(name, "NAME", help, [member](I& s) -> std::string& { return s.reader.columns.*member; });
}

Option<I> delimiter_option() {
  Option<I> o{"delimiter", "CHAR",
              "field delimiter of a text points file: ',' ';' 'tab' (default: tab for .tsv, else guessed from the header)"};
  o.set = [](I& s, const std::string& d) {
    if (d == "tab" || d == "\\t" || d == "\t") s.reader.delimiter = '\t';
    else if (d.size() == 1 && d != "\"" && d != "\n" && d != "\r") s.reader.delimiter = d[0];
    else throw UsageError("--delimiter must be one character or 'tab', not '" + d + "'");
  };
  o.get = [](const I& s) {
    const char d = s.reader.delimiter;
    return d == 0 ? std::string() : d == '\t' ? std::string("tab") : std::string(1, d);
  };
  return o;
}

}  // namespace

const std::vector<Option<I>>& input_options() {
  static const std::vector<Option<I>> options = [] {
    std::vector<Option<I>> v;
    v.push_back(text_option("points", "FILE",
                            "occurrence records: CSV or TSV with a header line, or a GeoPackage, GeoJSON or Shapefile of points",
                            &I::points));
    v.back().required = true;
    v.push_back(list_option("layers", "RASTER...",
                            "raster layers to sample (GeoTIFF or any GDAL raster). Each becomes a column named after its "
                            "file; write NAME=PATH to choose the name. Layers may differ in CRS, resolution and extent.",
                            &I::layers));
    v.push_back(column_option("id-column", "record identifier column", &ColumnNames::id));
    v.push_back(column_option("taxon-column", "taxon name column", &ColumnNames::taxon));
    v.push_back(column_option("longitude-column", "longitude column, decimal degrees WGS 84", &ColumnNames::longitude));
    v.push_back(column_option("latitude-column", "latitude column, decimal degrees WGS 84", &ColumnNames::latitude));
    v.push_back(column_option("uncertainty-column",
                              "coordinate uncertainty column, metres: each layer is also sampled over every cell within "
                              "that radius (columns LAYER_min, LAYER_mean, LAYER_max)",
                              &ColumnNames::uncertainty));
    v.push_back(delimiter_option());
    v.push_back(choice_option<I, std::optional<Quoting>>(
        "quoting",
        "how quotes in a text points file are read. auto: tab-separated text literally (a quote "
        "is a character, as in data-portal exports and Darwin Core Archives), other delimiters "
        "as RFC 4180 (a quoted field may hold the delimiter and line breaks); or rfc4180 | literal",
        [](I& s) -> std::optional<Quoting>& { return s.reader.quoting; },
        {{"auto", std::nullopt}, {"rfc4180", Quoting::rfc4180}, {"literal", Quoting::literal}}));
    v.push_back(text_option<I>("points-crs", "CRS",
                               "the CRS of a text file's coordinate columns when they are not WGS 84 degrees, e.g. "
                               "EPSG:32631 (UTM metres: x in the longitude column, y in the latitude column); any CRS "
                               "GDAL/PROJ knows, as EPSG:N, WKT or a .prj file. The points are transformed to WGS 84",
                               [](I& s) -> std::string& { return s.reader.points_crs; }));
    v.push_back(text_option<I>("points-layer", "NAME", "layer of a multi-layer GeoPackage (default: the first)",
                               [](I& s) -> std::string& { return s.reader.vector_layer; }));
    v.push_back(comma_list_option("circular", "LAYER,...",
                                  "layers (or value columns) holding directions in degrees, such as aspect: the tests "
                                  "judge their sine and cosine (columns LAYER_sin, LAYER_cos), so 359° and 1° are "
                                  "neighbours. Layers named aspect, azimuth, bearing, direction or orientation are taken "
                                  "as circular without it",
                                  &I::circular));
    v.push_back(text_option("assume-crs", "CRS",
                            "CRS for layers that have none, e.g. EPSG:4326 (without it such layers are refused)",
                            &I::assume_crs));
    return v;
  }();
  return options;
}

}  // namespace envsift
