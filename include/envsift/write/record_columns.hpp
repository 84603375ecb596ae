// The record table as the CSV and GIS outputs write it: each record's original fields, each
// layer's value (with its uncertainty disc's min/mean/max), `status`, and for a screen `rank`,
// `score`, `flags`, `reasons` and every test's statistic, cutoff and extra columns.
#pragma once
#include <string>
#include <vector>

#include "envsift/write/record_sink.hpp"

namespace envsift {

// The columns envsift appends after the layers' (status, and for a screen its verdict's), each
// with `prefix` in front (--column-prefix: for inputs that have a `status` or `rank` of their own).
// `decisions`: the run was given a reviewer's decisions (decision, decision_note, set_aside).
std::vector<std::string> added_columns(const ActiveTests* tests, const std::string& prefix = "", bool decisions = false);
std::vector<std::string> record_header(const RecordTable& table, const ActiveTests* tests, const std::string& prefix = "",
                                       bool decisions = false);
std::vector<std::string> record_row(const RecordTable& table, const RecordOutcome& outcome);
// The same row as one CSV line (RFC 4180, ending in \n), appended to `line`: no string per cell.
void append_record_csv(const RecordTable& table, const RecordOutcome& outcome, std::string& line);

}  // namespace envsift
