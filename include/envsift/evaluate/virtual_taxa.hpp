// Virtual taxa for `envsift evaluate`: taxa whose true environmental response is known, built on
// the user's own rasters, after the virtual-species approach of Hirzel, Helfer & Metral (2001).
// Each taxon's suitability at a cell with layer values x is
//     s(x) = Π_l exp(−(x_l − μ_l)² / (2 σ_l²))
// (a Gaussian response to every layer, peak 1), with the optimum μ = the values of one random
// cell of the study area (so the optimum exists there) and σ_l = w · SD_l of the study area,
// w uniform in [width_low, width_high], but never below the layer's resolution (no taxon can
// tell 3 dry months from 3.2 on a layer of whole months). Records are drawn from the study area's cells with
// probability proportional to s (with replacement, as repeated collecting at a good site is).
// A taxon can also have two populations: two optima, each response as above, s = max of the two,
// and records split between them (`second_share` of them from the second).
#pragma once
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include <Eigen/Core>

namespace envsift {

// Candidate cells: centres of cells of the first layer with a value on every layer.
struct StudyArea {
  std::vector<double> longitude, latitude;  // WGS 84
  Eigen::MatrixXd values;                   // cells × layers
  std::vector<std::string> layer_names;
  Eigen::VectorXd sd;                       // per layer, over the cells
  Eigen::VectorXd resolution;               // per layer: smallest gap between two values (skew_scale.hpp)
};

// At most `max_cells` cells: all of them when the first layer has no more, else a seeded random
// choice (in row order).
StudyArea study_area(const std::vector<std::string>& layers, std::size_t max_cells, std::uint64_t seed,
                     const std::string& assume_crs = "");

struct Response {
  Eigen::VectorXd optimum, width;  // per layer
};

struct VirtualTaxon {
  std::string name;
  std::vector<Response> responses;  // one, or two for a taxon with two populations
  std::vector<std::size_t> cells;   // the study-area cell of each record
  std::vector<std::uint8_t> population;  // of each record: 0, or 1 for the second population
  double suitability(const Eigen::VectorXd& x) const;  // NaN values: NaN
};

struct VirtualTaxaOptions {
  std::size_t taxa = 40;
  std::size_t min_records = 12, max_records = 3000;  // sizes log-uniform in between
  double width_low = 0.1, width_high = 0.4;           // σ_l / SD_l
  double two_population_share = 0.25;  // this share of the taxa have two populations (30-50 % in the second)
  std::uint64_t seed = 1;
};

std::vector<VirtualTaxon> make_virtual_taxa(const StudyArea& area, const VirtualTaxaOptions& options);

// One taxon of `records` records from two populations whose optima lie at least `separation`
// study-area SDs apart on some layer; `second_share` of the records come from the second.
VirtualTaxon two_population_taxon(const StudyArea& area, std::size_t records, double second_share, double separation,
                                  double width, std::uint64_t seed, const std::string& name);

}  // namespace envsift
