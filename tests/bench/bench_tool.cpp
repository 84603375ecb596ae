// envsift_bench: synthetic workloads and timings for scripts/bench*. Not a test: numbers from
// here go to the performance tables in docs/big-runs.md.
//
//   envsift_bench layers DIR COUNT WIDTH HEIGHT [W S E N]  float32 GeoTIFFs, tiled, DEFLATE (default: the globe)
//   envsift_bench points FILE N TAXA SEED [W S E N]        clustered occurrences in Darwin Core columns
//   envsift_bench ranges FILE TAXA SEED VERTICES BIG BIG_VERTICES [W S E N]
//                                                   a GeoPackage of the range polygons of those taxa
//   envsift_bench discs LAYER POINTS N RADIUS_M...  seconds per record to sample discs of each radius
//   envsift_bench terrain DIR                       a second invented terrain for `envsift evaluate`
//                                                   (scripts/evaluate-defaults): elevation, temperature,
//                                                   rainfall (skewed) and slope (skewed, bounded at 0)
//   envsift_bench floor POINTS LAYER...             the block-read floor: plain GDAL reading and
//                                                   decompressing every block the points touch
//                                                   (geographic layers), in parallel like envsift
#include <chrono>
#include <cmath>
#include <cstdio>
#include <algorithm>
#include <cstdint>
#include <cstdlib>
#include <fstream>
#include <random>
#include <string>
#include <vector>

#include <gdal_priv.h>
#include <ogr_spatialref.h>
#include <ogrsf_frmts.h>

#include "envsift/sample/raster_stack.hpp"

