// Coordinate transformations between a layer's, a points file's or a range map's CRS and WGS 84
// longitude/latitude: the one place envsift makes them.
//
// Why one place: GDAL's OGRSpatialReference keeps lazily built PROJ objects inside, so two threads
// that create transformations from one shared spatial reference race on them (seen as "double
// free or corruption" with bound CRSs such as an R raster's WGS 84 with +towgs84, and with
// +ellps=intl projections; plain EPSG:4326 happens to take a path without the race). Here every
// transformation is built from text under one lock, from spatial references of its own, and is
// then used by the one thread that asked for it.
#pragma once
#include <memory>
#include <string>

#include <ogr_spatialref.h>

namespace envsift {

using CrsTransformation = std::unique_ptr<OGRCoordinateTransformation>;

// WGS 84 longitude/latitude (x = longitude), as WKT: the CRS every record is held in.
const std::string& wgs84_wkt();

// A new transformation from one CRS to another, each given as WKT or anything GDAL's
// SetFromUserInput reads ("EPSG:32633", a PROJ string); axes in the traditional GIS order
// (x = easting or longitude). Safe to call from any thread; the result must stay on the calling
// thread. Null when PROJ has no way between them or a CRS cannot be read.
CrsTransformation new_transformation(const std::string& from, const std::string& to);

// Whether a CRS (WKT or user input) is WGS 84 longitude/latitude itself (no transformation needed).
bool is_wgs84_lon_lat(const std::string& crs);

// The WKT of a spatial reference (empty for none), read under the same lock.
std::string crs_text(const OGRSpatialReference* srs);

}  // namespace envsift
