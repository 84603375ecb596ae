#include "envsift/write/record_columns.hpp"

#include "envsift/reason_codes.hpp"
#include "envsift/write/value_format.hpp"

namespace envsift {
namespace {

std::string join(const std::vector<std::string>& parts, const char* separator) {
  std::string s;
  for (const auto& p : parts) s += (s.empty() ? "" : separator) + p;
  return s;
}

}  // namespace

std::vector<std::string> added_columns(const ActiveTests* tests, const std::string& prefix) {
  std::vector<std::string> added{prefix + "status"};
  if (!tests) return added;
  for (const char* c : {"rank", "score", "flags", "reasons"}) added.push_back(prefix + c);
  const auto extras = tests->extra_columns();
  const auto names = tests->names();
  for (std::size_t t = 0; t < names.size(); ++t) {
    added.push_back(prefix + names[t] + "_stat");
    added.push_back(prefix + names[t] + "_cutoff");
    for (const auto& extra : extras[t]) added.push_back(prefix + names[t] + "_" + extra);
  }
  return added;
}

std::vector<std::string> record_header(const RecordTable& t, const ActiveTests* tests, const std::string& prefix) {
  std::vector<std::string> h = t.points.columns;
  for (const auto& l : t.layers) {
    if (t.layers_are_columns && l.derived_from.empty()) continue;  // already an input column
    h.push_back(l.spec.name);
    if (t.has_discs && l.derived_from.empty())
      for (const char* s : {"_min", "_mean", "_max"}) h.push_back(l.spec.name + s);
  }
  const auto added = added_columns(tests, prefix);
  h.insert(h.end(), added.begin(), added.end());
  return h;
}

std::vector<std::string> record_row(const RecordTable& t, const RecordOutcome& o) {
  std::vector<std::string> row = *o.fields;
  const auto r = static_cast<Eigen::Index>(o.record);
  for (std::size_t l = 0; l < t.layers.size(); ++l) {
    const bool derived = !t.layers[l].derived_from.empty();
    if (t.layers_are_columns && !derived) continue;  // already an input column
    const auto c = static_cast<Eigen::Index>(l);
    const bool float32 = t.layers[l].float32_values;
    row.push_back(format_value(t.values(r, c), float32));
    if (t.has_discs && !derived) {
      row.push_back(format_value(t.discs.min(r, c), float32));
      row.push_back(format_statistic(t.discs.mean(r, c)));
      row.push_back(format_value(t.discs.max(r, c), float32));
    }
  }
  row.push_back(o.codes->empty() ? reason::ok : join(*o.codes, ";"));
  if (!o.verdict) return row;
  const Verdict& v = *o.verdict;
  row.push_back(o.rank ? std::to_string(o.rank) : "");
  row.push_back(v.score ? format_score(*v.score) : "");
  row.push_back(join(v.flags, ";"));
  row.push_back(join(v.reasons, "; "));
  for (const TestResult& test : v.tests) {
    row.push_back(test.tested ? format_statistic(test.statistic) : "");
    row.push_back(test.tested ? format_statistic(test.threshold) : "");
    for (double extra : test.extras) row.push_back(test.tested ? format_statistic(extra) : "");
  }
  return row;
}

}  // namespace envsift
