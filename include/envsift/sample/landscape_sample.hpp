// Step 2, for the landscape test: the environments available to a taxon. Cells are drawn from
// the taxon's accessible area and sampled on the same layers, through the same block cache, as
// its records. Two areas (--landscape-area):
//   buffer — within a radius R of the taxon's places, R = F × the taxon's spread (the median
//            great-circle distance of its places from their coordinatewise median), at least
//            --landscape-min-km and 10 cells of the first layer. A point is drawn by choosing one
//            of the taxon's places at random, then a uniform point of the disc of radius R around
//            it: areas near many places weigh more, as in background drawn near records
//            (VanDerWal et al. 2009, Ecological Modelling 220:589-594, from memory).
//   extent — uniformly over the first layer's extent (by area: a geographic grid's rows are
//            weighted by cos(latitude)), one draw shared by every taxon.
// Draws are seeded by the run's seed and the taxon's name, so a taxon's landscape depends on
// neither thread count, batch, nor the other taxa in the file. Cells off the layers or nodata
// (sea) are left out: the landscape is where the layers have values.
#pragma once
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "envsift/sample/landscape_values.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift {

// Where a taxon's landscape is drawn: around its records, or anywhere in the layers' extent.
enum class LandscapeArea { buffer, extent };

struct LandscapeOptions {
  LandscapeArea area = LandscapeArea::buffer;
  double spread_factor = 1.0;   // buffer: R = this × the taxon's spread …
  double min_radius_km = 20;    // … at least this (and 10 cells)
  std::size_t cells = 300;      // cells drawn per taxon (extent: in the shared draw)
  std::uint64_t seed = 1;
};

// A taxon's distinct places, WGS 84 degrees.
struct TaxonPlaces {
  std::string taxon;
  std::vector<double> longitude, latitude;
};

// Where a taxon lives, as a position on a space-filling curve of the globe: taxa with near keys
// draw their landscapes from nearby raster blocks, so batches in key order read fewer blocks.
std::uint64_t locality_key(const TaxonPlaces& taxon);

class LandscapeSampler {
 public:
  // `table_layers`: the record table's layers (the stack's, then derived circular components);
  // `judged`: the columns the tests see, in their order.
  LandscapeSampler(RasterStack& stack, std::vector<LayerInfo> table_layers, std::vector<std::size_t> judged,
                   Interpolation method, LandscapeOptions options);
  // One landscape per taxon, in order; sampled in one pass over the blocks.
  std::vector<LandscapeValues> sample(const std::vector<TaxonPlaces>& taxa);
  // The radius of a taxon's buffer, metres.
  double buffer_radius_m(const TaxonPlaces& taxon) const;
  // Memory a taxon's landscape takes while its batch is drawn: size batches by this.
  std::size_t bytes_per_taxon() const;

 private:
  Eigen::MatrixXd judged_values(const Samples& samples, Eigen::Index first, Eigen::Index rows) const;
  void draw_extent();
  static constexpr int kDrawRounds = 6;  // rounds of redrawing cells without a value on every layer
  RasterStack& stack_;
  std::vector<LayerInfo> layers_;
  std::vector<std::size_t> judged_;
  Interpolation method_;
  LandscapeOptions options_;
  double min_radius_m_ = 0;
  std::shared_ptr<const LandscapeValues> extent_;  // the shared draw of `extent`
  bool last_layer_first_ = false;                  // the order the previous sample visited the layers in
};

}  // namespace envsift