namespace {

[[noreturn]] void fail(const std::string& message) {
  std::fprintf(stderr, "envsift_bench: %s\n", message.c_str());
  std::exit(2);
}

// Smooth fields plus hashed noise, so that compression and decoding cost what real climate
// layers cost (a constant raster would compress to nothing).
struct Extent {
  double west = -180, south = -90, east = 180, north = 90;
};

Extent extent_from(int argc, char** argv, int first) {
  Extent e;
  if (argc >= first + 4)
    e = {std::atof(argv[first]), std::atof(argv[first + 1]), std::atof(argv[first + 2]), std::atof(argv[first + 3])};
  return e;
}

void make_layers(const std::string& dir, int count, int width, int height, const Extent& e) {
  GDALAllRegister();
  OGRSpatialReference srs;
  srs.importFromEPSG(4326);
  char** options = nullptr;
  for (const char* o : {"TILED=YES", "BLOCKXSIZE=256", "BLOCKYSIZE=256", "COMPRESS=DEFLATE", "PREDICTOR=3"})
    options = CSLAddString(options, o);
  std::vector<float> row(static_cast<std::size_t>(width));
  for (int k = 0; k < count; ++k) {
    const std::string path = dir + "/layer" + std::to_string(k + 1) + ".tif";
    GDALDataset* ds = GetGDALDriverManager()->GetDriverByName("GTiff")->Create(path.c_str(), width, height, 1,
                                                                                GDT_Float32, options);
    if (!ds) fail("cannot create " + path + ": give a directory that exists and is writable");
    const double dx = (e.east - e.west) / width, dy = (e.north - e.south) / height;
    double gt[6] = {e.west, dx, 0, e.north, 0, -dy};
    ds->SetGeoTransform(gt);
    ds->SetSpatialRef(&srs);
    GDALRasterBand* band = ds->GetRasterBand(1);
    for (int r = 0; r < height; ++r) {
      const double lat = e.north - (r + 0.5) * dy;
      for (int c = 0; c < width; ++c) {
        const double lon = e.west + (c + 0.5) * dx;
        std::uint32_t h = static_cast<std::uint32_t>(c * 73856093u) ^ static_cast<std::uint32_t>(r * 19349663u) ^
                          static_cast<std::uint32_t>(k * 83492791u);
        h ^= h >> 13, h *= 0x5bd1e995u, h ^= h >> 15;
        row[static_cast<std::size_t>(c)] = static_cast<float>(
            100 * std::sin(lat * 0.05 * (k + 1)) + 50 * std::cos(lon * 0.03 * (k + 2)) + (h % 1000) / 100.0);
      }
      if (band->RasterIO(GF_Write, 0, r, width, 1, row.data(), width, 1, GDT_Float32, 0, 0) != CE_None) std::exit(1);
    }
    GDALClose(ds);
  }
  CSLDestroy(options);
}

// Taxa with clustered ranges: each taxon has a few centres; records scatter around them.
void make_points(const std::string& file, long n, int taxa, unsigned seed, const Extent& e) {
  std::mt19937_64 rng(seed);
  const double mx = (e.east - e.west) * 0.03, my = (e.north - e.south) * 0.03;  // keep centres off the edges
  std::uniform_real_distribution<double> lon(e.west + mx, e.east - mx), lat(std::max(e.south + my, -60.0),
                                                                              std::min(e.north - my, 70.0)),
      unit(0, 1);
  std::normal_distribution<double> spread(0, 1);
  std::vector<std::vector<std::pair<double, double>>> centres(static_cast<std::size_t>(taxa));
  for (auto& c : centres)
    for (int k = 0; k < 3; ++k) c.emplace_back(lon(rng), lat(rng));
  std::ofstream out(file);
  out << "occurrenceID,scientificName,decimalLongitude,decimalLatitude,coordinateUncertaintyInMeters\n";
  out.precision(7);
  for (long i = 0; i < n; ++i) {
    // taxon sizes skewed as in real data: a few common taxa, many rare ones
    const int t = static_cast<int>(std::pow(unit(rng), 2.0) * taxa);
    const auto& c = centres[static_cast<std::size_t>(t)][static_cast<std::size_t>(i % 3)];
    out << "B" << i << ",Taxon " << t << "," << std::clamp(c.first + mx * spread(rng), e.west, e.east) << ","
        << std::clamp(c.second + my * spread(rng), e.south, e.north) << ",1000\n";
  }
}

// Range polygons for the taxa of make_points (same seed, same extent: the same centres): per
// taxon one feature of three parts, a star-shaped wiggly outline around each centre, with
// `vertices` vertices per part, and `big_vertices` for the first `big` taxa (the common ones).
void make_ranges(const std::string& file, int taxa, unsigned seed, int vertices, int big, int big_vertices, const Extent& e) {
  std::mt19937_64 rng(seed);
  const double mx = (e.east - e.west) * 0.03, my = (e.north - e.south) * 0.03;
  std::uniform_real_distribution<double> lon(e.west + mx, e.east - mx), lat(std::max(e.south + my, -60.0),
                                                                              std::min(e.north - my, 70.0));
  std::vector<std::vector<std::pair<double, double>>> centres(static_cast<std::size_t>(taxa));
  for (auto& c : centres)
    for (int k = 0; k < 3; ++k) c.emplace_back(lon(rng), lat(rng));
  GDALAllRegister();
  GDALDriver* driver = GetGDALDriverManager()->GetDriverByName("GPKG");
  GDALDataset* ds = driver->Create(file.c_str(), 0, 0, 0, GDT_Unknown, nullptr);
  OGRSpatialReference wgs84;
  wgs84.SetWellKnownGeogCS("WGS84");
  OGRLayer* layer = ds->CreateLayer("ranges", &wgs84, wkbMultiPolygon, nullptr);
  OGRFieldDefn name("scientificName", OFTString);
  layer->CreateField(&name);
  if (layer->StartTransaction() != OGRERR_NONE) fail("cannot write " + file);
  for (int t = 0; t < taxa; ++t) {
    const int n = t < big ? big_vertices : vertices;
    OGRMultiPolygon parts;
    for (const auto& [cx, cy] : centres[static_cast<std::size_t>(t)]) {
      OGRLinearRing ring;
      for (int k = 0; k <= n; ++k) {
        const double a = 2 * M_PI * (k % n) / n, r = 2.5 * (1 + 0.3 * std::sin(7 * a) + 0.05 * std::sin(97 * a));
        ring.addPoint(std::clamp(cx + r * mx * std::cos(a), -180.0, 180.0), std::clamp(cy + r * my * std::sin(a), -90.0, 90.0));
      }
      OGRPolygon polygon;
      polygon.addRing(&ring);
      parts.addGeometry(&polygon);
    }
    OGRFeature feature(layer->GetLayerDefn());
    feature.SetField("scientificName", ("Taxon " + std::to_string(t)).c_str());
    feature.SetGeometry(&parts);
    if (layer->CreateFeature(&feature) != OGRERR_NONE) fail("cannot write " + file);
  }
  if (layer->CommitTransaction() != OGRERR_NONE) fail("cannot write " + file);
  GDALClose(ds);
}

double seconds_since(std::chrono::steady_clock::time_point t) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t).count();
}

