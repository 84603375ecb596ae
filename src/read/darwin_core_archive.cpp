#include "envsift/read/darwin_core_archive.hpp"

#include <memory>
#include <sys/stat.h>

#include <cpl_minixml.h>
#include <cpl_vsi.h>

#include "envsift/errors.hpp"
#include "vsi_stream.hpp"
#include "zip_directory.hpp"

namespace envsift {
namespace {

// The core's location as a path inside the archive, or an InputError: the archive may name only
// its own files.
std::string checked_location(const std::string& location, const std::string& meta_name) {
  const std::string todo = "an archive may name only its own files; give the core's name relative to meta.xml "
                           "(e.g. occurrence.txt), or give the points file itself";
  if (location.front() == '/' || location.front() == '\\' || location.find(':') != std::string::npos)
    throw InputError(meta_name, "the core's location '" + location + "' is an absolute path or a URL", todo);
  std::size_t start = 0;
  while (start <= location.size()) {
    const std::size_t end = std::min(location.find_first_of("/\\", start), location.size());
    if (location.compare(start, end - start, "..") == 0 && end - start == 2)
      throw InputError(meta_name, "the core's location '" + location + "' climbs out of the archive (..)", todo);
    start = end + 1;
  }
  return location;
}

// In a folder: no step of the location may be a symbolic link (it could lead anywhere).
void refuse_links(const std::string& folder, const std::string& location, const std::string& meta_name) {
  std::string at = folder;
  std::size_t start = 0;
  while (start < location.size()) {
    const std::size_t end = std::min(location.find('/', start), location.size());
    at += "/" + location.substr(start, end - start);
    struct stat st;
    if (::lstat(at.c_str(), &st) == 0 && S_ISLNK(st.st_mode))
      throw InputError(meta_name, "the core's location '" + location + "' passes through a symbolic link (" + at + ")",
                       "an archive may name only its own files; copy the file into the archive folder");
    start = end + 1;
  }
}

// "\t" (as the Text Guide writes it in attributes), "\\t", a real tab, "," ...
char terminator(std::string value, const std::string& meta) {
  if (value == "\\t" || value == "\t" || value.empty()) return '\t';
  if (value.size() == 1) return value[0];
  throw InputError(meta, "fieldsTerminatedBy '" + value + "' is not one character", "give the archive's core as a plain file");
}

// The term's name: the last part of its URI (http://rs.tdwg.org/dwc/terms/decimalLatitude).
std::string term_name(const std::string& uri) {
  const auto cut = uri.find_last_of("/#");
  return cut == std::string::npos ? uri : uri.substr(cut + 1);
}

// The core's columns by their terms (a field with only a default becomes a column holding it for
// every record); the id column is named `id` unless a term names it; unnamed ones column_N.
void read_core_fields(CPLXMLNode* core, const std::string& meta_name, ArchiveCore& c) {
  int id_index = -1;
  for (CPLXMLNode* n = core->psChild; n; n = n->psNext) {
    if (n->eType != CXT_Element) continue;
    const std::string tag = n->pszValue;
    if (tag == "id" || tag == "coreid") id_index = std::atoi(CPLGetXMLValue(n, "index", "-1"));
    if (tag != "field") continue;
    const std::string term = term_name(CPLGetXMLValue(n, "term", ""));
    const char* index = CPLGetXMLValue(n, "index", nullptr);
    if (term.empty()) throw InputError(meta_name, "a <field> without a term", "check the archive");
    if (!index) {
      c.defaults.emplace_back(term, CPLGetXMLValue(n, "default", ""));
      continue;
    }
    const auto i = static_cast<std::size_t>(std::atoi(index));
    if (c.columns.size() <= i) c.columns.resize(i + 1);
    c.columns[i] = term;
  }
  if (id_index >= 0) {
    if (c.columns.size() <= static_cast<std::size_t>(id_index)) c.columns.resize(static_cast<std::size_t>(id_index) + 1);
    if (c.columns[static_cast<std::size_t>(id_index)].empty()) c.columns[static_cast<std::size_t>(id_index)] = "id";
  }
  for (std::size_t i = 0; i < c.columns.size(); ++i)
    if (c.columns[i].empty()) c.columns[i] = "column_" + std::to_string(i);
}

}  // namespace

std::optional<ArchiveCore> read_archive_meta(const std::string& path) {
  VSIStatBufL st;
  if (VSIStatL(path.c_str(), &st) != 0) return std::nullopt;
  std::string root;
  std::vector<detail::ZipEntry> members;
  if (VSI_ISDIR(st.st_mode)) {
    root = path;
  } else if (!VSI_ISREG(st.st_mode)) {
    return std::nullopt;  // a pipe: its first bytes are not ours to read twice
  } else {
    char magic[4] = {};
    VSILFILE* f = VSIFOpenL(path.c_str(), "rb");
    if (!f) return std::nullopt;
    const std::size_t got = VSIFReadL(magic, 1, 4, f);
    VSIFCloseL(f);
    if (got != 4 || std::string(magic, 4) != std::string("PK\x03\x04", 4)) return std::nullopt;
    root = "/vsizip/" + path;
    members = detail::read_zip_directory(path);
  }
  const bool zipped = !members.empty() || root != path;
  auto member = [&](const std::string& name) -> std::optional<detail::ZipEntry> {
    if (!zipped) return std::nullopt;
    auto entry = detail::find_zip_entry(members, name);
    if (entry) detail::refuse_zip_link(path, *entry);
    return entry;
  };
  const std::string meta_path = root + "/meta.xml", meta_name = path + "/meta.xml";
  if (zipped && !detail::find_zip_entry(members, "meta.xml")) return std::nullopt;  // a zip, but not an archive
  const std::string xml = detail::read_whole(detail::archive_member(meta_path, meta_name, member("meta.xml")));
  if (xml.empty()) return std::nullopt;  // a zip or folder, but not an archive

  std::unique_ptr<CPLXMLNode, decltype(&CPLDestroyXMLNode)> doc(CPLParseXMLString(xml.c_str()), CPLDestroyXMLNode);
  CPLXMLNode* archive = doc ? CPLGetXMLNode(doc.get(), "=archive") : nullptr;
  CPLXMLNode* core = archive ? CPLGetXMLNode(archive, "core") : nullptr;
  if (!core) throw InputError(meta_name, "has no <archive><core> element", "check that the archive follows the Darwin Core Text Guide");
  ArchiveCore c;
  const std::string location = CPLGetXMLValue(core, "files.location", "");
  if (location.empty()) throw InputError(meta_name, "the core names no data file (<files><location>)", "check the archive");
  checked_location(location, meta_name);
  c.vsi_path = root + "/" + location;
  c.name = path + "/" + location;
  if (zipped) {
    const auto core_member = member(location);
    if (!core_member)
      throw InputError(meta_name, "the core's location '" + location + "' is not a member of the archive",
                       "check the archive's contents (unzip -l)");
    c.zip_member = true, c.crc32 = core_member->crc32, c.size = core_member->size;
  } else {
    refuse_links(path, location, meta_name);
    c.files = {meta_path, c.vsi_path};
  }
  c.delimiter = terminator(CPLGetXMLValue(core, "fieldsTerminatedBy", ","), meta_name);
  c.quoted = std::string(CPLGetXMLValue(core, "fieldsEnclosedBy", "\"")) == "\"";  // the Text Guide's defaults
  c.header_lines = static_cast<std::size_t>(std::atoi(CPLGetXMLValue(core, "ignoreHeaderLines", "0")));
  const std::string encoding = CPLGetXMLValue(core, "encoding", "UTF-8");
  if (encoding != "UTF-8" && encoding != "utf-8" && encoding != "UTF8")
    c.notes.push_back(c.name + ": meta.xml declares the encoding " + encoding +
                      "; bytes that are not UTF-8 are read as Latin-1 (latin1_converted)");
  read_core_fields(core, meta_name, c);
  if (c.columns.empty()) throw InputError(meta_name, "the core declares no fields", "check the archive");
  std::size_t extensions = 0;
  for (CPLXMLNode* n = archive->psChild; n; n = n->psNext)
    extensions += n->eType == CXT_Element && std::string(n->pszValue) == "extension";
  if (extensions)
    c.notes.push_back(path + ": " + std::to_string(extensions) + " extension file(s) of the archive are not read (only its core, " +
                      location + ")");
  return c;
}

}  // namespace envsift
