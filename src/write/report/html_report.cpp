#include "envsift/write/report/html_report.hpp"

#include <cmath>
#include <algorithm>
#include <cstdio>
#include <cctype>
#include <map>
#include <set>

#include "envsift/write/atomic_file.hpp"
#include "envsift/write/value_format.hpp"
#include "envsift/write/report/shaded_relief.hpp"
#include "envsift/write/report/svg_canvas.hpp"

namespace envsift {
namespace {

using svg::escape;

constexpr std::size_t kTableRows = 200;  // suspects listed per taxon; the pictures show them all

// No request may leave the file: only inline styles and data: images are allowed.
const char* kHead =
    "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
    "<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; img-src data:; style-src 'unsafe-inline'\">"
    "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">";

const char* kStyle =
    "<style>"
    "body{font-family:'DejaVu Sans',Arial,sans-serif;margin:0 auto;max-width:1400px;padding:0 1.2em 3em;color:#111;"
    "line-height:1.4}"
    "h1{margin:.6em 0 .2em}h2{border-bottom:2px solid #0072B2;padding-bottom:.15em;margin-top:1.6em}"
    ".caution{border:2px solid #D55E00;background:#fff4ec;padding:.6em 1em;margin:1em 0;font-size:1.05em}"
    "table{border-collapse:collapse;margin:.5em 0;font-size:.9em}th,td{border:1px solid #bbb;padding:.2em .5em;"
    "vertical-align:top;text-align:left}th{background:#eee}td.n{text-align:right;font-variant-numeric:tabular-nums}"
    ".taxon{content-visibility:auto;contain-intrinsic-size:auto 1400px;margin-top:2em}"
    ".pictures{display:flex;flex-wrap:wrap;gap:8px;align-items:flex-start}.pictures img{border:1px solid #ccc;max-width:100%;height:auto}"
    ".note{color:#444}.flagged{font-weight:bold}"
    "pre{background:#f6f6f6;padding:.6em;overflow:auto;font-size:.8em}"
    "nav a{margin-right:1em}"
    "</style>";

std::string cell(const std::string& text, bool number = false) {
  return std::string(number ? "<td class=\"n\">" : "<td>") + escape(text) + "</td>";
}

std::string img(const std::string& svg_document, const std::string& alt, int width, int height) {
  return "<img loading=\"lazy\" decoding=\"async\" width=\"" + std::to_string(width) + "\" height=\"" +
         std::to_string(height) + "\" alt=\"" + escape(alt) + "\" src=\"" +
         svg::data_uri("image/svg+xml", svg_document) + "\">";
}

// "a;b" → "a; b", so that a list of test names can wrap
std::string spaced(const std::string& list) {
  std::string out;
  for (char c : list) out += c == ';' ? std::string("; ") : std::string(1, c);
  return out;
}

// Whether some suspect's (or decided record's) value lies beyond a one-layer test's cutoff on layer l: only such
// layers get a distribution plot, so a report of many layers and taxa stays small.
bool beyond_a_cutoff(const TaxonPicture& t, std::size_t l) {
  for (const auto& r : t.records) {
    if (!r.marked() || !std::isfinite(r.value[l])) continue;
    for (const auto& c : t.layers[l].cutoffs)
      if (c.beyond(r.value[l])) return true;
  }
  return false;
}

// "Blue dashed lines: where robust z starts flagging; ... ", one clause per test drawn.
std::string cutoff_caption(const TaxonPicture& t) {
  std::map<int, std::string> clauses;
  for (const auto& layer : t.layers)
    for (const auto& c : layer.cutoffs) clauses.emplace(c.slot, std::string(cutoff_style(c.slot).words) + " lines: " + c.words);
  std::string s;
  for (const auto& [slot, clause] : clauses) s += (s.empty() ? "" : "; ") + clause;
  if (!s.empty()) s[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(s[0])));
  return s.empty() ? s : s + ". ";
}

// "1 error, 2 valid": the taxon's records per decision, none left out.
std::string decided_text(const std::map<Decision, std::size_t>& decided) {
  std::string s;
  for (const auto& [d, n] : decided) s += (s.empty() ? "" : ", ") + std::to_string(n) + " " + decision_name(d);
  return s;
}

// What the decided records' marks mean, for those the taxon has.
std::string decided_caption(const std::map<Decision, std::size_t>& decided) {
  std::string s;
  if (decided.count(Decision::unsure)) s += "Yellow squares: decided unsure, still open. ";
  if (decided.count(Decision::valid))
    s += "Blue diamonds: decided valid, never flagged again (the table shows the flags set aside). ";
  if (decided.count(Decision::error))
    s += "Vermillion crosses: decided error, left out of the taxon's statistics. ";
  return s;
}

std::string value_text(double v) { return std::isfinite(v) ? svg::number(v) : ""; }

// The pixel size written in an SVG document's root element.
std::pair<int, int> svg_size(const std::string& document) {
  double w = 0, h = 0;
  std::sscanf(document.c_str(), "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%lf\" height=\"%lf\"", &w, &h);
  return {static_cast<int>(w), static_cast<int>(h)};
}

std::string picture(const std::string& document, const std::string& alt) {
  const auto [w, h] = svg_size(document);
  return img(document, alt, w, h);
}

}  // namespace

