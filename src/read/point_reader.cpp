#include "envsift/read/point_reader.hpp"

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <unordered_map>

#include "envsift/errors.hpp"
#include "envsift/read/csv_reader.hpp"
#include "envsift/read/darwin_core_archive.hpp"
#include "envsift/read/text_encoding.hpp"
#include "table_builder.hpp"
#include "vsi_stream.hpp"

namespace envsift {
namespace {

using detail::ColumnIndex;
using detail::TableBuilder;

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return std::tolower(c); });
  return s;
}

std::string extension(const std::string& path) {
  auto dot = path.find_last_of('.');
  auto slash = path.find_last_of("/\\");
  if (dot == std::string::npos || (slash != std::string::npos && dot < slash)) return "";
  return lower(path.substr(dot + 1));
}

// `archive`: the text is a Darwin Core Archive's core, laid out as its meta.xml says.
// The delimiter: the archive's, the option's, tab for .tsv/.tab, else guessed from the header line.
char choose_delimiter(std::istream& in, const std::string& path, const ReaderOptions& o, const ArchiveCore* archive) {
  const char delimiter = archive ? archive->delimiter : o.delimiter;
  if (delimiter) return delimiter;
  const auto ext = extension(path);
  if (ext == "tsv" || ext == "tab") return '\t';
  std::string first;  // the header line, ended by LF, CR or CRLF
  for (int c = in.get(); c != std::char_traits<char>::eof() && c != '\n' && c != '\r' && first.size() < (1u << 20);
       c = in.get())
    first += static_cast<char>(c);
  in.clear();
  in.seekg(0);
  return sniff_delimiter(first);
}

// Records that span several lines (a quoted field holding a line break), said in one warning.
std::string spanning_warning(const std::string& path, std::size_t spans, const std::vector<std::string>& spanning) {
  std::string lines;
  for (const auto& l : spanning) lines += (lines.empty() ? "" : ", ") + l;
  return path + ": " + std::to_string(spans) + " record(s) span several lines, a quoted field holding a " +
         "line break (lines " + lines + (spans > spanning.size() ? ", ..." : "") +
         "; code spans_lines); if the file is a portal export or a Darwin Core Archive, quotes are "
         "plain characters there: read it with --quoting literal";
}

PointTable read_delimited(std::istream& in, const std::string& path, const ReaderOptions& o,
                          const ArchiveCore* archive = nullptr) {
  const char delimiter = choose_delimiter(in, path, o, archive);
  PointTable table;
  table.source = path;
  // no --quoting: tab-separated text literally, other delimiters (and archives that say so) by RFC 4180
  Quoting quoting = o.quoting ? *o.quoting : delimiter == '\t' ? Quoting::literal : Quoting::rfc4180;
  if (archive && !o.quoting) quoting = archive->quoted ? Quoting::rfc4180 : Quoting::literal;
  CsvReader reader(in, delimiter, path, quoting);
  std::size_t line = 0;
  if (archive) {
    std::vector<std::string> skipped;
    for (std::size_t k = 0; k < archive->header_lines; ++k) reader.next(skipped, line);
    table.columns = archive->columns;
    for (const auto& [term, value] : archive->defaults) table.columns.push_back(term);
    table.warnings = archive->notes;
  } else if (!reader.next(table.columns, line)) {
    throw InputError(path, 1, "the file is empty", "give a file with a header line and one record per line");
  }
  if (!table.columns.empty() && !table.columns.back().empty() && table.columns.back().back() == '\r')
    table.columns.back().pop_back();
  for (auto& c : table.columns) {
    bool changed;
    c = to_utf8(c, changed);
  }
  const ColumnIndex ix = detail::locate_columns(table, o);
  table.uncertainty_column = ix.uncertainty;
  const auto to_wgs84 = detail::points_crs_transformation(o.points_crs);
  TableBuilder builder(table, ix, to_wgs84.get());
  std::vector<std::string> fields;
  std::vector<std::string> spanning;  // "5-7": the lines of records that span several
  std::size_t spans = 0;
  std::size_t reported = 0;  // records told to the progress
  auto report = [&](std::size_t step) {
    if (o.progress && table.records.size() - reported >= step) o.progress->advance(table.records.size() - reported), reported = table.records.size();
  };
  if (o.progress) o.progress->stage("reading", 0, "records");
  while (reader.next(fields, line)) {
    report(std::size_t(1) << 16);
    if (fields.size() == 1 && fields[0].empty()) continue;  // blank line: not a record
    std::vector<std::string> codes;
    bool converted = false;
    for (auto& f : fields) {
      bool changed;
      f = to_utf8(f, changed);
      converted = converted || changed;
    }
    if (converted) codes.push_back(reason::latin1_converted);
    if (archive && !archive->defaults.empty()) {  // fields given only a default value in meta.xml
      const std::size_t core = archive->columns.size();
      if (fields.size() != core) codes.push_back(reason::ragged_row);
      fields.resize(core);
      for (const auto& [term, value] : archive->defaults) fields.push_back(value);
    }
    if (reader.last_line() > line) {  // never merged without a word: the code, and the lines in a warning
      codes.push_back(reason::spans_lines);
      if (spans++ < 10) spanning.push_back(std::to_string(line) + "-" + std::to_string(reader.last_line()));
    }
    builder.add(fields, line, codes);
  }
  report(1);
  if (!to_wgs84 && builder.metre_like() * 2 > table.records.size())
    table.warnings.push_back(path + ": " + std::to_string(builder.metre_like()) + " of " + std::to_string(table.records.size()) +
                             " records have coordinates out of range for degrees that look like metres: if the file "
                             "holds projected coordinates, give their CRS with --points-crs (e.g. EPSG:32631)");
  if (spans > 0) table.warnings.push_back(spanning_warning(path, spans, spanning));
  return table;
}

