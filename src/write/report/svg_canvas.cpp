#include "envsift/write/report/svg_canvas.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace envsift::svg {

std::string escape(const std::string& text) {
  std::string out;
  out.reserve(text.size());
  for (char c : text) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&#39;"; break;
      default:
        // control characters are not allowed in XML 1.0
        if (static_cast<unsigned char>(c) >= 0x20 || c == '\t' || c == '\n') out += c;
    }
  }
  return out;
}

std::string number(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.6g", std::fabs(v) < 1e-12 ? 0.0 : v);
  return buf;
}

std::string data_uri(const std::string& mime_type, const std::string& bytes) {
  static const char* alphabet = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
  std::string out = "data:" + mime_type + ";base64,";
  out.reserve(out.size() + (bytes.size() + 2) / 3 * 4);
  std::size_t i = 0;
  for (; i + 2 < bytes.size(); i += 3) {
    const unsigned v = static_cast<unsigned char>(bytes[i]) << 16 | static_cast<unsigned char>(bytes[i + 1]) << 8 |
                       static_cast<unsigned char>(bytes[i + 2]);
    for (int shift : {18, 12, 6, 0}) out += alphabet[(v >> shift) & 63];
  }
  if (i < bytes.size()) {
    unsigned v = static_cast<unsigned char>(bytes[i]) << 16;
    if (i + 1 < bytes.size()) v |= static_cast<unsigned char>(bytes[i + 1]) << 8;
    out += alphabet[(v >> 18) & 63];
    out += alphabet[(v >> 12) & 63];
    out += i + 1 < bytes.size() ? alphabet[(v >> 6) & 63] : '=';
    out += '=';
  }
  return out;
}

std::vector<double> nice_ticks(double low, double high, int target) {
  std::vector<double> ticks;
  if (!(high > low) || !std::isfinite(low) || !std::isfinite(high)) return {low};
  const double raw = (high - low) / target, magnitude = std::pow(10.0, std::floor(std::log10(raw)));
  double step = magnitude;
  for (double m : {1.0, 2.0, 2.5, 5.0, 10.0})
    if (m * magnitude >= raw) {
      step = m * magnitude;
      break;
    }
  for (double t = std::ceil(low / step) * step; t <= high + step * 1e-9; t += step) ticks.push_back(t);
  return ticks;
}

double Scale::operator()(double v) const {
  return range_low + (v - domain_low) / (domain_high - domain_low) * (range_high - range_low);
}

Plot::Plot(double width, double height, const std::string& title) : width_(width), height_(height), title_(title) {
  x_ = {0, 1, left(), right()};
  y_ = {0, 1, bottom(), top()};
}

namespace {
void padded(double& low, double& high, double pad) {
  if (!(high > low)) {
    const double half = low == 0 ? 1 : std::fabs(low) * 0.05;
    low -= half, high += half;
  }
  const double span = high - low;
  low -= pad * span, high += pad * span;
}
}  // namespace

void Plot::x_range(double low, double high, double pad) {
  padded(low, high, pad);
  x_ = {low, high, left(), right()};
}

void Plot::y_range(double low, double high, double pad) {
  padded(low, high, pad);
  y_ = {low, high, bottom(), top()};
}

void Plot::axes(const std::string& x_label, const std::string& y_label) {
  std::string& s = body_;
  s += "<rect x=\"" + number(left()) + "\" y=\"" + number(top()) + "\" width=\"" + number(right() - left()) +
       "\" height=\"" + number(bottom() - top()) + "\" fill=\"none\" stroke=\"#000\" stroke-width=\"0.8\"/>";
  for (double t : nice_ticks(x_.domain_low, x_.domain_high)) {
    const double px = x_(t);
    s += "<line x1=\"" + number(px) + "\" y1=\"" + number(bottom()) + "\" x2=\"" + number(px) + "\" y2=\"" +
         number(bottom() + 4) + "\" stroke=\"#000\"/>";
    s += "<text x=\"" + number(px) + "\" y=\"" + number(bottom() + 16) + "\" text-anchor=\"middle\">" + number(t) + "</text>";
  }
  for (double t : nice_ticks(y_.domain_low, y_.domain_high)) {
    const double py = y_(t);
    s += "<line x1=\"" + number(left() - 4) + "\" y1=\"" + number(py) + "\" x2=\"" + number(left()) + "\" y2=\"" +
         number(py) + "\" stroke=\"#000\"/>";
    s += "<text x=\"" + number(left() - 6) + "\" y=\"" + number(py + 4) + "\" text-anchor=\"end\">" + number(t) + "</text>";
  }
  s += "<text x=\"" + number((left() + right()) / 2) + "\" y=\"" + number(height_ - 8) +
       "\" text-anchor=\"middle\" font-weight=\"bold\">" + escape(x_label) + "</text>";
  s += "<text transform=\"translate(14 " + number((top() + bottom()) / 2) +
       ") rotate(-90)\" text-anchor=\"middle\" font-weight=\"bold\">" + escape(y_label) + "</text>";
}

