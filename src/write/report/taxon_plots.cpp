#include "envsift/write/report/taxon_plots.hpp"

#include <algorithm>
#include <cmath>
#include <set>

#include <Eigen/Eigenvalues>

#include "envsift/detect/chi_square.hpp"
#include "envsift/detect/deterministic_mcd.hpp"
#include "envsift/detect/robust_z.hpp"
#include "envsift/write/report/svg_canvas.hpp"

namespace envsift {
namespace {

// Which marks of a picture carry their ID: the 8 worst suspects and the first 4 decided records
// (records come suspects first, worst first); the rest are marks only, their IDs in the table.
class Labels {
 public:
  bool next(const PlotRecord& r) { return r.suspect ? suspects_++ < 8 : decided_++ < 4; }

 private:
  std::size_t suspects_ = 0, decided_ = 0;
};

std::string axis_label(const PlotLayer& l) { return l.unit.empty() ? l.name : l.name + " (" + l.unit + ")"; }

// A note for suspects a picture cannot place, so that every suspect still appears in it.
void unplaced(svg::Plot& plot, const std::vector<std::string>& records, double y) {
  if (records.empty()) return;
  std::string words = "no value here: ";
  std::string marks;
  for (std::size_t i = 0; i < records.size(); ++i) {
    words += (i ? ", " : "") + records[i];
    marks += "<g class=\"suspect\" data-record=\"" + svg::escape(records[i]) + "\"/>";
  }
  plot.raw(marks + "<text x=\"" + svg::number(plot.left()) + "\" y=\"" + svg::number(y) + "\" font-size=\"10\">" +
           svg::escape(words) + "</text>");
}

// Points, one per pixel: a picture of thousands of records stays small.
void dots(svg::Plot& plot, const std::vector<std::pair<double, double>>& pixels, double radius) {
  std::set<std::pair<long, long>> drawn;
  std::string s = std::string("<g fill=\"") + svg::colour::points + "\" fill-opacity=\"0.7\">";
  for (const auto& [px, py] : pixels)
    if (drawn.emplace(std::lround(px), std::lround(py)).second)
      s += "<circle cx=\"" + svg::number(std::round(px * 2) / 2) + "\" cy=\"" + svg::number(std::round(py * 2) / 2) +
           "\" r=\"" + svg::number(radius) + "\"/>";
  plot.raw(s + "</g>");
}

// Legend entries of the marks: "suspect" always, a decided record's mark when the taxon has one.
std::vector<std::pair<std::string, std::string>> marks_legend(const TaxonPicture& t) {
  bool present[4] = {true, false, false, false};
  for (const auto& r : t.records)
    if (r.marked()) present[static_cast<int>(r.mark())] = true;
  std::vector<std::pair<std::string, std::string>> entries;
  for (svg::Mark m : {svg::Mark::suspect, svg::Mark::unsure, svg::Mark::valid, svg::Mark::error})
    if (present[static_cast<int>(m)]) entries.emplace_back(svg::legend_mark(m), svg::mark_words(m));
  return entries;
}

}  // namespace

svg::Mark PlotRecord::mark() const {
  switch (decision) {
    case Decision::error: return svg::Mark::error;
    case Decision::valid: return svg::Mark::valid;
    case Decision::unsure: return svg::Mark::unsure;
    case Decision::none: break;
  }
  return svg::Mark::suspect;
}

CutoffLook cutoff_style(int slot) {
  static const CutoffLook looks[] = {{svg::colour::cutoff[0], "7 4", "blue dashed"},
                                     {svg::colour::cutoff[1], "2 3", "vermillion dotted"},
                                     {svg::colour::cutoff[2], "8 3 2 3", "reddish purple dash-dotted"},
                                     {svg::colour::cutoff[3], "12 4", "black long-dashed"}};
  return looks[std::clamp(slot, 0, 3)];
}

std::string distribution_plot(const TaxonPicture& t, std::size_t l) {
  const PlotLayer& layer = t.layers[l];
  std::vector<double> values;
  for (Eigen::Index r = 0; r < t.reference.rows(); ++r)
    if (std::isfinite(t.reference(r, static_cast<Eigen::Index>(l)))) values.push_back(t.reference(r, static_cast<Eigen::Index>(l)));
  double lo = INFINITY, hi = -INFINITY;
  auto include = [&](double v) {
    if (std::isfinite(v)) lo = std::min(lo, v), hi = std::max(hi, v);
  };
  for (double v : values) include(v);
  for (const auto& r : t.records)
    if (r.marked()) include(r.low[l]), include(r.high[l]), include(r.value[l]);
  for (const auto& c : layer.cutoffs) include(c.low), include(c.high);
  svg::Plot plot(480, 230, layer.name + ": " + t.taxon);
  auto legend = marks_legend(t);
  legend.insert(legend.begin(), {svg::legend_box(svg::colour::bars), t.reference_label});
  for (const auto& c : layer.cutoffs)
    legend.emplace_back(svg::legend_line(cutoff_style(c.slot).colour, cutoff_style(c.slot).dash), c.label);
  plot.legend(legend);
  if (!std::isfinite(lo)) lo = 0, hi = 1;
  plot.x_range(lo, hi);
  // 30 bins over the padded axis
  const int bins = 30;
  const double x0 = plot.x().domain_low, width = (plot.x().domain_high - x0) / bins;
  std::vector<int> count(bins, 0);
  for (double v : values) ++count[std::clamp(static_cast<int>((v - x0) / width), 0, bins - 1)];
  const int most = std::max(1, *std::max_element(count.begin(), count.end()));
  plot.y_range(0, most * 1.45, 0);  // headroom above the bars for the suspects' marks
  std::string bars = std::string("<g fill=\"") + svg::colour::bars + "\" stroke=\"#777\" stroke-width=\"0.5\">";
  for (int b = 0; b < bins; ++b)
    if (count[b] > 0) {
      const double px = plot.x()(x0 + b * width), py = plot.y()(count[b]);
      bars += "<rect x=\"" + svg::number(px) + "\" y=\"" + svg::number(py) + "\" width=\"" +
              svg::number(plot.x()(x0 + (b + 1) * width) - px) + "\" height=\"" + svg::number(plot.bottom() - py) + "\"/>";
    }
  plot.raw(bars + "</g>");
  for (const auto& c : layer.cutoffs) {
    const CutoffLook look = cutoff_style(c.slot);
    plot.vertical(c.low, look.colour, look.dash, c.label + " cutoff (low)");
    plot.vertical(c.high, look.colour, look.dash, c.label + " cutoff (high)");
  }
  std::vector<std::string> missing;
  std::size_t k = 0;
  Labels labels;
  for (const auto& r : t.records) {
    if (!r.marked()) continue;
    if (!std::isfinite(r.value[l])) {
      missing.push_back(r.label);
      continue;
    }
    const double py = plot.top() + 12 + 13.0 * static_cast<double>(k % 4);  // four rows against overlap
    if (std::isfinite(r.low[l]) && r.low[l] < r.high[l])
      plot.raw("<line x1=\"" + svg::number(plot.x()(r.low[l])) + "\" y1=\"" + svg::number(py) + "\" x2=\"" +
               svg::number(plot.x()(r.high[l])) + "\" y2=\"" + svg::number(py) + "\" stroke=\"#000\" stroke-width=\"1.5\"/>");
    plot.mark(r.mark(), plot.x()(r.value[l]), py, r.label, labels.next(r));
    ++k;
  }
  plot.axes(axis_label(layer), t.reference_label);
  unplaced(plot, missing, plot.top() + 66);
  return plot.finish();
}

LayerPair choose_pair(const TaxonPicture& t, std::uint64_t seed, std::size_t min_rows) {
  const std::size_t layers = t.layers.size();
  std::vector<double> outness(layers, 0.0);
  for (std::size_t l = 0; l < layers; ++l) {
    std::vector<double> column(t.reference.rows());
    for (Eigen::Index r = 0; r < t.reference.rows(); ++r) column[static_cast<std::size_t>(r)] = t.reference(r, static_cast<Eigen::Index>(l));
    const RobustSpread s = robust_spread(column);
    if (!(s.spread > 0) || s.from_mean_deviation) {
      outness[l] = -1;  // most values equal: a poor axis, and no ellipse fits it
      continue;
    }
    for (const auto& r : t.records)
      if (r.marked() && std::isfinite(r.value[l])) outness[l] += std::fabs(r.value[l] - s.median) / s.spread;
  }
  std::vector<std::size_t> order(layers);
  for (std::size_t l = 0; l < layers; ++l) order[l] = l;
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return outness[a] > outness[b]; });
  LayerPair pair;
  pair.a = std::min(order[0], order[1]);
  pair.b = std::max(order[0], order[1]);
  std::vector<Eigen::Index> complete;
  for (Eigen::Index r = 0; r < t.reference.rows(); ++r)
    if (std::isfinite(t.reference(r, static_cast<Eigen::Index>(pair.a))) && std::isfinite(t.reference(r, static_cast<Eigen::Index>(pair.b))))
      complete.push_back(r);
  if (complete.size() < std::max<std::size_t>(min_rows, 4)) return pair;
  Eigen::MatrixXd x(static_cast<Eigen::Index>(complete.size()), 2);
  for (std::size_t i = 0; i < complete.size(); ++i) {
    x(static_cast<Eigen::Index>(i), 0) = t.reference(complete[i], static_cast<Eigen::Index>(pair.a));
    x(static_cast<Eigen::Index>(i), 1) = t.reference(complete[i], static_cast<Eigen::Index>(pair.b));
  }
  McdOptions options;
  options.seed = seed;
  const McdResult mcd = minimum_covariance_determinant(x, options);  // DetMCD: cheap enough for every section
  if (mcd.exact_fit || !(mcd.scatter.determinant() > 0)) return pair;
  pair.has_ellipse = true;
  pair.center = mcd.center;
  pair.scatter = mcd.scatter;
  return pair;
}

