#include "envsift/write/report/shaded_relief.hpp"

#include <atomic>
#include <memory>
#include <vector>

#include <cpl_conv.h>
#include <cpl_vsi.h>
#include <gdal_priv.h>
#include <gdal_utils.h>

#include "../../gdal_init.hpp"

namespace envsift {
namespace {

struct CloseDataset {
  void operator()(GDALDatasetH d) const {
    if (d) GDALClose(d);
  }
};
using Dataset = std::unique_ptr<std::remove_pointer_t<GDALDatasetH>, CloseDataset>;

// argv-style option lists for GDAL's utility functions
class Arguments {
 public:
  Arguments(std::initializer_list<std::string> items) : items_(items) {
    for (auto& s : items_) pointers_.push_back(s.data());
    pointers_.push_back(nullptr);
  }
  char** get() { return pointers_.data(); }

 private:
  std::vector<std::string> items_;
  std::vector<char*> pointers_;
};

std::string text(double v) {
  char buf[40];
  CPLsnprintf(buf, sizeof buf, "%.12g", v);
  return buf;
}

}  // namespace

std::string shaded_relief_png(const std::string& dem, int band, const MapBox& box) {
  ensure_gdal_registered();
  QuietGdalErrors quiet;  // a map without relief is no error
  Dataset source(GDALOpen(dem.c_str(), GA_ReadOnly));
  if (!source || box.width < 2 || box.height < 2) return "";
  Arguments select{"-of", "VRT", "-b", std::to_string(band)};
  auto* select_options = GDALTranslateOptionsNew(select.get(), nullptr);
  static std::atomic<unsigned> counter{0};
  const std::string stem = "/vsimem/envsift_relief_" + std::to_string(counter++);
  Dataset one_band(GDALTranslate((stem + ".vrt").c_str(), source.get(), select_options, nullptr));
  GDALTranslateOptionsFree(select_options);
  if (!one_band) return "";

  // the DEM on the map's grid: longitude/latitude, one cell per pixel
  Arguments warp{"-of", "MEM", "-t_srs", "EPSG:4326", "-te", text(box.west), text(box.south), text(box.east),
                 text(box.north), "-ts", std::to_string(box.width), std::to_string(box.height), "-r", "bilinear"};
  auto* warp_options = GDALWarpAppOptionsNew(warp.get(), nullptr);
  GDALDatasetH inputs[] = {one_band.get()};
  Dataset warped(GDALWarp("", nullptr, 1, inputs, warp_options, nullptr));
  GDALWarpAppOptionsFree(warp_options);
  if (!warped) return "";

  // degrees across, metres up: -s 111120 is gdaldem's documented ratio for geographic grids
  Arguments shade{"-of", "MEM", "-s", "111120", "-compute_edges"};
  auto* shade_options = GDALDEMProcessingOptionsNew(shade.get(), nullptr);
  Dataset shaded(GDALDEMProcessing("", warped.get(), "hillshade", nullptr, shade_options, nullptr));
  GDALDEMProcessingOptionsFree(shade_options);
  if (!shaded) return "";

  Arguments png{"-of", "PNG"};
  auto* png_options = GDALTranslateOptionsNew(png.get(), nullptr);
  const std::string png_path = stem + ".png";
  Dataset written(GDALTranslate(png_path.c_str(), shaded.get(), png_options, nullptr));
  GDALTranslateOptionsFree(png_options);
  written.reset();
  std::string bytes;
  vsi_l_offset length = 0;
  if (GByte* data = VSIGetMemFileBuffer(png_path.c_str(), &length, FALSE))
    bytes.assign(reinterpret_cast<const char*>(data), static_cast<std::size_t>(length));
  one_band.reset();
  for (const char* suffix : {".png", ".png.aux.xml", ".vrt"}) VSIUnlink((stem + suffix).c_str());
  return bytes;
}

}  // namespace envsift
