#include "envsift/run_summary.hpp"

#include <algorithm>

namespace envsift {
namespace {

std::string base_of(const std::string& code) { return code.substr(0, code.find(':')); }

// What follows the colon of a code with this base (reason_codes.hpp).
const char* suffix_noun(const std::string& base) {
  if (base == "nodata" || base == "outside_layer") return "layers";
  if (base.rfind("value_", 0) == 0 || base.rfind("elevation_", 0) == 0) return "columns";
  return "tests";
}

std::string counts(const std::map<std::string, std::size_t>& by_code) {
  std::string s;
  for (const auto& [code, count] : by_code) s += (s.empty() ? "" : ", ") + code + " " + with_thousands(count);
  return s;
}

}  // namespace

std::string with_thousands(std::size_t n) {
  std::string digits = std::to_string(n), s;
  for (std::size_t i = 0; i < digits.size(); ++i) {
    if (i && (digits.size() - i) % 3 == 0) s += ',';
    s += digits[i];
  }
  return s;
}

void RunSummary::count_codes(const std::vector<std::string>& record_codes) {
  for (std::size_t k = 0; k < record_codes.size(); ++k) {
    ++codes[record_codes[k]];
    const std::string base = base_of(record_codes[k]);
    const bool first = std::none_of(record_codes.begin(), record_codes.begin() + static_cast<std::ptrdiff_t>(k),
                                    [&](const std::string& c) { return base_of(c) == base; });
    if (first) ++code_records[base];
  }
}

std::string RunSummary::line() const {
  std::string s = "envsift: " + with_thousands(read) + " records read, " + with_thousands(scored) +
                  (screened ? " scored, " + with_thousands(flagged) + " flagged, " : " with values, ") +
                  with_thousands(read - scored) + (screened ? " not scored" : " without");
  if (!not_scored.empty()) s += " (" + counts(not_scored) + ")";
  if (!decided.empty()) {
    std::size_t all = 0;
    for (const auto& [d, count] : decided) all += count;
    s += "; " + with_thousands(all) + " decided in earlier rounds (" + counts(decided) + ")";
  }
  return s;
}

std::string RunSummary::codes_line() const {
  if (codes.empty()) return "envsift: reason codes: none";
  std::string s;
  for (auto at = codes.begin(); at != codes.end();) {
    const std::string base = base_of(at->first);
    auto end = at;
    std::size_t suffixed = 0;
    for (; end != codes.end() && base_of(end->first) == base; ++end) suffixed += end->first.size() > base.size();
    std::string item;
    if (suffixed >= 2) {  // one item for the group; code_records counts each record once
      const auto records = code_records.find(base);
      item = base + " on " + std::to_string(suffixed) + " " + suffix_noun(base) + " " +
             with_thousands(records == code_records.end() ? 0 : records->second);
      if (std::distance(at, end) > static_cast<std::ptrdiff_t>(suffixed)) item += " (and " + base + " " + with_thousands(codes.at(base)) + ")";
    } else {
      for (auto c = at; c != end; ++c) item += (item.empty() ? "" : "; ") + c->first + " " + with_thousands(c->second);
    }
    s += (s.empty() ? "" : "; ") + item;
    at = end;
  }
  return "envsift: reason codes (records): " + s;
}

}  // namespace envsift
