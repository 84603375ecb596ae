#include <charconv>
#include <cmath>

#include <gdal_priv.h>
#include <ogrsf_frmts.h>

#include "envsift/geo/crs_transform.hpp"
#include "envsift/errors.hpp"
#include "envsift/read/coordinates.hpp"
#include "envsift/reason_codes.hpp"
#include "gdal_init.hpp"
#include "table_builder.hpp"

namespace envsift::detail {
namespace {

std::string shortest(double v) {
  char buf[32];
  auto res = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, res.ptr);
}

// An attribute coordinate that disagrees with the geometry's by more than the attribute's own
// precision (half a unit of its last decimal: 0.1 written for 0.14 agrees, for 0.16 it does not).
bool disagree(const std::string& attribute, double geometry, Axis axis) {
  const ParsedNumber a = parse_coordinate(attribute, axis);
  if (!a.problem.empty()) return false;  // the attribute's own problem code says enough
  const auto dot = attribute.find('.');
  const auto digits = dot == std::string::npos ? 0 : attribute.find_first_not_of("0123456789", dot + 1) == std::string::npos
                                                          ? attribute.size() - dot - 1
                                                          : attribute.find_first_not_of("0123456789", dot + 1) - dot - 1;
  const double tolerance = 0.5 * std::pow(10.0, -static_cast<double>(digits)) + 1e-9;
  return std::fabs(a.value - geometry) > tolerance;
}

}  // namespace

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

  // Longitude/latitude attributes are used when present (they are the original data), and checked
  // against the point geometry when there is one: a point moved in a GIS leaves its attributes
  // stale, and which of the two is right cannot be known (position_geometry_disagrees, not scored).
  // Without the attributes the geometry supplies them, reprojected to WGS 84 lon/lat, in two
  // appended columns.
  const bool has_attributes = find_column(table.columns, o.columns.longitude) &&
                              find_column(table.columns, o.columns.latitude);
  const bool point_geometry = wkbFlatten(layer->GetGeomType()) == wkbPoint;
  const bool use_geometry = !has_attributes && point_geometry;
  CrsTransformation to_wgs84;
  if (point_geometry)
    if (const std::string crs = crs_text(layer->GetSpatialRef()); !crs.empty() && !is_wgs84_lon_lat(crs))
      to_wgs84 = new_transformation(crs, wgs84_wkt());
  if (use_geometry) {
    table.columns.push_back(o.columns.longitude);
    table.columns.push_back(o.columns.latitude);
  }
  const ColumnIndex ix = locate_columns(table, o);
  table.uncertainty_column = ix.uncertainty;

  std::size_t feature_number = 0, differing = 0;
  std::string first_difference;
  TableBuilder builder(table, ix);
  std::vector<std::string> fields;
  layer->ResetReading();
  for (auto& feature : *layer) {
    fields.clear();
    for (std::size_t i = 0; i < attribute_count; ++i)
      fields.push_back(feature->IsFieldSetAndNotNull(static_cast<int>(i)) ? feature->GetFieldAsString(static_cast<int>(i))
                                                                           : "");
    std::vector<std::string> problems;
    const OGRGeometry* g = point_geometry ? feature->GetGeometryRef() : nullptr;
    double x = 0, y = 0;
    const bool located = g && !g->IsEmpty() && (x = g->toPoint()->getX(), y = g->toPoint()->getY(),
                                                  !to_wgs84 || to_wgs84->Transform(1, &x, &y));
    if (use_geometry) {
      fields.resize(table.columns.size());
      if (located) fields[*ix.longitude] = shortest(x), fields[*ix.latitude] = shortest(y);
    } else if (located && (disagree(fields[*ix.longitude], x, Axis::longitude) || disagree(fields[*ix.latitude], y, Axis::latitude))) {
      problems.push_back(reason::position_geometry_disagrees);
      if (!differing++)
        first_difference = "feature " + std::to_string(feature_number + 1) + ": attributes " + fields[*ix.longitude] + ", " +
                           fields[*ix.latitude] + "; geometry " + shortest(x) + ", " + shortest(y);
    }
    builder.add(fields, ++feature_number, std::move(problems));
  }
  if (differing)
    table.warnings.push_back(path + ": " + std::to_string(differing) + " record(s) have " + o.columns.longitude + "/" +
                             o.columns.latitude + " attributes that disagree with their point geometry (first: " +
                             first_difference + "); envsift cannot know which is right, so they are not scored "
                             "(position_geometry_disagrees): correct the attributes, or drop them to use the geometry");
  return table;
}

}  // namespace envsift::detail
