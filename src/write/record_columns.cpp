#include "envsift/write/record_columns.hpp"

#include <charconv>
#include <string_view>

#include "envsift/reason_codes.hpp"
#include "envsift/spreadsheet_cells.hpp"
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/value_format.hpp"

namespace envsift {
namespace {

// Every cell of a record's row, in column order, as text handed to `cell` (a string_view valid
// only during the call): the one definition of the row, for both its forms below.
template <class Cell>
void each_cell(const RecordTable& t, const RecordOutcome& o, Cell&& cell) {
  char number[kNumberChars];
  auto put = [&](char* end) { cell(std::string_view(number, static_cast<std::size_t>(end - number))); };
  for (const auto& f : *o.fields) cell(std::string_view(f));
  const auto r = static_cast<Eigen::Index>(o.record);
  for (std::size_t l = 0; l < t.layers.size(); ++l) {
    const bool derived = !t.layers[l].derived_from.empty();
    if (t.layers_are_columns && !derived) continue;  // already an input column
    const auto c = static_cast<Eigen::Index>(l);
    const bool float32 = t.layers[l].float32_values;
    put(put_value(number, t.values(r, c), float32));
    if (t.has_discs && !derived) {
      put(put_value(number, t.discs.min(r, c), float32));
      put(put_statistic(number, t.discs.mean(r, c)));
      put(put_value(number, t.discs.max(r, c), float32));
    }
  }
  std::string joined;
  auto join = [&](const std::vector<std::string>& parts, std::string_view separator) {
    joined.clear();
    for (const auto& p : parts) (joined.empty() ? joined : joined.append(separator)).append(p);
    if (starts_like_formula(joined)) joined.insert(0, 1, '\'');  // envsift's own text, never a formula
    cell(std::string_view(joined));
  };
  if (o.codes->empty()) cell(std::string_view(reason::ok));
  else join(*o.codes, ";");
  if (!o.verdict) return;
  const Verdict& v = *o.verdict;
  if (o.rank) put(std::to_chars(number, number + kNumberChars, o.rank).ptr);
  else cell(std::string_view());
  if (v.score) put(put_score(number, *v.score));
  else cell(std::string_view());
  join(v.flags, ";");
  join(v.reasons, "; ");  // begins with a layer or value column's name: see spreadsheet_cells.hpp
  if (o.with_decisions) {
    cell(std::string_view(decision_name(v.decision)));
    cell(std::string_view(v.decision_note));
    cell(std::string_view(v.set_aside));
  }
  put(put_probability(number, v.probability));
  for (const TestResult& test : v.tests) {
    put(test.tested ? put_statistic(number, test.statistic) : number);
    put(test.tested ? put_statistic(number, test.threshold) : number);
    put(test.tested ? put_probability(number, test.probability) : number);
    for (double extra : test.extras) put(test.tested ? put_statistic(number, extra) : number);
  }
}

}  // namespace

std::vector<std::string> added_columns(const ActiveTests* tests, const std::string& prefix, bool decisions) {
  std::vector<std::string> added{prefix + "status"};
  if (!tests) return added;
  for (const char* c : {"rank", "score", "flags", "reasons"}) added.push_back(prefix + c);
  if (decisions)
    for (const char* c : {"decision", "decision_note", "set_aside"}) added.push_back(prefix + c);
  added.push_back(prefix + "probability");
  const auto extras = tests->extra_columns();
  const auto names = tests->names();
  for (std::size_t t = 0; t < names.size(); ++t) {
    added.push_back(prefix + names[t] + "_stat");
    added.push_back(prefix + names[t] + "_cutoff");
    added.push_back(prefix + names[t] + "_p");
    for (const auto& extra : extras[t]) added.push_back(prefix + names[t] + "_" + extra);
  }
  return added;
}

std::vector<std::string> record_header(const RecordTable& t, const ActiveTests* tests, const std::string& prefix,
                                       bool decisions) {
  std::vector<std::string> h = t.points.columns;
  for (const auto& l : t.layers) {
    if (t.layers_are_columns && l.derived_from.empty()) continue;  // already an input column
    h.push_back(l.spec.name);
    if (t.has_discs && l.derived_from.empty())
      for (const char* s : {"_min", "_mean", "_max"}) h.push_back(l.spec.name + s);
  }
  const auto added = added_columns(tests, prefix, decisions);
  h.insert(h.end(), added.begin(), added.end());
  return h;
}

std::vector<std::string> record_row(const RecordTable& t, const RecordOutcome& o) {
  std::vector<std::string> row;
  each_cell(t, o, [&](std::string_view text) { row.emplace_back(text); });
  return row;
}

void append_record_csv(const RecordTable& t, const RecordOutcome& o, std::string& line) {
  bool first = true;
  each_cell(t, o, [&](std::string_view text) {
    if (!first) line += ',';
    first = false;
    append_csv_field(line, text);
  });
  line += '\n';
}

}  // namespace envsift
