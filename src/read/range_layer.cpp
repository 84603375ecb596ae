#include "envsift/read/range_layer.hpp"

#include <algorithm>
#include <cmath>

#include <gdal_priv.h>
#include <ogr_api.h>
#include <ogr_geometry.h>
#include <ogr_spatialref.h>
#include <ogrsf_frmts.h>

#include "../gdal_init.hpp"
#include "envsift/geo/crs_transform.hpp"
#include "envsift/errors.hpp"
#include "envsift/read/taxon_names.hpp"
#include "envsift/geo/great_circle.hpp"

namespace envsift {
namespace {

constexpr double kProjectedSegmentM = 1000;  // a projected layer's edges, densified before reprojection

std::string field_names(OGRFeatureDefn* definition) {
  std::string names;
  for (int f = 0; f < definition->GetFieldCount(); ++f)
    names += std::string(names.empty() ? "" : ", ") + "'" + definition->GetFieldDefn(f)->GetNameRef() + "'";
  return names.empty() ? "none" : names;
}

// The polygons of a geometry (curves made linear); false when it holds something else.
bool polygons_of(const OGRGeometry& g, std::vector<std::unique_ptr<OGRPolygon>>& out) {
  const OGRwkbGeometryType type = wkbFlatten(g.getGeometryType());
  if (type == wkbPolygon || type == wkbCurvePolygon || type == wkbTriangle) {
    std::unique_ptr<OGRGeometry> linear(g.getLinearGeometry());
    out.emplace_back(linear->toPolygon()->clone());
    return true;
  }
  if (type == wkbMultiPolygon || type == wkbMultiSurface || type == wkbGeometryCollection ||
      type == wkbPolyhedralSurface || type == wkbTIN) {
    bool any = false, other = false;
    for (const auto* part : *g.toGeometryCollection()) (polygons_of(*part, out) ? any : other) = true;
    return any && !other;
  }
  return false;
}

}  // namespace

TaxonRange::~TaxonRange() {
  for (Part& p : parts_) {
    if (p.prepared) OGRDestroyPreparedGeometry(p.prepared);
    delete p.polygon;
  }
}

bool TaxonRange::contains(double lon, double lat) const {
  for (const Part& p : parts_)
    for (double x : {lon, lon + 360, lon - 360}) {  // a range drawn past ±180 (0..360 longitudes)
      if (x < p.west || x > p.east || lat < p.south || lat > p.north) continue;
      OGRPoint point(x, lat);
      if (OGRPreparedGeometryContains(p.prepared, OGRGeometry::ToHandle(&point))) return true;
    }
  return false;
}

double TaxonRange::distance_m(double lon, double lat) const {
  if (contains(lon, lat)) return 0;
  return edges_->nearest_angle(lon, lat) * kEarthRadiusM;
}

RangeLayer::RangeLayer(const RangeSource& source) : source_(source) {
  ensure_gdal_registered();
  VSIStatBufL st;
  if (VSIStatL(source.path.c_str(), &st) != 0)
    throw InputError(source.path, "no such file", "check the path given to --ranges");
  {
    const QuietGdalErrors quiet;  // the error below says what went wrong
    dataset_ = static_cast<GDALDataset*>(GDALOpenEx(source.path.c_str(), GDAL_OF_VECTOR | GDAL_OF_READONLY, nullptr, nullptr, nullptr));
  }
  if (!dataset_ || dataset_->GetLayerCount() < 1)
    throw InputError(source.path, "GDAL cannot read it as a vector layer of range polygons",
                     "give a GeoPackage, Shapefile or GeoJSON file of polygons (check it with ogrinfo)");
  layer_ = dataset_->GetLayer(0);
  OGRFeatureDefn* definition = layer_->GetLayerDefn();
  const int field = definition->GetFieldIndex(source.taxon_field.c_str());
  if (field < 0)
    throw InputError(source.path, "no taxon field '" + source.taxon_field + "' (fields found: " + field_names(definition) + ")",
                     "name the field with --range-taxon-field");
  if (!layer_->TestCapability(OLCRandomRead))
    throw InputError(source.path, "its format cannot read a feature by its ID, which the range check needs",
                     "convert it to a GeoPackage: ogr2ogr -f GPKG ranges.gpkg " + source.path);
  if (!source.filter.empty()) {
    CPLErrorReset();
    if (layer_->SetAttributeFilter(source.filter.c_str()) != OGRERR_NONE)
      throw InputError(source.path, "OGR rejects the filter '" + source.filter + "': " + CPLGetLastErrorMsg(),
                       "write --range-filter as an OGR SQL WHERE clause on the layer's fields (" +
                           field_names(definition) + "), e.g. \"season = 'resident'\"");
  }
  // CRS: reproject to WGS 84 longitude/latitude
  const OGRSpatialReference* srs = layer_->GetSpatialRef();
  const std::string crs = crs_text(srs);
  if (crs.empty()) {
    OGREnvelope extent;
    if (layer_->GetExtent(&extent, TRUE) == OGRERR_NONE &&
        (std::fabs(extent.MinX) > 180 || std::fabs(extent.MaxX) > 180 || std::fabs(extent.MinY) > 90 || std::fabs(extent.MaxY) > 90))
      throw InputError(source.path,
                       "has no CRS (a Shapefile without its .prj?) and coordinates up to " +
                           std::to_string(static_cast<long long>(std::max({std::fabs(extent.MinX), std::fabs(extent.MaxX),
                                                                           std::fabs(extent.MinY), std::fabs(extent.MaxY)}))) +
                           ", which cannot be degrees of longitude and latitude",
                       "give the file its CRS, e.g. ogr2ogr -a_srs EPSG:32633 ranges.gpkg " + source.path + ", or restore its .prj");
    notes_.push_back("--ranges " + source.path + ": the layer has no CRS, so its coordinates are read as WGS 84 "
                     "longitude/latitude");
  } else if (!is_wgs84_lon_lat(crs)) {
    to_wgs84_ = new_transformation(crs, wgs84_wkt());
    if (!to_wgs84_)
      throw InputError(source.path, "its CRS cannot be transformed to WGS 84 longitude/latitude",
                       "reproject it first, e.g. ogr2ogr -t_srs EPSG:4326 out.gpkg " + source.path);
    if (srs->IsProjected()) segment_ = kProjectedSegmentM / srs->GetLinearUnits();
  }
  // the index: feature IDs per taxon, read without geometries or other fields
  std::vector<const char*> ignored{"OGR_GEOMETRY", "OGR_STYLE"};
  for (int f = 0; f < definition->GetFieldCount(); ++f)
    if (f != field) ignored.push_back(definition->GetFieldDefn(f)->GetNameRef());
  ignored.push_back(nullptr);
  layer_->SetIgnoredFields(ignored.data());
  std::size_t unnamed = 0;
  layer_->ResetReading();
  for (auto& feature : *layer_) {
    const std::string name = normalise_taxon_name(feature->IsFieldSetAndNotNull(field) ? feature->GetFieldAsString(field) : "");
    if (name.empty()) ++unnamed;
    else features_[name].push_back(feature->GetFID());
  }
  layer_->SetIgnoredFields(nullptr);
  if (unnamed)
    notes_.push_back("--ranges " + source.path + ": " + std::to_string(unnamed) + " feature(s) have no " +
                     source.taxon_field + " and are not used");
}

RangeLayer::~RangeLayer() {
  GDALClose(dataset_);
}

std::vector<std::string> RangeLayer::taxa() const {
  std::vector<std::string> names;
  for (const auto& [name, ids] : features_) names.push_back(name);
  return names;
}

std::unique_ptr<TaxonRange> RangeLayer::load(const std::string& taxon) {
  const auto it = features_.find(taxon);
  if (it == features_.end()) return nullptr;
  std::unique_ptr<TaxonRange> range(new TaxonRange());
  std::vector<std::unique_ptr<OGRPolygon>> polygons;
  for (const std::int64_t id : it->second) {
    std::unique_ptr<OGRFeature> feature(layer_->GetFeature(id));
    OGRGeometry* g = feature ? feature->GetGeometryRef() : nullptr;
    std::vector<std::unique_ptr<OGRPolygon>> parts;
    if (!g || !polygons_of(*g, parts)) {
      ++range->skipped;
      continue;
    }
    for (auto& p : parts) {
      if (!p->IsValid()) ++range->invalid;  // in its own CRS, as drawn
      if (to_wgs84_) {
        if (segment_ > 0) p->segmentize(segment_);
        if (p->transform(to_wgs84_.get()) != OGRERR_NONE)
          throw InputError(source_.path, "feature " + std::to_string(id) + " (" + taxon + ") cannot be reprojected to WGS 84",
                           "check its coordinates and the layer's CRS");
      }
      polygons.push_back(std::move(p));
    }
  }
  if (polygons.empty()) return range;  // only skipped features: no edges, judged as having no range
  for (auto& p : polygons) {
    OGREnvelope e;
    p->getEnvelope(&e);
    for (const OGRLinearRing* ring : *p) {
      std::vector<LonLat> points;
      for (const OGRPoint& v : *ring) points.push_back({v.getX(), v.getY()});
      range->vertices_ += points.size();
      range->rings_.push_back(std::move(points));
    }
    TaxonRange::Part part;
    part.polygon = p.release();
    part.prepared = OGRCreatePreparedGeometry(OGRGeometry::ToHandle(part.polygon));
    part.west = e.MinX, part.east = e.MaxX, part.south = e.MinY, part.north = e.MaxY;
    range->parts_.push_back(part);
  }
  range->edges_ = std::make_unique<RangeEdges>(range->rings_);
  return range;
}

}  // namespace envsift