std::string pair_plot(const TaxonPicture& t, const LayerPair& p) {
  const auto a = static_cast<Eigen::Index>(p.a), b = static_cast<Eigen::Index>(p.b);
  // the ellipse {x : (x − c)ᵀ S⁻¹ (x − c) = χ²₂(0.975)} as 96 points
  std::vector<Eigen::Vector2d> ring;
  if (p.has_ellipse) {
    const Eigen::SelfAdjointEigenSolver<Eigen::Matrix2d> eig(p.scatter);
    const double radius = std::sqrt(chi_square_quantile(2, 0.975));
    const Eigen::Matrix2d axes = eig.eigenvectors() * eig.eigenvalues().cwiseMax(0).cwiseSqrt().asDiagonal();
    for (int k = 0; k <= 96; ++k) {
      const double angle = 2 * M_PI * k / 96;
      ring.push_back(p.center + radius * axes * Eigen::Vector2d(std::cos(angle), std::sin(angle)));
    }
  }
  double x_lo = INFINITY, x_hi = -INFINITY, y_lo = INFINITY, y_hi = -INFINITY;
  auto include = [&](double x, double y) {
    if (!std::isfinite(x) || !std::isfinite(y)) return;
    x_lo = std::min(x_lo, x), x_hi = std::max(x_hi, x), y_lo = std::min(y_lo, y), y_hi = std::max(y_hi, y);
  };
  for (Eigen::Index r = 0; r < t.reference.rows(); ++r) include(t.reference(r, a), t.reference(r, b));
  for (const auto& r : t.records)
    if (r.marked()) include(r.value[p.a], r.value[p.b]);
  for (const auto& v : ring) include(v.x(), v.y());
  svg::Plot plot(440, 400, t.layers[p.a].name + " × " + t.layers[p.b].name + ": " + t.taxon);
  auto legend = marks_legend(t);
  legend.insert(legend.begin(), {svg::legend_dot(svg::colour::points), t.reference_label});
  if (p.has_ellipse) legend.emplace_back(svg::legend_line(svg::colour::ellipse, ""), "robust 97.5 % ellipse");
  plot.legend(legend);
  if (!std::isfinite(x_lo)) x_lo = 0, x_hi = 1, y_lo = 0, y_hi = 1;
  plot.x_range(x_lo, x_hi);
  plot.y_range(y_lo, y_hi);
  std::vector<std::pair<double, double>> pixels;
  for (Eigen::Index r = 0; r < t.reference.rows(); ++r)
    if (std::isfinite(t.reference(r, a)) && std::isfinite(t.reference(r, b)))
      pixels.emplace_back(plot.x()(t.reference(r, a)), plot.y()(t.reference(r, b)));
  dots(plot, pixels, 2.2);
  if (!ring.empty()) {
    std::string d;
    for (const auto& v : ring) d += (d.empty() ? "M" : " L") + svg::number(plot.x()(v.x())) + " " + svg::number(plot.y()(v.y()));
    plot.raw("<path d=\"" + d + " Z\" fill=\"none\" stroke=\"" + svg::colour::ellipse +
             "\" stroke-width=\"2\"><title>robust 97.5 % tolerance ellipse</title></path>");
  }
  std::vector<std::string> missing;
  Labels labels;
  for (const auto& r : t.records) {
    if (!r.marked()) continue;
    if (!std::isfinite(r.value[p.a]) || !std::isfinite(r.value[p.b])) missing.push_back(r.label);
    else plot.mark(r.mark(), plot.x()(r.value[p.a]), plot.y()(r.value[p.b]), r.label, labels.next(r));
  }
  plot.axes(axis_label(t.layers[p.a]), axis_label(t.layers[p.b]));
  unplaced(plot, missing, plot.bottom() - 6);
  return plot.finish();
}

