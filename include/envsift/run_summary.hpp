// Where the records of a run went: every record read is counted once as scored or as not
// scorable, with the warnings and the time each stage took.
#pragma once
#include <cstddef>
#include <map>
#include <string>
#include <vector>

#include "envsift/stopwatch.hpp"

namespace envsift {

struct RunSummary {
  bool screened = true;  // false for `sample`: nothing is flagged there
  std::size_t read = 0;
  std::size_t scored = 0;
  std::size_t flagged = 0;  // open suspects: flagged and not decided error or valid
  std::map<std::string, std::size_t> decided;     // --decisions: records per decision (error, valid, unsure)
  std::map<std::string, std::size_t> not_scored;  // by the code that prevented scoring (reason::why_not_scored)
  std::map<std::string, std::size_t> codes;       // every reason code, over all records
  std::map<std::string, std::size_t> code_records;  // by a code's part before ':' (nodata), records with any
  std::vector<std::string> warnings;              // e.g. a layer no record falls on
  StageSeconds seconds;                           // time per stage (and per test, CPU time)
  std::string memory;                             // the estimate of the run's peak memory, in words
  std::string line() const;                       // one line for stderr
  // One line: every code and its count; a code on several layers, columns or tests as one item
  // with the records it touches (`nodata on 19 layers 187,000`), so a big run's line stays short.
  std::string codes_line() const;
  void count_codes(const std::vector<std::string>& record_codes);  // one record's codes
};

// 1234567 → "1,234,567": counts on stderr.
std::string with_thousands(std::size_t n);

}  // namespace envsift
