#include "envsift/write/gis_writer.hpp"

#include <cmath>
#include <cstdio>

#include <gdal_priv.h>
#include <ogrsf_frmts.h>

#include "envsift/errors.hpp"
#include "envsift/geo/great_circle.hpp"
#include "envsift/write/atomic_file.hpp"
#include "gdal_init.hpp"

namespace envsift {
namespace {

// A disc as a polygon of 72 points at `radius_m` along great circles from its centre.
OGRPolygon disc_polygon(double lon, double lat, double radius_m) {
  OGRLinearRing ring;
  for (int k = 0; k <= 72; ++k) {
    const auto [x, y] = destination(lon, lat, (k % 72) * 5.0, radius_m);
    ring.addPoint(x, y);
  }
  OGRPolygon polygon;
  polygon.addRing(&ring);
  return polygon;
}

std::string extension_of(const std::string& path) {
  const auto dot = path.find_last_of('.');
  return dot == std::string::npos ? "" : path.substr(dot);
}

}  // namespace

std::string gis_path_complaint(const std::string& path) {
  const std::string ext = extension_of(path);
  if (ext == ".gpkg" || ext == ".geojson" || ext == ".json") return "";
  return "needs a file ending in .gpkg (GeoPackage) or .geojson, not '" + path + "'";
}

struct GisWriter::Impl {
  std::string path;
  std::unique_ptr<TemporaryPath> temp;
  std::vector<FieldKind> kinds;
  GDALDataset* ds = nullptr;
  OGRLayer* points = nullptr;
  OGRLayer* discs = nullptr;
  std::size_t pending = 0;
  bool transactions = false;  // GeoPackage: yes; GeoJSON: no

  void fail(const std::string& what) const { throw OutputError(path, what + " (" + CPLGetLastErrorMsg() + ")"); }
};

GisWriter::GisWriter(std::string path, const std::vector<std::string>& header, const std::vector<FieldKind>& kinds)
    : impl_(std::make_unique<Impl>()) {
  ensure_gdal_registered();
  Impl& m = *impl_;
  m.path = std::move(path);
  m.kinds = kinds;
  const std::string ext = extension_of(m.path);
  const std::string complaint = gis_path_complaint(m.path);
  if (!complaint.empty()) throw UsageError("--gis " + complaint);
  const bool geojson = ext != ".gpkg";
  m.temp = std::make_unique<TemporaryPath>(m.path, ext);
  GDALDriver* driver = GetGDALDriverManager()->GetDriverByName(geojson ? "GeoJSON" : "GPKG");
  m.ds = driver ? driver->Create(m.temp->temporary().c_str(), 0, 0, 0, GDT_Unknown, nullptr) : nullptr;
  if (!m.ds) m.fail("cannot create the GIS output");
  OGRSpatialReference wgs84;
  wgs84.SetWellKnownGeogCS("WGS84");
  wgs84.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  m.points = m.ds->CreateLayer("records", &wgs84, wkbPoint, nullptr);
  if (!geojson) m.discs = m.ds->CreateLayer("uncertainty_discs", &wgs84, wkbPolygon, nullptr);  // GeoJSON: one layer
  if (!m.points || (!geojson && !m.discs)) m.fail("cannot create the GIS layers");
  for (std::size_t i = 0; i < header.size(); ++i) {
    const OGRFieldType type = kinds[i] == FieldKind::real ? OFTReal : kinds[i] == FieldKind::integer ? OFTInteger64 : OFTString;
    OGRFieldDefn field(header[i].c_str(), type);
    if (m.points->CreateField(&field) != OGRERR_NONE) m.fail("cannot add the field '" + header[i] + "'");
  }
  if (m.discs) {
    OGRFieldDefn record("record", OFTInteger64), radius("radius_m", OFTReal);
    m.discs->CreateField(&record);
    m.discs->CreateField(&radius);
  }
  m.transactions = m.ds->StartTransaction() == OGRERR_NONE;
}

GisWriter::~GisWriter() {
  if (impl_->ds) GDALClose(impl_->ds);
}

void GisWriter::add(const std::vector<std::string>& row, double longitude, double latitude, double radius_m) {
  Impl& m = *impl_;
  OGRFeature feature(m.points->GetLayerDefn());
  for (std::size_t i = 0; i < row.size(); ++i) {
    const int f = static_cast<int>(i);
    if (row[i].empty()) {
      feature.SetFieldNull(f);
    } else if (m.kinds[i] == FieldKind::text) {
      feature.SetField(f, row[i].c_str());
    } else {
      try {
        if (m.kinds[i] == FieldKind::integer) feature.SetField(f, static_cast<GIntBig>(std::stoll(row[i])));
        else feature.SetField(f, std::stod(row[i]));
      } catch (const std::exception&) {
        feature.SetFieldNull(f);
      }
    }
  }
  const bool located = std::isfinite(longitude) && std::isfinite(latitude);
  if (located) feature.SetGeometry(std::make_unique<OGRPoint>(longitude, latitude).get());
  if (m.points->CreateFeature(&feature) != OGRERR_NONE) m.fail("cannot write a record");
  if (m.discs && located && radius_m > 0) {
    OGRFeature disc(m.discs->GetLayerDefn());
    disc.SetField(0, static_cast<GIntBig>(feature.GetFID()));
    disc.SetField(1, radius_m);
    OGRPolygon polygon = disc_polygon(longitude, latitude, radius_m);
    disc.SetGeometry(&polygon);
    if (m.discs->CreateFeature(&disc) != OGRERR_NONE) m.fail("cannot write a disc");
  }
  if (m.transactions && ++m.pending == 20000) {  // GeoPackage writes fast in transactions
    m.ds->CommitTransaction();
    m.ds->StartTransaction();
    m.pending = 0;
  }
}

void GisWriter::finish() {
  Impl& m = *impl_;
  if (!m.ds) return;
  if (m.transactions && m.ds->CommitTransaction() != OGRERR_NONE) m.fail("cannot finish the GIS output");
  GDALClose(m.ds);
  m.ds = nullptr;
}

void GisWriter::commit() {
  finish();
  impl_->temp->commit();
}

}  // namespace envsift
