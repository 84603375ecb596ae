#include "envsift/run_summary.hpp"

namespace envsift {
namespace {

std::string counts(const std::map<std::string, std::size_t>& by_code) {
  std::string s;
  for (const auto& [code, count] : by_code) s += (s.empty() ? "" : ", ") + code + " " + std::to_string(count);
  return s;
}

}  // namespace

std::string RunSummary::line() const {
  std::string s = "envsift: " + std::to_string(read) + " records read, " + std::to_string(scored) +
                  (screened ? " scored, " + std::to_string(flagged) + " flagged, " : " with values, ") +
                  std::to_string(read - scored) + (screened ? " not scored" : " without");
  if (!not_scored.empty()) s += " (" + counts(not_scored) + ")";
  return s;
}

std::string RunSummary::codes_line() const {
  return "envsift: reason codes: " + (codes.empty() ? std::string("none") : counts(codes));
}

}  // namespace envsift