void time_discs(const std::string& layer, const std::string& points, long n, const std::vector<double>& radii) {
  std::ifstream in(points);
  std::string line;
  std::getline(in, line);
  std::vector<double> lon, lat;
  while (static_cast<long>(lon.size()) < n && std::getline(in, line)) {
    std::size_t a = line.find(','), b = line.find(',', a + 1), c = line.find(',', b + 1), d = line.find(',', c + 1);
    lon.push_back(std::stod(line.substr(b + 1, c - b - 1)));
    lat.push_back(std::stod(line.substr(c + 1, d - c - 1)));
  }
  std::printf("radius_m,records,seconds,microseconds_per_record,blocks_read\n");
  for (double r : radii) {
    envsift::RasterStack stack(envsift::expand_layer_arguments({layer}));
    const auto start = std::chrono::steady_clock::now();
    stack.sample_discs(lon, lat, std::vector<double>(lon.size(), r));
    const double s = seconds_since(start);
    std::printf("%.0f,%zu,%.3f,%.1f,%zu\n", r, lon.size(), s, 1e6 * s / static_cast<double>(lon.size()),
                stack.cache().loads());
  }
}

std::vector<std::pair<double, double>> read_lon_lat(const std::string& points) {
  std::ifstream in(points);
  std::string line;
  std::getline(in, line);
  std::vector<std::pair<double, double>> out;
  while (std::getline(in, line)) {
    std::size_t a = line.find(','), b = line.find(',', a + 1), c = line.find(',', b + 1), d = line.find(',', c + 1);
    out.emplace_back(std::stod(line.substr(b + 1, c - b - 1)), std::stod(line.substr(c + 1, d - c - 1)));
  }
  return out;
}

void block_read_floor(const std::string& points, const std::vector<std::string>& layers) {
  GDALAllRegister();
  const auto lonlat = read_lon_lat(points);
  std::size_t blocks_total = 0;
  const auto start = std::chrono::steady_clock::now();
  for (const auto& path : layers) {
    GDALDataset* ds = GDALDataset::Open(path.c_str(), GDAL_OF_RASTER | GDAL_OF_READONLY);
    double gt[6];
    ds->GetGeoTransform(gt);
    int bw, bh;
    ds->GetRasterBand(1)->GetBlockSize(&bw, &bh);
    const int w = ds->GetRasterXSize(), h = ds->GetRasterYSize();
    std::vector<char> touched(static_cast<std::size_t>(((w + bw - 1) / bw) * ((h + bh - 1) / bh)), 0);
    const int across = (w + bw - 1) / bw;
    for (const auto& [lon, lat] : lonlat) {
      const double px = (lon - gt[0]) / gt[1], py = (lat - gt[3]) / gt[5];
      if (px >= 0 && px < w && py >= 0 && py < h)
        touched[static_cast<std::size_t>(static_cast<int>(py) / bh * across + static_cast<int>(px) / bw)] = 1;
    }
    GDALClose(ds);
    std::vector<int> list;
    for (std::size_t k = 0; k < touched.size(); ++k)
      if (touched[k]) list.push_back(static_cast<int>(k));
    blocks_total += list.size();
#pragma omp parallel
    {
      GDALDataset* mine = GDALDataset::Open(path.c_str(), GDAL_OF_RASTER | GDAL_OF_READONLY);
      std::vector<float> buffer(static_cast<std::size_t>(bw) * static_cast<std::size_t>(bh));
#pragma omp for schedule(dynamic, 1)
      for (std::size_t k = 0; k < list.size(); ++k)
        if (mine->GetRasterBand(1)->ReadBlock(list[k] % across, list[k] / across, buffer.data()) != CE_None) std::exit(1);
      GDALClose(mine);
    }
  }
  const double s = seconds_since(start);
  std::printf("block_read_floor_seconds,%.3f\nblocks_read,%zu\n", s, blocks_total);
}


// Value noise: hashed lattice values, smoothstep-interpolated; octaves summed (fractal relief).
double lattice(int x, int y, int octave) {
  std::uint32_t h = static_cast<std::uint32_t>(x) * 73856093u ^ static_cast<std::uint32_t>(y) * 19349663u ^
                    static_cast<std::uint32_t>(octave) * 83492791u;
  h ^= h >> 13, h *= 0x5bd1e995u, h ^= h >> 15;
  return (h % 10007) / 10006.0;
}
double value_noise(double x, double y, int octave) {
  const int x0 = static_cast<int>(std::floor(x)), y0 = static_cast<int>(std::floor(y));
  auto smooth = [](double t) { return t * t * (3 - 2 * t); };
  const double fx = smooth(x - x0), fy = smooth(y - y0);
  const double a = lattice(x0, y0, octave) + fx * (lattice(x0 + 1, y0, octave) - lattice(x0, y0, octave));
  const double b = lattice(x0, y0 + 1, octave) + fx * (lattice(x0 + 1, y0 + 1, octave) - lattice(x0, y0 + 1, octave));
  return a + fy * (b - a);
}

