// Circular layers are refused with a usage error (exit 2) that says what to do — envsift's own
// contract (circular_layers.hpp); that aspect is circular is a fact of the trade.
#include <gtest/gtest.h>

#include "envsift/detect/circular_layers.hpp"
#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(CircularLayers, NamesThatSayDirection) {
  for (const char* name : {"aspect", "Slope_Aspect", "wind_direction", "AZIMUTH", "bearing_deg"}) EXPECT_TRUE(looks_circular(name)) << name;
  for (const char* name : {"dem", "slope", "bio12", "dry_months"}) EXPECT_FALSE(looks_circular(name)) << name;
}

TEST(CircularLayers, ScreenAndEvaluateRefuseThem) {
  const auto dir = temp_dir("circular");
  const std::string layer = " --layers aspect=" + source_path("demo-rasters/dem.tif");
  auto r = run(envsift_binary() + " screen --points " + source_path("demo-points/occurrences.csv") + layer + " --out " + dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.output.find("layer 'aspect' looks circular"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("sine and cosine"), std::string::npos);
  r = run(envsift_binary() + " evaluate" + layer + " --out " + dir + "/e.csv");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  // renamed, the same raster is accepted
  r = run(envsift_binary() + " screen --quiet --points " + source_path("demo-points/occurrences.csv") + " --layers height=" +
          source_path("demo-rasters/dem.tif") + " --out " + dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 0) << r.output;
}

}  // namespace
}  // namespace envsift
