// The landscape test: a record is suspicious when its environment is much more common in the
// landscape around the taxon than among the taxon's own records (see the .cpp for the model).
#pragma once
#include <cstddef>

#include "envsift/detect/detector.hpp"
#include "envsift/sample/landscape_sample.hpp"

namespace envsift {

// Its own settings in a run (TestSettings::own): flag when the record's environment is `ratio`
// times more common in the taxon's landscape than among its records; where the landscape is
// drawn (landscape_sample.hpp).
struct LandscapeSettings {
  double ratio = 5;
  LandscapeArea area = LandscapeArea::buffer;
  double spread = 1;         // buffer radius = this × the taxon's spread …
  double min_km = 20;        // … at least this
  std::size_t cells = 300;   // cells drawn per taxon
};

struct LandscapeTestOptions {
  double ratio_cutoff = 5;        // flag when availability / use exceeds this
  std::size_t min_records = 20;   // reference rows (places) needed
  std::size_t min_cells = 50;     // landscape cells with values needed
  std::size_t max_dimensions = 6; // principal components of the landscape used at most
  double ridge = 1;               // penalty on every coefficient but the intercept
  double curvature = 0.05;        // the response's curvature is at least this (whitened units)
  bool normal_scores = false;     // layers on their landscape normal scores, not standardised
  double max_place_share = 0.02;  // flag only when at most this share of places is as unsuited
};

class LandscapeTest : public Detector {
 public:
  explicit LandscapeTest(LandscapeTestOptions options = {}) : options_(options) {}
  static constexpr const char* kName = "landscape";
  std::string name() const override { return kName; }
  std::vector<std::string> extra_columns() const override { return {"area_share"}; }
  std::vector<Finding> judge(const TaxonValues& taxon) const override;
  bool uses_landscape() const override { return true; }

 private:
  LandscapeTestOptions options_;
};

}  // namespace envsift