void Plot::vertical(double v, const char* colour, const std::string& dash, const std::string& label) {
  if (!std::isfinite(v) || v < x_.domain_low || v > x_.domain_high) return;
  const double px = x_(v);
  body_ += "<line x1=\"" + number(px) + "\" y1=\"" + number(top()) + "\" x2=\"" + number(px) + "\" y2=\"" +
           number(bottom()) + "\" stroke=\"" + colour + "\" stroke-width=\"1.6\"" +
           (dash.empty() ? "" : " stroke-dasharray=\"" + dash + "\"") + "><title>" + escape(label) + "</title></line>";
}

namespace {
// The marks' shapes around (0, 0), about 12 pixels across.
std::string mark_shape(Mark kind) {
  switch (kind) {
    case Mark::suspect:
      return std::string("<path d=\"M0 -6 l5.5 9.5 h-11 z\" fill=\"") + colour::suspect + "\" stroke=\"#000\"/>";
    case Mark::unsure:
      return std::string("<rect x=\"-4.5\" y=\"-4.5\" width=\"9\" height=\"9\" fill=\"") + colour::unsure +
             "\" stroke=\"#000\"/>";
    case Mark::valid:
      return std::string("<path d=\"M0 -6 l6 6 l-6 6 l-6 -6 z\" fill=\"") + colour::valid + "\" stroke=\"#000\"/>";
    case Mark::error:
      return std::string("<path d=\"M-4.5 -4.5 l9 9 m0 -9 l-9 9\" stroke=\"#000\" stroke-width=\"4.6\"/>"
                         "<path d=\"M-4.5 -4.5 l9 9 m0 -9 l-9 9\" stroke=\"") + colour::error + "\" stroke-width=\"2.6\"/>";
  }
  return "";
}
const char* mark_id(Mark kind) {
  static const char* ids[] = {"suspect", "unsure", "valid", "error"};
  return ids[static_cast<int>(kind)];
}
}  // namespace

const char* mark_words(Mark kind) {
  static const char* words[] = {"suspect", "unsure (open)", "decided valid", "decided error"};
  return words[static_cast<int>(kind)];
}

void Plot::mark(Mark kind, double px, double py, const std::string& record, bool label) {
  // one shared symbol per picture (defined in finish()): a report of thousands of marks stays small
  used_[static_cast<int>(kind)] = true;
  body_ += std::string("<use href=\"#") + mark_id(kind) + "\" x=\"" + number(px) + "\" y=\"" + number(py) +
           "\" data-record=\"" + escape(record) + "\"/>";
  if (label) {
    const bool left_of = px > right() - 70;  // keep the label inside the picture
    body_ += "<text x=\"" + number(left_of ? px - 7 : px + 7) + "\" y=\"" + number(py - 5) + "\"" +
             (left_of ? " text-anchor=\"end\"" : "") + " font-size=\"10\" paint-order=\"stroke\" "
             "stroke=\"#fff\" stroke-width=\"3\">" + escape(record) + "</text>";
  }
}

void Plot::legend(const std::vector<std::pair<std::string, std::string>>& entries) {
  double x = left(), y = 24;
  for (const auto& [mark, words] : entries) {
    const double width = 28 + 6.2 * static_cast<double>(words.size());
    if (x > left() && x + width > width_) {  // a new row: the picture grows by it
      x = left(), y += 15;
      top_ += 15, height_ += 15;
    }
    legend_ += "<g transform=\"translate(" + number(x) + " " + number(y) + ")\">" + mark + "<text x=\"20\" y=\"10\">" +
               escape(words) + "</text></g>";
    x += width;
  }
  y_ = {y_.domain_low, y_.domain_high, bottom(), top()};
}

std::string Plot::finish() const {
  std::string defs;
  for (Mark kind : {Mark::suspect, Mark::unsure, Mark::valid, Mark::error})
    if (used_[static_cast<int>(kind)]) defs += std::string("<g id=\"") + mark_id(kind) + "\">" + mark_shape(kind) + "</g>";
  return "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" + number(width_) + "\" height=\"" + number(height_) +
         "\" viewBox=\"0 0 " + number(width_) + " " + number(height_) +
         "\" font-family=\"DejaVu Sans, Arial, sans-serif\" font-size=\"11\">"
         "<defs>" + defs + "</defs>"
         "<rect width=\"100%\" height=\"100%\" fill=\"#fff\"/>"
         "<text x=\"" + number(left()) + "\" y=\"15\" font-size=\"12\" font-weight=\"bold\">" + escape(title_) +
         "</text>" + legend_ + body_ + "</svg>";
}

std::string legend_mark(Mark kind) {
  return "<g transform=\"translate(8 6)\">" + mark_shape(kind) + "</g>";
}
std::string legend_line(const char* colour, const std::string& dash) {
  return std::string("<line x1=\"0\" y1=\"6\" x2=\"16\" y2=\"6\" stroke=\"") + colour + "\" stroke-width=\"1.6\"" +
         (dash.empty() ? "" : " stroke-dasharray=\"" + dash + "\"") + "/>";
}
std::string legend_dot(const char* colour) {
  return std::string("<circle cx=\"8\" cy=\"6\" r=\"2.5\" fill=\"") + colour + "\"/>";
}
std::string legend_box(const char* colour) {
  return std::string("<rect x=\"2\" y=\"1\" width=\"12\" height=\"10\" fill=\"") + colour + "\" stroke=\"#777\"/>";
}

}  // namespace envsift::svg
