// Shaded relief for the report's maps: the DEM warped to a longitude/latitude box and hill-shaded
// by GDAL (the same algorithm as `gdaldem hillshade`), returned as a grey-scale PNG.
#pragma once
#include <string>

#include "envsift/write/report/taxon_plots.hpp"

namespace envsift {

// `dem`: a raster path (band 1 holds elevation in metres). Returns the PNG's bytes, or "" when
// the DEM does not cover the box or cannot be read (the map is then drawn without relief).
std::string shaded_relief_png(const std::string& dem, int band, const MapBox& box);

}  // namespace envsift