std::optional<MapBox> map_box(const TaxonPicture& t) {
  MapBox box{INFINITY, -INFINITY, INFINITY, -INFINITY, 0, 0};
  for (const auto& r : t.records)
    if (std::isfinite(r.longitude) && std::isfinite(r.latitude)) {
      box.west = std::min(box.west, r.longitude), box.east = std::max(box.east, r.longitude);
      box.south = std::min(box.south, r.latitude), box.north = std::max(box.north, r.latitude);
    }
  if (!std::isfinite(box.west)) return std::nullopt;
  // ground distances: a degree of longitude is cos(latitude) of a degree of latitude
  const double shrink = std::max(0.05, std::cos((box.south + box.north) / 2 * M_PI / 180));
  double span = std::max({(box.east - box.west) * shrink, box.north - box.south, 0.02}) * 1.12;
  const double cx = (box.west + box.east) / 2, cy = (box.south + box.north) / 2;
  double half_x = std::max((box.east - box.west) * shrink * 1.12, span / 1.6) / 2,
         half_y = std::max((box.north - box.south) * 1.12, span / 1.6) / 2;  // aspect within 1:1.6
  box.west = cx - half_x / shrink, box.east = cx + half_x / shrink;
  box.south = std::max(-90.0, cy - half_y), box.north = std::min(90.0, cy + half_y);
  const double pixels_per_unit = 400 / std::max(2 * half_x, 2 * half_y);
  box.width = static_cast<int>(std::lround(2 * half_x * pixels_per_unit));
  box.height = static_cast<int>(std::lround((box.north - box.south) * pixels_per_unit));
  return box;
}

