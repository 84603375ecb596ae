// The HTML report (`screen --report FILE.html`): one self-contained file a reviewer opens in any
// browser, without network access or JavaScript. From the top: a caution, the run overview
// (inputs, layers, tests and cutoffs, where every record went), the worst suspects across all
// taxa, an index of taxa, one section per taxon (its suspects with values and reasons, and its
// pictures, see taxon_plots.hpp), and the run manifest.
//
// Large runs: pictures are SVG documents inside <img> elements with loading="lazy", and every
// taxon section has `content-visibility: auto`, so a browser lays out and draws only the taxa
// scrolled to; the sections wait on disk (a FieldStore) until the file is assembled.
#pragma once
#include <cstddef>
#include <cstdint>
#include <map>
#include <memory>
#include <mutex>
#include <optional>
#include <string>
#include <vector>

#include "envsift/read/field_store.hpp"
#include "envsift/write/atomic_file.hpp"
#include "envsift/write/report/taxon_plots.hpp"

namespace envsift {

struct ReportSuspect {
  std::size_t rank = 0;
  std::string record, taxon, score, flags, reasons;
  std::size_t taxon_index = static_cast<std::size_t>(-1);  // its section; -1: none
};

struct ReportOverview {
  std::string title;
  std::vector<std::pair<std::string, std::string>> inputs;  // (what, path or text)
  std::vector<std::string> tests;                           // one line per test: what it flags
  std::size_t read = 0, scored = 0, flagged = 0;            // flagged: open suspects
  bool with_decisions = false;                              // --decisions was given
  std::map<std::string, std::size_t> decided;               // records per decision
  std::map<std::string, std::size_t> not_scored;            // by reason code
  std::map<std::string, std::size_t> codes;                 // every reason code
  std::vector<std::string> warnings;
  std::vector<ReportSuspect> top;                            // highest ranks first
  std::string manifest_json;                                 // may be empty
};

struct ReliefSource {
  std::string path;  // empty: maps without relief
  int band = 1;
};

// A taxon as the index lists it.
struct TaxonListing {
  std::string name;
  std::size_t records = 0, judged = 0, suspects = 0;  // suspects: open ones
  std::size_t decided = 0;                            // records decided in earlier rounds
};

class HtmlReport {
 public:
  explicit HtmlReport(std::string path, ReliefSource relief = {}, std::uint64_t seed = 1, std::size_t min_rows = 10);

  // Thread-safe. `index`: the taxon's position in the index (taxa are listed in this order).
  void list_taxon(std::size_t index, const TaxonListing& listing);
  // A taxon's section (its pictures and suspects); thread-safe, writes nothing.
  std::string section(std::size_t index, const TaxonPicture& picture, std::size_t judged) const;
  // Thread-safe: the taxon gets this section (a listed taxon without one is listed unlinked).
  void add_section(std::size_t index, const std::string& section);
  // Writes the file under its temporary name; the anchors of the taxa are "taxon-<index>".
  void finish(const ReportOverview& overview);
  void commit();  // puts it in place

 private:
  struct Entry {
    TaxonListing listing;
    std::optional<std::size_t> section;  // in sections_
  };
  std::string path_;
  std::unique_ptr<AtomicFile> out_;
  ReliefSource relief_;
  std::uint64_t seed_;
  std::size_t min_rows_;
  std::mutex lock_;
  FieldStore sections_;
  std::map<std::size_t, Entry> taxa_;
};

std::string taxon_anchor(std::size_t index);

}  // namespace envsift
