// Taxa's published ranges (`screen --ranges FILE`): any OGR polygon layer — GeoPackage,
// Shapefile, GeoJSON, ... in any CRS — with a field naming the taxon. A taxon may have many
// features (parts of its range, seasonal parts); an OGR SQL filter can keep only some of them.
// Opening reads only the taxon field, to index the features by taxon; a taxon's polygons are read
// (and reprojected to WGS 84 longitude/latitude) when it is judged, one taxon at a time, so memory
// holds one taxon's range per thread, not the whole layer.
#pragma once
#include <cstddef>
#include <cstdint>
#include <map>
#include <memory>
#include <string>
#include <vector>

#include "envsift/geo/crs_transform.hpp"
#include "envsift/geo/range_distance.hpp"

class GDALDataset;
class OGRLayer;
class OGRPolygon;
class OGRCoordinateTransformation;
typedef struct _OGRPreparedGeometry OGRPreparedGeometry;

namespace envsift {

struct RangeSource {
  std::string path;
  std::string taxon_field = "scientificName";
  std::string filter;  // an OGR SQL WHERE clause, e.g. "season = 'resident'"; empty: every feature
};

// One taxon's range: containment by GEOS (through GDAL, a prepared geometry) in
// longitude/latitude, distance to its edges on the sphere (range_distance.hpp).
class TaxonRange {
 public:
  TaxonRange(const TaxonRange&) = delete;
  TaxonRange& operator=(const TaxonRange&) = delete;
  ~TaxonRange();
  // Great-circle metres from the point to the range: 0 inside (or on an edge).
  double distance_m(double lon, double lat) const;
  std::size_t vertices() const { return vertices_; }
  // Its rings in longitude/latitude, for drawing (outer rings and holes alike).
  const std::vector<std::vector<LonLat>>& rings() const { return rings_; }
  std::size_t skipped = 0;  // its features without a polygon (a point, a line, no geometry)
  std::size_t invalid = 0;  // its polygons that are not valid (self-intersecting rings; GEOS IsValid): used, and warned of

 private:
  friend class RangeLayer;
  TaxonRange() = default;
  bool contains(double lon, double lat) const;
  struct Part {  // one polygon of one feature (parts may overlap: no union is needed)
    OGRPolygon* polygon = nullptr;
    OGRPreparedGeometry* prepared = nullptr;
    double west = 0, east = 0, south = 0, north = 0;
  };
  std::vector<Part> parts_;
  std::vector<std::vector<LonLat>> rings_;
  std::unique_ptr<RangeEdges> edges_;
  std::size_t vertices_ = 0;
};

class RangeLayer {
 public:
  // Opens the layer and indexes its features by taxon name (NFC, whitespace folded, as the
  // points' names are). Throws InputError (file, what is wrong, what to do) for a file GDAL cannot
  // open as vectors, a missing taxon field (the fields found are listed) or a filter OGR rejects.
  explicit RangeLayer(const RangeSource& source);
  ~RangeLayer();
  RangeLayer(const RangeLayer&) = delete;
  RangeLayer& operator=(const RangeLayer&) = delete;

  // The taxon names with at least one feature, in order.
  std::vector<std::string> taxa() const;
  bool has(const std::string& taxon) const { return features_.count(taxon) > 0; }
  // The taxon's range, or nullptr when it has none. Not thread-safe: one RangeLayer per thread.
  std::unique_ptr<TaxonRange> load(const std::string& taxon);
  // For a warning: features without a taxon name, a layer without a CRS (read as WGS 84).
  const std::vector<std::string>& notes() const { return notes_; }
  const std::string& path() const { return source_.path; }

 private:
  RangeSource source_;
  GDALDataset* dataset_ = nullptr;
  OGRLayer* layer_ = nullptr;
  CrsTransformation to_wgs84_;  // null when the layer is WGS 84 already
  double segment_ = 0;  // a projected layer's edges are densified to this length (its units) first
  std::map<std::string, std::vector<std::int64_t>> features_;  // taxon → feature IDs
  std::vector<std::string> notes_;
};

}  // namespace envsift