std::string taxon_anchor(std::size_t index) { return "taxon-" + std::to_string(index); }

HtmlReport::HtmlReport(std::string path, ReliefSource relief, std::uint64_t seed, std::size_t min_rows)
    : path_(std::move(path)), out_(std::make_unique<AtomicFile>(path_)), relief_(std::move(relief)), seed_(seed),
      min_rows_(min_rows) {}

void HtmlReport::list_taxon(std::size_t index, const TaxonListing& listing) {
  std::lock_guard<std::mutex> guard(lock_);
  taxa_[index].listing = listing;
}

void HtmlReport::add_section(std::size_t index, const std::string& section) {
  std::lock_guard<std::mutex> guard(lock_);
  sections_.append({section});
  taxa_[index].section = sections_.size() - 1;
}

std::string HtmlReport::section(std::size_t index, const TaxonPicture& t, std::size_t judged) const {
  std::size_t suspects = 0, marked = 0;
  std::map<Decision, std::size_t> decided;
  for (const auto& r : t.records) {
    suspects += r.suspect;
    marked += r.marked();
    if (r.decision != Decision::none) ++decided[r.decision];
  }
  std::string s = "<section class=\"taxon\" id=\"" + taxon_anchor(index) + "\"><h2><i>" + escape(t.taxon) + "</i></h2>";
  s += "<p>" + std::to_string(t.records.size()) + " records, " + std::to_string(judged) + " judged, <span class=\"flagged\">" +
       std::to_string(suspects) + (decided.empty() ? " suspect" : " open suspect") + (suspects == 1 ? "" : "s") + "</span>" +
       (decided.empty() ? "" : "; decided in earlier rounds: " + decided_text(decided)) + "; statistics from " +
       std::to_string(t.reference.rows()) + " " + escape(t.reference_label) +
       ". <a href=\"#index\">back to the index</a></p>";
  if (t.two_populations)
    s += "<p class=\"note\">Its records form two separate groups in the layers' space, so each group was judged "
         "against itself as a population; the plots and cutoffs below show the taxon as a whole.</p>";
  if (!t.withheld_tests.empty()) {
    std::string tests;
    for (const auto& w : t.withheld_tests) tests += (tests.empty() ? "" : ", ") + w;
    s += "<p class=\"note\">The flags of " + escape(tests) + " were withheld for this taxon: they fell on too many of "
         "its places for a few errors (looks_multimodal). Those records are marked and listed together below, worst "
         "first: a second population, or a batch of errors spread over many places. Review them as a group.</p>";
  }
  s += "<div class=\"pictures\">";
  if (const auto box = map_box(t)) {
    const std::string relief = relief_.path.empty() ? "" : shaded_relief_png(relief_.path, relief_.band, *box);
    s += picture(map_plot(t, *box, relief), "map of the records of " + t.taxon + ", suspects marked");
  }
  if (marked > 0) {
    if (t.layers.size() >= 2)
      s += picture(pair_plot(t, choose_pair(t, seed_, min_rows_)), "two layers with the robust tolerance ellipse");
    std::vector<std::string> quiet;  // layers on which no marked record is beyond a one-layer cutoff
    for (std::size_t l = 0; l < t.layers.size(); ++l) {
      if (beyond_a_cutoff(t, l)) s += picture(distribution_plot(t, l), t.layers[l].name + " distribution with cutoffs and suspects");
      else quiet.push_back(t.layers[l].name);
    }
    if (!quiet.empty()) {
      std::string names;
      for (const auto& q : quiet) names += (names.empty() ? "" : ", ") + q;
      s += "<p class=\"note\">Not plotted, as no suspect lies beyond a one-layer cutoff there (values in the table): " +
           escape(names) + ".</p>";
    }
  } else {
    s += "<p class=\"note\">No suspect: the layer plots are left out to keep the report small.</p>";
  }
  s += "</div>";
  if (marked > 0) {
    s += "<p class=\"note\">Triangles: suspects (the worst labelled by ID; a black bar spans a record's values within "
         "its uncertainty disc). " + escape(decided_caption(decided)) + "Grey: the " + escape(t.reference_label) +
         " the taxon's statistics come from. " + escape(cutoff_caption(t)) +
         "Green ellipse: 97.5 % of the taxon's robust (FAST-MCD) bivariate normal.</p>";
    s += "<table><tr><th>record</th><th>score</th>";
    if (!decided.empty()) s += "<th>decision</th><th>note</th>";
    s += "<th>reasons</th>";
    for (const auto& l : t.layers) s += "<th>" + escape(l.name) + "</th>";
    s += "</tr>";
    std::size_t listed = 0;
    for (const auto& r : t.records) {  // open suspects first, then decided records
      if (!r.marked() || listed++ == kTableRows) continue;
      s += "<tr>" + cell(r.label) + cell(format_score(r.score), true);
      if (!decided.empty()) s += cell(decision_name(r.decision)) + cell(r.note);
      s += cell(r.reasons);
      for (std::size_t l = 0; l < t.layers.size(); ++l) s += cell(value_text(r.value[l]), true);
      s += "</tr>";
    }
    s += "</table>";
    if (marked > kTableRows)
      s += "<p class=\"note\">The first " + std::to_string(kTableRows) + " of " + std::to_string(marked) +
           (decided.empty() ? " suspects" : " suspects and decided records") +
           " are listed, worst first; the output CSV has them all (--order rank lists them worst first).</p>";
  }
  s += "</section>\n";
  return s;
}

