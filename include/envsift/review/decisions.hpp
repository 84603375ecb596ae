// A reviewer's decisions from an earlier round (screen --decisions FILE): one row per decided
// record — its ID (in the points' ID column, e.g. occurrenceID), a decision, and optionally a
// note, who decided and when. The file is CSV or tab-separated (the delimiter is read from the
// header line), as a spreadsheet saves it; a row with an empty decision is a record not yet
// decided (a template row left blank) and is skipped.
//   error  — confirmed wrong: left out of its taxon's reference statistics, not ranked among the
//            open suspects, written with status reviewed_error and the results it would have had;
//   valid  — confirmed right: stays in the reference and is judged, but never flagged again (what
//            would have fired is kept in its own column); ranked after the open suspects;
//   unsure — looked at, not decided: judged and flagged as usual, the note shown.
#pragma once
#include <cstddef>
#include <cstdint>
#include <map>
#include <string>
#include <vector>

#include "envsift/read/occurrence.hpp"
#include "envsift/review/decision.hpp"

namespace envsift {

struct DecisionRow {
  std::string id;
  Decision decision = Decision::none;
  std::string note, reviewer, date;
  std::size_t line = 0;  // in the decisions file
};

struct DecisionFile {
  std::string path;
  std::vector<DecisionRow> rows;  // decided rows, in file order
  std::size_t undecided = 0;      // rows with an empty decision
};

// Throws InputError (file, line, what is wrong, what to do) for a missing ID or decision column,
// a decision that is not error/valid/unsure, or an ID decided twice.
DecisionFile read_decision_file(const std::string& path, const std::string& id_column);

// The decisions as they apply to the records of one run.
struct RecordDecisions {
  std::vector<Decision> of;                       // per record (none: undecided)
  std::map<std::size_t, const DecisionRow*> row;  // per decided record: its row (note, reviewer, date)
  std::map<Decision, std::size_t> applied;        // records per decision
  std::vector<std::string> warnings;              // unknown IDs; IDs shared by several records
};

// Matches rows to records by the ID column `id_index` of `points`. An ID no record has is listed
// in one warning (a renamed or deleted record), never dropped silently; an ID several records
// share (duplicate_id) is ambiguous: its decision is applied to none of them, and said so.
RecordDecisions apply_decisions(const DecisionFile& file, const PointTable& points, std::size_t id_index);

}  // namespace envsift
