// The pictures of one taxon in the HTML report, each a standalone SVG document:
//   - per layer, a histogram of the taxon's reference values with the one-layer tests' cutoffs
//     and every suspect marked (its uncertainty disc's range as a bar);
//   - the two layers on which the suspects stand out most, with the robust 97.5 % tolerance
//     ellipse (reweighted FAST-MCD centre and scatter of those two layers, χ²₂ quantile);
//   - a longitude/latitude map of the taxon's records, over shaded relief when a DEM is given.
// Every suspect appears in every picture: as a mark, or as a note when it has no value there; so
// does every record decided in an earlier round, in its own mark (svg::Mark).
#pragma once
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include <Eigen/Core>

#include "envsift/geo/range_distance.hpp"
#include "envsift/review/decision.hpp"
#include "envsift/write/report/svg_canvas.hpp"

namespace envsift {

// Where a one-layer test starts flagging on a layer, drawn in its style slot (cutoff_style()).
struct PlotCutoff {
  std::string label;          // legend, e.g. "robust z"
  int slot = 0;               // style: colour and dash
  double low = 0, high = 0;   // values between are not flagged
  bool flags_bounds = false;  // the bounds themselves are flagged (reverse jackknife)
  std::string words;          // caption: what the lines mean
  bool beyond(double x) const { return flags_bounds ? x <= low || x >= high : x < low || x > high; }
};

struct PlotLayer {
  std::string name, unit;            // unit may be empty
  std::vector<PlotCutoff> cutoffs;   // one per one-layer test that could judge the layer
};

// The colour, dash and caption words of a cutoff style slot (Okabe-Ito colours, distinct dashes).
struct CutoffLook {
  const char* colour;
  const char* dash;
  const char* words;  // e.g. "blue dashed"
};
CutoffLook cutoff_style(int slot);

struct PlotRecord {
  std::string label;          // record ID (or "line N")
  double longitude = 0, latitude = 0;  // NaN when unknown
  std::vector<double> value;  // per layer, NaN = none
  std::vector<double> low, high;  // per layer: the disc's range (equal to value without a disc)
  bool suspect = false;       // open and flagged (Verdict::for_review)
  Decision decision = Decision::none;  // from an earlier round (--decisions)
  std::string note;           // the reviewer's note on it
  double score = 0;
  std::string reasons;        // the verdict's words (for a valid record: what was set aside)
  // Drawn with its own mark, not as a plain dot: a suspect, or a record a reviewer decided.
  bool marked() const { return suspect || decision != Decision::none; }
  svg::Mark mark() const;
};

struct TaxonPicture {
  std::string taxon;
  std::vector<PlotLayer> layers;
  Eigen::MatrixXd reference;       // rows the statistics came from × layers (NaN = none)
  std::string reference_label;     // what a reference row is, e.g. "distinct cells"
  std::vector<PlotRecord> records; // every record of the taxon; suspects first, then decided, worst first
  bool two_populations = false;    // judged as two populations (group/populations.hpp)
  std::vector<std::string> withheld_tests;  // tests whose flags the population guard withheld here
  std::vector<std::vector<LonLat>> range;   // its published range (--ranges), fitted to its map; empty: none
};

std::string distribution_plot(const TaxonPicture& taxon, std::size_t layer);

struct LayerPair {
  std::size_t a = 0, b = 1;
  bool has_ellipse = false;
  Eigen::Vector2d center = Eigen::Vector2d::Zero();
  Eigen::Matrix2d scatter = Eigen::Matrix2d::Identity();
};
// The two layers on which the suspects lie furthest out (largest mean |robust z|), and the robust
// ellipse of the reference rows on them (none with fewer than `min_rows` complete rows).
// Needs at least two layers.
LayerPair choose_pair(const TaxonPicture& taxon, std::uint64_t seed, std::size_t min_rows);
std::string pair_plot(const TaxonPicture& taxon, const LayerPair& pair);

struct MapBox {
  double west = 0, east = 0, south = 0, north = 0;
  int width = 0, height = 0;  // pixels of the map area
};
// The extent of the taxon's records with a margin, and a pixel size that keeps distances true
// at its middle latitude; nothing when no record has coordinates.
std::optional<MapBox> map_box(const TaxonPicture& taxon);
// A range's rings as the map needs them: edges densified, points far outside the box pulled to
// its margin, and points closer than a pixel dropped, so a continental range with hundreds of
// thousands of vertices draws as a few thousand.
std::vector<std::vector<LonLat>> rings_for_map(const std::vector<std::vector<LonLat>>& rings, const MapBox& box);
// `relief_png`: a PNG (raw bytes) covering `box` exactly, or empty. The range, if any, is drawn
// as a blue outline with a faint fill.
std::string map_plot(const TaxonPicture& taxon, const MapBox& box, const std::string& relief_png);

}  // namespace envsift