std::vector<std::vector<LonLat>> rings_for_map(const std::vector<std::vector<LonLat>>& rings, const MapBox& box) {
  const double span = std::max(box.east - box.west, box.north - box.south);
  const double step = span / 100, margin = span / 20, pixel = span / 800;
  std::vector<std::vector<LonLat>> out;
  for (const auto& ring : rings) {
    std::vector<LonLat> fitted;
    auto add = [&](double lon, double lat) {
      lon = std::clamp(lon, box.west - margin, box.east + margin);
      lat = std::clamp(lat, box.south - margin, box.north + margin);
      if (fitted.empty() || std::fabs(lon - fitted.back().lon) > pixel || std::fabs(lat - fitted.back().lat) > pixel)
        fitted.push_back({lon, lat});
    };
    for (std::size_t k = 0; k < ring.size(); ++k) {
      const LonLat p = ring[k], q = ring[(k + 1) % ring.size()];
      const int pieces = std::clamp(static_cast<int>(std::ceil(std::max(std::fabs(q.lon - p.lon), std::fabs(q.lat - p.lat)) / step)), 1, 100000);
      for (int s = 0; s < pieces; ++s) {
        const double f = static_cast<double>(s) / pieces;
        add(p.lon + f * (q.lon - p.lon), p.lat + f * (q.lat - p.lat));
      }
    }
    if (fitted.size() >= 3) out.push_back(std::move(fitted));
  }
  return out;
}