namespace {

// The run: inputs, tests, records read / scored / flagged / not scored, codes and warnings.
std::string overview_html(const ReportOverview& o) {
  std::string s;
  s += "<h2 id=\"overview\">Run</h2><table>";
  for (const auto& [what, value] : o.inputs) s += "<tr><th>" + escape(what) + "</th>" + cell(value) + "</tr>";
  s += "</table><p>Tests:</p><ul>";
  for (const auto& t : o.tests) s += "<li>" + escape(t) + "</li>";
  s += std::string("</ul><table><tr><th>records read</th><th>scored</th><th>") +
       (o.with_decisions ? "open suspects</th><th>decided in earlier rounds" : "flagged") +
       "</th><th>not scored</th></tr><tr>" + cell(std::to_string(o.read), true) + cell(std::to_string(o.scored), true) +
       cell(std::to_string(o.flagged), true);
  if (o.with_decisions) {
    std::size_t decided = 0;
    std::string each;
    for (const char* d : {"error", "valid", "unsure"})  // as in each taxon's section
      if (const auto n = o.decided.find(d); n != o.decided.end())
        decided += n->second, each += (each.empty() ? "" : ", ") + std::to_string(n->second) + " " + d;
    s += cell(std::to_string(decided) + (each.empty() ? "" : " (" + each + ")"), true);
  }
  s += cell(std::to_string(o.read - o.scored), true) + "</tr></table>";
  if (o.with_decisions)
    s += "<p class=\"note\">Records decided error or valid in earlier rounds are not among the suspects: error ones "
         "are left out of their taxon's statistics, valid ones are never flagged again. Records decided unsure stay "
         "open. Each taxon's section lists its decided records with their notes.</p>";
  if (!o.not_scored.empty()) {
    s += "<p>Records not scored, by the reason that prevented scoring (each is in the output with all its reasons):</p><table>"
         "<tr><th>reason</th><th>records</th></tr>";
    for (const auto& [code, count] : o.not_scored) s += "<tr>" + cell(code) + cell(std::to_string(count), true) + "</tr>";
    s += "</table>";
  }
  if (!o.codes.empty()) {
    s += "<details><summary>Every reason code and its count</summary><table>";
    for (const auto& [code, count] : o.codes) s += "<tr>" + cell(code) + cell(std::to_string(count), true) + "</tr>";
    s += "</table></details>";
  }
  if (!o.warnings.empty()) {
    s += std::string("<details") + (o.warnings.size() <= 5 ? " open" : "") + "><summary>" +
         std::to_string(o.warnings.size()) + " warning(s)</summary><ul>";
    for (const auto& w : o.warnings) s += "<li>" + escape(w) + "</li>";
    s += "</ul></details>";
  }
  return s;
}

// The worst suspects across all taxa, each linked to its taxon's section when one is drawn.
std::string top_suspects_html(const ReportOverview& o, const std::set<std::size_t>& drawn) {
  std::string s;
  s += "<h2 id=\"suspects\">Top suspects</h2>";
  if (o.top.empty()) s += "<p>No record was flagged.</p>";
  else {
    s += "<table><tr><th>rank</th><th>record</th><th>taxon</th><th>score</th><th>flags</th><th>reasons</th></tr>";
    for (const auto& r : o.top) {
      const std::string taxon = r.taxon_index == static_cast<std::size_t>(-1) || !drawn.count(r.taxon_index)
                                    ? escape(r.taxon)
                                    : "<a href=\"#" + taxon_anchor(r.taxon_index) + "\"><i>" + escape(r.taxon) + "</i></a>";
      s += "<tr>" + cell(std::to_string(r.rank), true) + cell(r.record) + "<td>" + taxon + "</td>" +
           cell(r.score, true) + cell(spaced(r.flags)) + cell(r.reasons) + "</tr>";
    }
    s += "</table>";
  }
  return s;
}

}  // namespace

