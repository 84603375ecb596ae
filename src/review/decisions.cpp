#include "envsift/review/decisions.hpp"

#include <algorithm>
#include <cctype>
#include <fstream>
#include <iterator>
#include <sstream>
#include <unordered_map>

#include "envsift/errors.hpp"
#include "envsift/spreadsheet_cells.hpp"
#include "envsift/read/csv_reader.hpp"
#include "envsift/run_summary.hpp"

namespace envsift {
namespace {

std::string trimmed_lower(std::string s) {
  const auto first = s.find_first_not_of(" \t\r");
  if (first == std::string::npos) return "";
  s = s.substr(first, s.find_last_not_of(" \t\r") - first + 1);
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return s;
}

std::string trimmed(const std::string& s) {
  const auto first = s.find_first_not_of(" \t\r");
  return first == std::string::npos ? "" : s.substr(first, s.find_last_not_of(" \t\r") - first + 1);
}

std::string listed(const std::vector<std::string>& items, std::size_t total) {
  std::string s;
  for (const auto& i : items) s += (s.empty() ? "" : ", ") + i;
  if (total > items.size()) s += ", ... (" + with_thousands(total) + " in all)";
  return s;
}

}  // namespace

const char* decision_name(Decision d) {
  switch (d) {
    case Decision::error: return "error";
    case Decision::valid: return "valid";
    case Decision::unsure: return "unsure";
    case Decision::none: break;
  }
  return "";
}

DecisionFile read_decision_file(const std::string& path, const std::string& id_column) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, "cannot open the decisions file", "check the path given to --decisions");
  // read whole (a reviewer's file is small) so that a pipe (--decisions <(...)) is read once, as a file
  const std::string whole{std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
  std::istringstream text(whole);
  CsvReader reader(text, sniff_delimiter(whole.substr(0, whole.find_first_of("\r\n"))), path);
  std::vector<std::string> columns, fields;
  std::size_t line = 0;
  if (!reader.next(columns, line))
    throw InputError(path, 1, "the decisions file is empty", "start it with screen --decisions-template FILE");
  for (auto& c : columns) c = trimmed(c);
  if (!columns.empty() && columns[0].rfind("\xEF\xBB\xBF", 0) == 0) columns[0].erase(0, 3);  // a spreadsheet's BOM
  auto find = [&](const std::string& name) -> std::ptrdiff_t {
    const auto it = std::find(columns.begin(), columns.end(), name);
    return it == columns.end() ? -1 : it - columns.begin();
  };
  const std::ptrdiff_t id = find(id_column), decision = find("decision");
  if (id < 0 || decision < 0)
    throw InputError(path, 1, "the decisions file needs the columns '" + id_column + "' and 'decision'",
                     "name its ID column as the points' ID column (--id-column) and add a 'decision' column "
                     "(error, valid or unsure); screen --decisions-template writes such a file");
  const std::ptrdiff_t note = find("note"), reviewer = find("reviewer"), date = find("date");
  DecisionFile file;
  file.path = path;
  std::unordered_map<std::string, std::size_t> seen;  // ID → line
  while (reader.next(fields, line)) {
    if (fields.size() == 1 && trimmed(fields[0]).empty()) continue;  // a blank line
    for (auto& f : fields) f = from_spreadsheet_safe(f);  // the template's neutralised cells, as they were
    fields.resize(columns.size());
    DecisionRow row;
    row.line = line;
    row.id = trimmed(fields[static_cast<std::size_t>(id)]);
    const std::string word = trimmed_lower(fields[static_cast<std::size_t>(decision)]);
    if (word.empty()) {
      ++file.undecided;
      continue;
    }
    if (word == "error") row.decision = Decision::error;
    else if (word == "valid") row.decision = Decision::valid;
    else if (word == "unsure") row.decision = Decision::unsure;
    else
      throw InputError(path, line, "decision '" + fields[static_cast<std::size_t>(decision)] + "' is not error, valid or unsure",
                       "write one of the three, or leave it empty for a record not yet decided");
    if (row.id.empty())
      throw InputError(path, line, "a decision without a record ID", "fill in the '" + id_column + "' column or delete the row");
    if (const auto [at, added] = seen.emplace(row.id, line); !added)
      throw InputError(path, line, "record '" + row.id + "' is decided twice (also on line " + std::to_string(at->second) + ")",
                       "keep one row per record");
    if (note >= 0) row.note = trimmed(fields[static_cast<std::size_t>(note)]);
    if (reviewer >= 0) row.reviewer = trimmed(fields[static_cast<std::size_t>(reviewer)]);
    if (date >= 0) row.date = trimmed(fields[static_cast<std::size_t>(date)]);
    file.rows.push_back(std::move(row));
  }
  return file;
}

RecordDecisions apply_decisions(const DecisionFile& file, const PointTable& points, std::size_t id_index) {
  const std::size_t n = points.records.size();
  RecordDecisions d;
  d.of.assign(n, Decision::none);
  std::unordered_map<std::string, std::vector<std::size_t>> by_id;  // only the decided IDs
  for (const auto& row : file.rows) by_id[row.id];
  std::vector<std::string> fields;
  for (std::size_t i = 0; i < n; ++i) {
    points.fields.read(i, fields);
    if (const auto it = by_id.find(trimmed(fields.at(id_index))); it != by_id.end()) it->second.push_back(i);
  }
  std::vector<std::string> unknown, shared;
  std::size_t unknown_count = 0, shared_count = 0;
  for (const auto& row : file.rows) {
    const auto& records = by_id.at(row.id);
    if (records.empty()) {
      if (unknown.size() < 10) unknown.push_back(row.id);
      ++unknown_count;
    } else if (records.size() > 1) {
      if (shared.size() < 10) shared.push_back(row.id + " (" + std::to_string(records.size()) + " records)");
      ++shared_count;
    } else {
      d.of[records[0]] = row.decision;
      d.row[records[0]] = &row;
      ++d.applied[row.decision];
    }
  }
  if (unknown_count)
    d.warnings.push_back(file.path + ": " + with_thousands(unknown_count) +
                         " decided record(s) are not in the points (renamed or deleted?): " + listed(unknown, unknown_count));
  if (shared_count)
    d.warnings.push_back(file.path + ": " + with_thousands(shared_count) +
                         " decided ID(s) belong to several records (duplicate_id), so the decision is applied to none of "
                         "them — give the records distinct IDs: " + listed(shared, shared_count));
  return d;
}

}  // namespace envsift