std::string map_plot(const TaxonPicture& t, const MapBox& box, const std::string& relief_png) {
  svg::Plot plot(box.width + 62 + 16, box.height + 40 + 46, "Records of " + t.taxon);
  auto legend = marks_legend(t);
  legend.insert(legend.begin(), {svg::legend_dot(svg::colour::points), "record"});
  if (!t.range.empty()) legend.emplace_back(svg::legend_line(svg::colour::range, ""), "published range");
  if (!relief_png.empty()) legend.emplace_back(svg::legend_box("#999"), "shaded relief (DEM)");
  plot.legend(legend);
  plot.x_range(box.west, box.east, 0);
  plot.y_range(box.south, box.north, 0);
  if (!relief_png.empty())
    plot.raw("<image x=\"" + svg::number(plot.left()) + "\" y=\"" + svg::number(plot.top()) + "\" width=\"" +
             std::to_string(box.width) + "\" height=\"" + std::to_string(box.height) +
             "\" preserveAspectRatio=\"none\" opacity=\"0.75\" href=\"" + svg::data_uri("image/png", relief_png) + "\"/>");
  if (!t.range.empty()) {  // clipped to the map area
    std::string d;
    for (const auto& ring : t.range) {
      for (std::size_t k = 0; k < ring.size(); ++k)
        d += (k ? " L" : " M") + svg::number(std::round(plot.x()(ring[k].lon) * 2) / 2) + " " +
             svg::number(std::round(plot.y()(ring[k].lat) * 2) / 2);
      d += " Z";
    }
    plot.raw("<clipPath id=\"map-area\"><rect x=\"" + svg::number(plot.left()) + "\" y=\"" + svg::number(plot.top()) +
             "\" width=\"" + std::to_string(box.width) + "\" height=\"" + std::to_string(box.height) +
             "\"/></clipPath><path clip-path=\"url(#map-area)\" fill-rule=\"evenodd\" fill=\"" + svg::colour::range +
             "\" fill-opacity=\"0.08\" stroke=\"" + svg::colour::range + "\" stroke-width=\"1.8\" d=\"" + d.substr(1) +
             "\"><title>published range</title></path>");
  }
  std::vector<std::pair<double, double>> pixels;
  for (const auto& r : t.records)
    if (!r.marked() && std::isfinite(r.longitude)) pixels.emplace_back(plot.x()(r.longitude), plot.y()(r.latitude));
  dots(plot, pixels, 2.6);
  std::vector<std::string> missing;
  Labels labels;
  for (const auto& r : t.records) {
    if (!r.marked()) continue;
    if (!std::isfinite(r.longitude) || !std::isfinite(r.latitude)) missing.push_back(r.label);
    else plot.mark(r.mark(), plot.x()(r.longitude), plot.y()(r.latitude), r.label, labels.next(r));
  }
  plot.axes("longitude (°)", "latitude (°)");
  unplaced(plot, missing, plot.bottom() - 6);
  return plot.finish();
}

}  // namespace envsift
