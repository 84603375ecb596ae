// The next round's decisions file (--decisions-template): the top --decisions-template-top open
// suspects, worst first, with their rank, score, flags and reasons and an empty decision to fill
// in (an `unsure` one keeps its decision and note), then every record decided in earlier rounds
// as it was decided — so the file, filled in, is read back as the next run's --decisions as it
// is (review/decisions.hpp). RFC 4180 CSV, as spreadsheets open and save it.
#include <algorithm>
#include <map>

#include "envsift/errors.hpp"
#include "envsift/review/decisions.hpp"
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/output_registry.hpp"
#include "envsift/write/value_format.hpp"

namespace envsift {
namespace {

class DecisionsTemplateOutput : public RecordSink {
 public:
  explicit DecisionsTemplateOutput(const std::string& path) : out_(path, CellStyle::spreadsheet_safe) {}
  std::string name() const override { return "decisions-template"; }

  void begin(const RunContext& run) override {
    const std::string& id_column = run.inputs.id_column;
    const auto& columns = run.table.points.columns;
    const auto id = std::find(columns.begin(), columns.end(), id_column);
    if (id == columns.end())
      throw UsageError("--decisions-template lists records by their ID, but the points have no '" +
                       id_column + "' column; name the ID column with --id-column");
    id_ = static_cast<std::size_t>(id - columns.begin());
    top_ = run.outputs.decisions_template_top;
    if (run.decisions)  // earlier decisions, to carry over with who and when
      for (const auto& row : run.decisions->rows) earlier_[row.id] = row;
    out_.row({id_column, "scientificName", "rank", "score", "flags", "reasons", "decision", "note",
              "reviewer", "date"});
    table_ = &run.table;
  }

  void record(const RecordOutcome& o) override {
    if (!o.verdict) return;
    const Verdict& v = *o.verdict;
    const bool suspect = v.for_review() && o.rank > 0;
    if (!suspect && v.decision == Decision::none) return;  // every earlier decision is carried over
    std::vector<std::string> row{o.fields->at(id_), table_->points.taxon(o.record), o.rank ? std::to_string(o.rank) : "",
                                 v.score ? format_score(*v.score) : "", join(v.flags.empty() ? split(v.set_aside) : v.flags, ";"),
                                 join(v.reasons, "; "), decision_name(v.decision), v.decision_note, "", ""};
    if (const auto e = earlier_.find(row[0]); e != earlier_.end()) row[8] = e->second.reviewer, row[9] = e->second.date;
    (suspect ? suspects_ : decided_)[{o.rank ? o.rank : kUnranked, o.record}] = std::move(row);
    if (suspects_.size() > top_) suspects_.erase(std::prev(suspects_.end()));  // keep the best-ranked
  }

  void finish(const RunSummary&) override {
    for (const auto* rows : {&suspects_, &decided_})
      for (const auto& [rank, row] : *rows) out_.row(row);
    out_.finish();
  }
  void commit() override { out_.commit(); }

 private:
  static std::string join(const std::vector<std::string>& parts, const char* separator) {
    std::string s;
    for (const auto& p : parts) s += (s.empty() ? "" : separator) + p;
    return s;
  }
  // A valid record's set-aside "flags: reasons": its flags, for the flags column.
  static std::vector<std::string> split(const std::string& set_aside) {
    return set_aside.empty() ? std::vector<std::string>{} : std::vector<std::string>{set_aside.substr(0, set_aside.find(':'))};
  }

  CsvWriter out_;
  const RecordTable* table_ = nullptr;
  std::size_t id_ = 0, top_ = 200;
  std::map<std::string, DecisionRow> earlier_;
  static constexpr std::size_t kUnranked = static_cast<std::size_t>(-1);  // unscored records last
  std::map<std::pair<std::size_t, std::size_t>, std::vector<std::string>> suspects_, decided_;  // by (rank, record)
};

}  // namespace

std::unique_ptr<RecordSink> make_decisions_template_output(const std::string& path) {
  return std::make_unique<DecisionsTemplateOutput>(path);
}

}  // namespace envsift