void HtmlReport::finish(const ReportOverview& o) {
  std::set<std::size_t> drawn;
  for (const auto& [index, e] : taxa_)
    if (e.section) drawn.insert(index);
  AtomicFile& out = *out_;
  std::string s = kHead;
  s += "<title>" + escape(o.title) + "</title>" + kStyle + "</head><body>";
  s += "<h1>" + escape(o.title) + "</h1>";
  s += "<nav><a href=\"#overview\">Run</a><a href=\"#suspects\">Top suspects</a><a href=\"#index\">Taxa</a>"
       "<a href=\"#manifest\">Manifest</a></nav>";
  s += "<p class=\"caution\"><b>Flags are reasons to look, not proof of error.</b> A suspect record may be a "
       "georeferencing slip, a mislabelled specimen, a vagrant, or a genuine record at the edge of its taxon's "
       "range. Review each one before acting: removing records changes model results, and removing true edge "
       "records narrows the niche a model learns.</p>";
  s += overview_html(o);
  s += top_suspects_html(o, drawn);
  s += "<h2 id=\"index\">Taxa</h2>";
  if (drawn.size() < taxa_.size())
    s += "<p class=\"note\">Sections are drawn for the " + std::to_string(drawn.size()) + " taxa whose worst suspect "
         "scores highest (--report-taxa); the others are listed without a link, their records are in the output CSV.</p>";
  s += std::string("<table><tr><th>taxon</th><th>records</th><th>judged</th><th>") +
       (o.with_decisions ? "open suspects</th><th>decided" : "suspects") + "</th></tr>";
  for (const auto& [index, e] : taxa_) {
    s += "<tr><td>" + (drawn.count(index) ? "<a href=\"#" + taxon_anchor(index) + "\"><i>" + escape(e.listing.name) + "</i></a>"
                                         : "<i>" + escape(e.listing.name) + "</i>") + "</td>" +
         cell(std::to_string(e.listing.records), true) + cell(std::to_string(e.listing.judged), true) +
         cell(std::to_string(e.listing.suspects), true);
    if (o.with_decisions) s += cell(std::to_string(e.listing.decided), true);
    s += "</tr>";
  }
  s += "</table>";
  out.write(s);
  std::vector<std::string> section;
  for (const auto& [index, e] : taxa_) {
    if (!e.section) continue;
    sections_.read(*e.section, section);
    out.write(section.at(0));
  }
  s = "<h2 id=\"manifest\">Run manifest</h2>";
  s += o.manifest_json.empty() ? "<p>Not recorded.</p>" : "<pre>" + escape(o.manifest_json) + "</pre>";
  s += "</body></html>\n";
  out.write(s);
  out.finish();
}

void HtmlReport::commit() { out_->commit(); }

}  // namespace envsift
