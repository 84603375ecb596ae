#include "envsift/geo/crs_transform.hpp"

#include <mutex>

#include <cpl_conv.h>

namespace envsift {
namespace {

std::mutex& crs_lock() {
  static std::mutex lock;
  return lock;
}

// Called under the lock.
bool read_crs(const std::string& text, OGRSpatialReference& srs) {
  if (text.empty()) return false;
  // WKT opens with a keyword and a bracket (PROJCRS[, GEOGCS[, BOUNDCRS[ ...)
  const auto bracket = text.find('[');
  const bool wkt = bracket != std::string::npos && bracket > 0 &&
                   text.find_first_not_of("ABCDEFGHIJKLMNOPQRSTUVWXYZ_0123456789") == bracket;
  const OGRErr err = wkt ? srs.importFromWkt(text.c_str()) : srs.SetFromUserInput(text.c_str());
  srs.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  return err == OGRERR_NONE;
}

}  // namespace

const std::string& wgs84_wkt() {
  static const std::string wkt = [] {
    OGRSpatialReference srs;
    srs.SetWellKnownGeogCS("WGS84");
    char* text = nullptr;
    srs.exportToWkt(&text, nullptr);
    std::string out = text ? text : "";
    CPLFree(text);
    return out;
  }();
  return wkt;
}

CrsTransformation new_transformation(const std::string& from, const std::string& to) {
  std::lock_guard<std::mutex> guard(crs_lock());
  OGRSpatialReference source, target;
  if (!read_crs(from, source) || !read_crs(to, target)) return nullptr;
  return CrsTransformation(OGRCreateCoordinateTransformation(&source, &target));
}

bool is_wgs84_lon_lat(const std::string& crs) {
  std::lock_guard<std::mutex> guard(crs_lock());
  OGRSpatialReference srs, wgs84;
  if (!read_crs(crs, srs)) return false;
  wgs84.SetWellKnownGeogCS("WGS84");
  wgs84.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  return srs.IsSame(&wgs84);
}

std::string crs_text(const OGRSpatialReference* srs) {
  if (!srs || srs->IsEmpty()) return "";
  std::lock_guard<std::mutex> guard(crs_lock());
  char* text = nullptr;
  srs->exportToWkt(&text, nullptr);
  std::string out = text ? text : "";
  CPLFree(text);
  return out;
}

}  // namespace envsift
