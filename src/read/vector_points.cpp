#include <charconv>

#include <gdal_priv.h>
#include <ogrsf_frmts.h>

#include "envsift/crs_transform.hpp"
#include "envsift/errors.hpp"
#include "gdal_init.hpp"
#include "table_builder.hpp"

namespace envsift::detail {
namespace {

std::string shortest(double v) {
  char buf[32];
  auto res = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, res.ptr);
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
    if (const std::string crs = crs_text(src); !crs.empty() && !is_wgs84_lon_lat(crs))
      to_wgs84 = new_transformation(crs, wgs84_wkt());
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

}  // namespace envsift::detail
