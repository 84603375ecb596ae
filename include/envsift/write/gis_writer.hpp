// GIS output (`--gis FILE.gpkg` or `FILE.geojson`): every record as a point with every original
// and computed attribute, for a desktop GIS beside the reviewer's own layers. A GeoPackage also
// gets a polygon layer of the uncertainty discs. Written to a temporary name and renamed when
// complete, like every output.
#pragma once
#include <memory>
#include <string>
#include <vector>

namespace envsift {

enum class FieldKind : char { text = 's', real = 'r', integer = 'i' };

// Why a path cannot be a GIS output ("" when it can): GeoPackage (.gpkg) or GeoJSON (.geojson).
std::string gis_path_complaint(const std::string& path);

class GisWriter {
 public:
  // `header`: the attribute names (the CSV output's columns); `kinds`: the type of each.
  GisWriter(std::string path, const std::vector<std::string>& header, const std::vector<FieldKind>& kinds);
  ~GisWriter();
  GisWriter(const GisWriter&) = delete;
  GisWriter& operator=(const GisWriter&) = delete;

  // One record: its attributes; its point (NaN: no geometry, the record is still written); its
  // uncertainty disc radius in metres (0: none).
  void add(const std::vector<std::string>& row, double longitude, double latitude, double radius_m);
  void finish();  // the file is complete under its temporary name
  void commit();  // finish() if not done, then rename into place

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace envsift
