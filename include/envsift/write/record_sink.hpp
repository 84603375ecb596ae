// The one shape every output has (CSV, GIS layers, per-taxon summary, HTML report, run manifest,
// and the evaluation's in-memory tally): told the run's schema first, then each judged taxon
// while judging goes on, then every record in output order with its typed verdict and rank,
// then the run's summary. finish() writes everything under a temporary name; commit() puts it
// in place — the run commits its outputs only after all of them have finished.
#pragma once
#include <cstddef>
#include <memory>
#include <string>
#include <vector>

#include "envsift/detect/active_tests.hpp"
#include "envsift/detect/judged_taxon.hpp"
#include "envsift/detect/test_settings.hpp"
#include "envsift/review/decisions.hpp"
#include "envsift/run_summary.hpp"
#include "envsift/score/scoring.hpp"
#include "envsift/table/record_table.hpp"
#include "envsift/write/output_settings.hpp"

namespace envsift {

// What the run read, in words, for the outputs that describe it.
struct RunInputs {
  std::string points;                      // --points
  std::vector<std::string> value_columns;  // --value-columns
  std::string id_column;                   // the points' ID column
  bool single_taxon = false;               // --single-taxon
  std::string decisions;                   // --decisions, "" = none
  std::string command_line;                // how the run was invoked
};

// What an output is told of the run: its own settings, the facts the run computed (the table,
// the tests and their settings, earlier decisions as read), never the run's whole settings.
struct RunContext {
  const OutputSettings& outputs;
  const RecordTable& table;
  const ActiveTests* tests;                // null for `sample`
  const TestSettings* test_settings;       // null for `sample`
  RunInputs inputs;
  const DecisionFile* decisions = nullptr;  // --decisions as the run read it; null: none
  std::vector<std::string> header;  // the record table's columns as written
  std::vector<std::pair<std::string, std::string>> options;  // every option's value as written
  bool screened() const { return tests != nullptr; }
};

struct RecordOutcome {
  std::size_t record = 0;                           // index in the input
  const std::vector<std::string>* fields = nullptr;  // its original fields
  const std::vector<std::string>* codes = nullptr;   // its reason codes (empty: ok)
  std::size_t rank = 0;                             // 1 = most suspicious; 0 = not ranked
  const Verdict* verdict = nullptr;                 // null for `sample`
  const std::vector<std::string>* row = nullptr;    // the record table's row as written, for
                                                    // outputs that ask for it (wants_row)
  const std::string* csv_line = nullptr;            // the same row as a CSV line (wants_csv_line)
  bool with_decisions = false;                      // the run has --decisions: write their columns
};

class RecordSink {
 public:
  virtual ~RecordSink() = default;
  virtual std::string name() const = 0;  // for timings and messages
  virtual void begin(const RunContext& run) = 0;
  // Thread-safe; once per judged taxon, `verdicts[r]` for its r-th record.
  virtual void taxon(const JudgedTaxon&, const std::vector<Verdict>&) {}
  virtual void record(const RecordOutcome& outcome) = 0;  // in output order, one thread at a time
  // Whether record() needs `outcome.row` or `outcome.csv_line` (formatted in parallel, once for
  // every output).
  virtual bool wants_row() const { return false; }
  virtual bool wants_csv_line() const { return false; }
  virtual void finish(const RunSummary& summary) = 0;
  virtual void commit() = 0;
};

}  // namespace envsift