// Every record sharing an ID with another is kept and marked. IDs are compared by a 64-bit
// hash: sorted hashes find the duplicates in O(n log n) with 8 bytes per record.
void mark_duplicate_ids(PointTable& t) {
  std::vector<std::uint64_t> hashes;
  for (const auto& r : t.records)
    if (r.id_hash) hashes.push_back(r.id_hash);
  std::sort(hashes.begin(), hashes.end());
  // the hashes seen twice or more: usually few, so each record looks it up in a list that stays in
  // cache (a search of all 10 million hashes per record was most of the reading time)
  std::vector<std::uint64_t> repeated;
  for (std::size_t k = 1; k < hashes.size(); ++k)
    if (hashes[k] == hashes[k - 1] && (repeated.empty() || repeated.back() != hashes[k])) repeated.push_back(hashes[k]);
  hashes = {};
  if (repeated.empty()) return;
  std::unordered_map<std::uint32_t, std::uint32_t> with_duplicate;  // problem set → the same plus duplicate_id
  for (auto& r : t.records) {
    if (!r.id_hash || !std::binary_search(repeated.begin(), repeated.end(), r.id_hash)) continue;
    auto it = with_duplicate.find(r.problems);
    if (it == with_duplicate.end()) {
      std::vector<std::string> codes = t.problem_sets[r.problems];
      codes.push_back(reason::duplicate_id);
      t.problem_sets.push_back(std::move(codes));
      it = with_duplicate.emplace(r.problems, static_cast<std::uint32_t>(t.problem_sets.size() - 1)).first;
    }
    r.problems = it->second;
  }
}

// Taxon names that look like one (letter case, authorship) are screened apart and listed together.
void list_lookalike_names(PointTable& t) {
  const auto groups = names_that_look_alike(t.taxa);
  t.similar_names.assign(t.taxa.size(), "");
  if (groups.empty()) return;
  std::unordered_map<std::string, std::size_t> index;
  for (std::size_t i = 0; i < t.taxa.size(); ++i) index[t.taxa[i]] = i;
  std::string shown;
  for (std::size_t g = 0; g < groups.size(); ++g) {
    std::string all;
    for (const auto& name : groups[g]) all += (all.empty() ? "'" : "', '") + name;
    if (g < 5) shown += (shown.empty() ? "" : "; ") + all + "'";
    for (const auto& name : groups[g]) {
      std::string others;
      for (const auto& other : groups[g])
        if (other != name) others += (others.empty() ? "" : "; ") + other;
      t.similar_names[index[name]] = others;
    }
  }
  t.warnings.push_back(t.source + ": " + std::to_string(groups.size()) +
                       " group(s) of taxon names look like one taxon (they differ only by letter case or an "
                       "authorship) and are screened apart: " + shown + (groups.size() > 5 ? "; ..." : "") +
                       "; if they are one taxon, write them alike in the source (the summary's similar_names lists them)");
}

// What every points table gets once read: duplicate IDs marked, look-alike names listed.
void finish_table(PointTable& t) {
  mark_duplicate_ids(t);  // every record sharing an ID is kept and marked
  list_lookalike_names(t);
}

}  // namespace

PointTable read_points_from_text(std::istream& in, const std::string& source_name, const ReaderOptions& options) {
  PointTable t = read_delimited(in, source_name, options);
  finish_table(t);
  return t;
}

bool is_delimited_text(const std::string& path) {
  auto ext = extension(path);
  return ext == "csv" || ext == "tsv" || ext == "tab" || ext == "txt";
}

PointTable read_points(const std::string& path, const ReaderOptions& options) {
  std::error_code ec;
  if (path != "-" && std::filesystem::is_directory(path, ec) && !std::filesystem::exists(path + "/meta.xml", ec))
    throw InputError(path, "is not a file (a directory?)", "give the path of the points file itself, or of a Darwin Core Archive folder");
  if (path != "-")
    if (const auto core = read_archive_meta(path)) {  // a Darwin Core Archive (zip or folder)
      detail::VsiInput in(detail::archive_member(
          core->vsi_path, core->name,
          core->zip_member ? std::optional<detail::ZipEntry>(detail::ZipEntry{"", core->crc32, core->size, false, false})
                           : std::nullopt));
      if (!in) throw InputError(core->name, "cannot open the archive's core file", "check the archive");
      PointTable t = read_delimited(in, core->name, options, &*core);
      finish_table(t);
      return t;
    }
  const detail::TextSource source = detail::locate_text(path);  // plain, gzip, one file in a zip, stdin
  if (!source.text) {
    PointTable t = detail::read_vector(path, options);
    finish_table(t);
    return t;
  }
  detail::VsiInput in(source);
  if (!in) throw InputError(source.name, "cannot open the points file", "check the path and its read permission");
  return read_points_from_text(in, source.name, options);
}

}  // namespace envsift
