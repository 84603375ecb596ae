// A small SVG plotting frame for the HTML report: a plot area with linear axes, ticks, labels,
// and the marks the report draws. Colours are from the Okabe & Ito palette (Color Universal
// Design, 2008), chosen so that colour-blind readers can tell them apart; every mark also differs
// in shape or dash pattern, so the plots still read in grey-scale.
#pragma once
#include <string>
#include <vector>

namespace envsift::svg {

namespace colour {
constexpr const char* suspect = "#E69F00";    // orange, with a black outline
// records a reviewer decided in an earlier round (--decisions)
constexpr const char* unsure = "#F0E442";     // yellow, with a black outline
constexpr const char* valid = "#56B4E9";      // sky blue, with a black outline
constexpr const char* error = "#D55E00";      // vermillion, over a black outline
// one-layer tests' cutoffs, one per style slot: blue, vermillion, reddish purple, black
constexpr const char* cutoff[] = {"#0072B2", "#D55E00", "#CC79A7", "#000000"};
constexpr const char* ellipse = "#009E73";    // bluish green
constexpr const char* range = "#0072B2";      // blue: a taxon's published range on its map (solid outline)
constexpr const char* points = "#4D4D4D";     // dark grey
constexpr const char* bars = "#BDBDBD";       // light grey
}  // namespace colour

// How a record the report points at is marked: an open suspect (triangle), or a record decided
// in an earlier round — unsure (square, still open), valid (diamond) or error (cross). Shape and
// colour differ, so the marks read in grey-scale too.
enum class Mark { suspect, unsure, valid, error };
const char* mark_words(Mark m);  // the legend's words, e.g. "decided valid"

std::string escape(const std::string& text);  // for XML text and attribute values
std::string number(double v);                  // short, locale-free
// A data: URI (RFC 2397) of `bytes`, base64-encoded (RFC 4648), for pictures inside the report.
std::string data_uri(const std::string& mime_type, const std::string& bytes);

// Round tick positions covering [low, high], about `target` of them.
std::vector<double> nice_ticks(double low, double high, int target = 5);

struct Scale {
  double domain_low = 0, domain_high = 1, range_low = 0, range_high = 1;
  double operator()(double v) const;
};

class Plot {
 public:
  // A `width` × `height` pixel picture; the plot area leaves room for axis labels.
  Plot(double width, double height, const std::string& title);

  // Data ranges of the axes (padded by `pad` of their span, widened when empty).
  void x_range(double low, double high, double pad = 0.04);
  void y_range(double low, double high, double pad = 0.04);
  const Scale& x() const { return x_; }
  const Scale& y() const { return y_; }
  double left() const { return left_; }
  double right() const { return width_ - right_margin_; }
  double top() const { return top_; }
  double bottom() const { return height_ - bottom_margin_; }

  void axes(const std::string& x_label, const std::string& y_label);
  // A line across the plot area at data value v (dash: SVG stroke-dasharray, "" for solid).
  void vertical(double v, const char* colour, const std::string& dash, const std::string& label);
  void raw(const std::string& element) { body_ += element; }
  // A record's mark at pixel (px, py), labelled with `record` when `label` is true; `record` goes
  // into its data-record attribute.
  void mark(Mark kind, double px, double py, const std::string& record, bool label);
  // (mark SVG, words), in rows across the top. Call it before the ranges: a legend of more than
  // one row makes the picture taller, keeping the plot area's size.
  void legend(const std::vector<std::pair<std::string, std::string>>& entries);
  std::string finish() const;  // the standalone SVG document

 private:
  double width_, height_, left_ = 62, top_ = 40, right_margin_ = 16, bottom_margin_ = 46;
  std::string title_, body_, legend_;
  Scale x_, y_;
  bool used_[4] = {false, false, false, false};  // marks drawn, by Mark: only those are defined
};

// Legend marks, drawn in a 16 × 12 box.
std::string legend_mark(Mark kind);
std::string legend_line(const char* colour, const std::string& dash);
std::string legend_dot(const char* colour);
std::string legend_box(const char* colour);

}  // namespace envsift::svg