// The invented "Vennsward uplands": 480 x 480 cells of 0.005 degrees, four Float32 layers.
void make_terrain(const std::string& dir) {
  GDALAllRegister();
  const int n = 480;
  const double west = 10, north = 3, cell = 0.005;
  std::vector<float> elevation(n * n), temperature(n * n), rainfall(n * n), slope(n * n);
  for (int r = 0; r < n; ++r)
    for (int c = 0; c < n; ++c) {
      double e = 0, amplitude = 1;
      for (int o = 0; o < 6; ++o, amplitude *= 0.5) e += amplitude * value_noise(c / (96.0 * amplitude), r / (96.0 * amplitude), o);
      elevation[r * n + c] = static_cast<float>(std::max(0.0, 2600 * (e - 0.45)));
    }
  for (int r = 0; r < n; ++r)
    for (int c = 0; c < n; ++c) {
      const int i = r * n + c;
      const double e = elevation[i];
      temperature[i] = static_cast<float>(27 - 0.0062 * e + 1.5 * (value_noise(c / 40.0, r / 40.0, 11) - 0.5));
      rainfall[i] = static_cast<float>(std::exp(5.8 + 0.0009 * e + 0.8 * value_noise(c / 60.0, r / 60.0, 12)));
      const double dx = (elevation[r * n + std::min(c + 1, n - 1)] - elevation[r * n + std::max(c - 1, 0)]) / (2 * 555.0);
      const double dy = (elevation[std::min(r + 1, n - 1) * n + c] - elevation[std::max(r - 1, 0) * n + c]) / (2 * 555.0);
      slope[i] = static_cast<float>(std::atan(std::hypot(dx, dy)) * 180 / M_PI);
    }
  OGRSpatialReference srs;
  srs.importFromEPSG(4326);
  const std::pair<const char*, std::vector<float>*> layers[] = {
      {"elevation", &elevation}, {"temperature", &temperature}, {"rainfall", &rainfall}, {"slope", &slope}};
  for (const auto& [name, values] : layers) {
    const std::string path = dir + "/" + name + ".tif";
    GDALDataset* ds = GetGDALDriverManager()->GetDriverByName("GTiff")->Create(path.c_str(), n, n, 1, GDT_Float32, nullptr);
    if (!ds) fail("cannot create " + path + ": give a directory that exists and is writable");
    double gt[6] = {west, cell, 0, north, 0, -cell};
    ds->SetGeoTransform(gt);
    ds->SetSpatialRef(&srs);
    if (ds->GetRasterBand(1)->RasterIO(GF_Write, 0, 0, n, n, values->data(), n, n, GDT_Float32, 0, 0) != CE_None) std::exit(1);
    GDALClose(ds);
  }
}

}  // namespace

int main(int argc, char** argv) {
  const std::string what = argc > 1 ? argv[1] : "";
  if (what == "layers" && argc >= 6)
    make_layers(argv[2], std::atoi(argv[3]), std::atoi(argv[4]), std::atoi(argv[5]), extent_from(argc, argv, 6));
  else if (what == "terrain" && argc >= 3)
    make_terrain(argv[2]);
  else if (what == "ranges" && argc >= 8)
    make_ranges(argv[2], std::atoi(argv[3]), static_cast<unsigned>(std::atoi(argv[4])), std::atoi(argv[5]), std::atoi(argv[6]),
                std::atoi(argv[7]), extent_from(argc, argv, 8));
  else if (what == "points" && argc >= 6)
    make_points(argv[2], std::atol(argv[3]), std::atoi(argv[4]), static_cast<unsigned>(std::atoi(argv[5])),
                extent_from(argc, argv, 6));
  else if (what == "discs" && argc >= 6) {
    std::vector<double> radii;
    for (int i = 5; i < argc; ++i) radii.push_back(std::atof(argv[i]));
    time_discs(argv[2], argv[3], std::atol(argv[4]), radii);
  } else if (what == "floor" && argc >= 4) {
    block_read_floor(argv[2], std::vector<std::string>(argv + 3, argv + argc));
  } else {
    std::fprintf(stderr, "usage: see the comment at the top of tests/bench/bench_tool.cpp\n");
    return 2;
  }
  return 0;
}
