// Points in projected coordinates (--points-crs). Reference: GDAL's gdaltransform (gdal-bin)
// transforms the demo points to UTM zone 31N (EPSG:32631, the demo island's zone) and back; the
// points written in UTM must sample what the same points in WGS 84 sample, and envsift's
// reprojection (its GeoJSON geometry) must equal gdaltransform's inverse.
#include <cmath>
#include <sstream>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> lines;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  return lines;
}

TEST(ProjectedPoints, UtmPointsSampleAsTheirWgs84SelvesAndReprojectAsGdaltransform) {
  const auto dir = temp_dir("projected-points");
  const Table demo = read_csv(source_path("demo-points/occurrences.csv"));
  const std::size_t lon = demo.column("decimalLongitude"), lat = demo.column("decimalLatitude");
  // the demo rows with plain decimal coordinates (the others are there to test the reader)
  std::vector<const std::vector<std::string>*> rows;
  std::string lonlat;
  for (const auto& r : demo.rows) {
    char* end = nullptr;
    std::strtod(r[lon].c_str(), &end);
    if (r[lon].empty() || *end || r[lat].empty() || r[lat].find_first_not_of("-0123456789.") != std::string::npos) continue;
    if (std::fabs(std::stod(r[lat])) > 90) continue;
    rows.push_back(&r);
    lonlat += r[lon] + " " + r[lat] + "\n";
  }
  ASSERT_GT(rows.size(), 900u);
  write_file(dir + "/lonlat.txt", lonlat);
  const auto utm = lines_of(run("gdaltransform -s_srs EPSG:4326 -t_srs EPSG:32631 -output_xy < " + dir + "/lonlat.txt").output);
  ASSERT_EQ(utm.size(), rows.size());
  std::string wgs = "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n", projected = "occurrenceID,scientificName,x,y\n";
  std::string utm_text;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const auto& r = *rows[i];
    std::istringstream xy(utm[i]);
    std::string x, y;
    xy >> x >> y;
    wgs += r[0] + "," + r[1] + "," + r[lon] + "," + r[lat] + "\n";
    projected += r[0] + "," + r[1] + "," + x + "," + y + "\n";
    utm_text += x + " " + y + "\n";
  }
  write_file(dir + "/wgs.csv", wgs);
  write_file(dir + "/utm.csv", projected);
  write_file(dir + "/utm.txt", utm_text);

  const std::string sample = envsift_binary() + " sample -q --no-discs" + demo_layers();
  ASSERT_EQ(run(sample + " --points " + dir + "/wgs.csv --out " + dir + "/wgs-out.csv").exit_code, 0);
  auto r = run(sample + " --points " + dir + "/utm.csv --longitude-column x --latitude-column y --points-crs EPSG:32631 --out " +
               dir + "/utm-out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table a = read_csv(dir + "/wgs-out.csv"), b = read_csv(dir + "/utm-out.csv");
  ASSERT_EQ(a.rows.size(), b.rows.size());
  std::size_t equal = 0, on_edges = 0;
  for (std::size_t i = 0; i < a.rows.size(); ++i) {
    const bool same = std::equal(a.rows[i].begin() + 4, a.rows[i].end(), b.rows[i].begin() + 4);
    equal += same;
    if (!same) {
      // a point on an exact cell edge (coordinates rounded to the 0.005° cell) may come back from
      // UTM a hair to either side of it: gdaltransform prints 15 significant digits
      const double x = std::stod(a.rows[i][2]) / 0.005, y = std::stod(a.rows[i][3]) / 0.005;
      const bool edge = std::fabs(x - std::round(x)) < 1e-6 || std::fabs(y - std::round(y)) < 1e-6;
      EXPECT_TRUE(edge) << a.rows[i][0] << " samples differently in UTM and off a cell edge";
      on_edges += edge;
    }
  }
  EXPECT_GT(equal, a.rows.size() - 10) << on_edges << " on edges";

  // envsift's lon/lat (the GeoJSON geometry) = gdaltransform's inverse of the UTM coordinates
  r = run(envsift_binary() + " screen -q --no-discs" + demo_layers() + " --points " + dir +
          "/utm.csv --longitude-column x --latitude-column y --points-crs EPSG:32631 --gis " + dir + "/p.geojson --out " + dir +
          "/s.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const auto back = lines_of(run("gdaltransform -s_srs EPSG:32631 -t_srs EPSG:4326 -output_xy < " + dir + "/utm.txt").output);
  const auto features = nlohmann::json::parse(read_file(dir + "/p.geojson"))["features"];
  ASSERT_EQ(features.size(), back.size());
  for (std::size_t i = 0; i < back.size(); ++i) {
    std::istringstream xy(back[i]);
    double x, y;
    xy >> x >> y;
    const auto& c = features[i]["geometry"]["coordinates"];
    EXPECT_NEAR(c[0].get<double>(), x, 1e-9) << i;
    EXPECT_NEAR(c[1].get<double>(), y, 1e-9) << i;
  }
}

TEST(ProjectedPoints, MetreLikeCoordinatesWithoutACrsGetAHint) {
  const auto dir = temp_dir("projected-hint");
  write_file(dir + "/utm.csv", "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n"
                               "U1,Oxmontia nivicola,219326.9,74215.9\nU2,Oxmontia nivicola,212911.8,46225.5\n");
  auto r = run(envsift_binary() + " sample -q" + demo_layers() + " --points " + dir + "/utm.csv --out " + dir + "/o.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("look like metres"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("--points-crs"), std::string::npos) << r.output;
  r = run(envsift_binary() + " sample -q" + demo_layers() + " --points " + dir + "/utm.csv --points-crs EPSG:99999999 --out " +
          dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("--points-crs EPSG:99999999 is not a CRS"), std::string::npos) << r.output;
}

}  // namespace
}  // namespace envsift
