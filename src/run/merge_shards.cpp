#include <algorithm>
#include <fstream>
#include <memory>
#include <optional>
#include <sstream>

#include "envsift/errors.hpp"
#include "envsift/read/csv_reader.hpp"
#include "envsift/reason_codes.hpp"
#include "envsift/run/output_paths.hpp"
#include "envsift/run/run.hpp"
#include "envsift/score/scoring.hpp"
#include "envsift/write/csv_writer.hpp"
#include "shard_runs.hpp"

namespace envsift {

namespace {

// The shard outputs read side by side, row by row; each row comes from the one shard that owns
// it, the others mark it other_shard.
class ShardRows {
 public:
  explicit ShardRows(const std::vector<std::string>& paths) : paths_(paths), shards_(paths.size()) {}

  // (Re)opens every shard and checks that their columns agree.
  void open() {
    for (std::size_t s = 0; s < paths_.size(); ++s) {
      shards_[s].in = std::ifstream(paths_[s], std::ios::binary);
      if (!shards_[s].in) throw InputError(paths_[s], "cannot open the shard output", "check the path");
      shards_[s].reader = std::make_unique<CsvReader>(shards_[s].in, ',', paths_[s]);
      std::vector<std::string> h;
      std::size_t line;
      if (!shards_[s].reader->next(h, line)) throw InputError(paths_[s], 1, "the file is empty", "give the outputs of envsift screen --shard");
      if (s == 0) header_ = h;
      else if (h != header_)
        throw InputError(paths_[s], 1, "its columns differ from " + paths_[0] + "'s", "merge the shards of one run only");
    }
  }
  const std::vector<std::string>& header() const { return header_; }

  // The next row from its owner (`status`: the status column); false after the last.
  bool next(std::vector<std::string>& picked, std::size_t row_number, std::size_t status) {
    std::vector<std::string> fields;
    std::size_t line = 0, owners = 0, ended = 0;
    for (std::size_t s = 0; s < shards_.size(); ++s) {
      if (!shards_[s].reader->next(fields, line)) {
        ++ended;
        continue;
      }
      if (fields.size() != header_.size())
        throw InputError(paths_[s], line, "row has " + std::to_string(fields.size()) + " fields, the header " +
                                              std::to_string(header_.size()), "merge unmodified shard outputs");
      if (fields[status] != reason::other_shard) {
        ++owners;
        picked = fields;
      }
    }
    if (ended == shards_.size()) return false;
    if (ended || owners != 1)
      throw InputError(paths_[0], row_number + 1,
                       ended ? "the shard outputs have different numbers of rows"
                             : std::to_string(owners) + " shards claim this row",
                       "merge all shards 0..N-1 of one run, each once");
    return true;
  }

 private:
  struct Shard {
    std::ifstream in;
    std::unique_ptr<CsvReader> reader;
  };
  const std::vector<std::string>& paths_;
  std::vector<Shard> shards_;
  std::vector<std::string> header_;
};

// envsift's columns: status, rank, score, flags, reasons in a row, after the input's (with the
// run's --column-prefix, whatever it was); the index of status.
std::size_t verdict_columns(const std::vector<std::string>& header, const std::string& path) {
  for (std::size_t k = header.size(); k-- > 0;) {
    const std::string& h = header[k];
    if (h.size() < 6 || h.compare(h.size() - 6, 6, "status") != 0 || k + 4 >= header.size()) continue;
    const std::string p = h.substr(0, h.size() - 6);
    if (header[k + 1] == p + "rank" && header[k + 2] == p + "score" && header[k + 3] == p + "flags" &&
        header[k + 4] == p + "reasons")
      return k;
  }
  throw InputError(path, 1, "no status, rank, score, flags and reasons columns: not an envsift screen output",
                   "merge the outputs of envsift screen --shard I/N");
}

Decision decision_of(const std::string& word) {
  return word == "error" ? Decision::error : word == "valid" ? Decision::valid : word == "unsure" ? Decision::unsure : Decision::none;
}

// One merged row counted as one run counts it.
void count_row(RunSummary& summary, const std::string& status, bool scored, bool flagged, Decision d) {
  ++summary.read;
  std::vector<std::string> codes;
  std::stringstream status_text(status);
  for (std::string code; std::getline(status_text, code, ';');)
    if (code != reason::ok) codes.push_back(code);
  summary.count_codes(codes);
  if (scored) ++summary.scored;
  else ++summary.not_scored[reason::why_not_scored(codes)];
  if (d != Decision::none) ++summary.decided[decision_name(d)];
  if (flagged && d != Decision::error) ++summary.flagged;
}

}  // namespace

RunSummary merge_shards(const std::vector<std::string>& paths, const std::string& out_path) {
  if (paths.empty()) throw UsageError("give the shard outputs: envsift merge SHARD_OUTPUT... --out FILE.csv");
  std::vector<NamedPath> inputs;
  for (const auto& p : paths) inputs.push_back({"a shard output", p});
  refuse_unsafe_outputs({{"--out", out_path}}, inputs);
  run::check_shards_of_one_run(paths);
  ShardRows shards(paths);
  shards.open();
  const std::vector<std::string> header = shards.header();
  const std::size_t status = verdict_columns(header, paths[0]), rank = status + 1, score = status + 2, flags = status + 3;
  // a run with --decisions: its decision column follows reasons, and decided records rank after the open ones
  const std::string prefix = header[status].substr(0, header[status].size() - 6);
  const bool decided = status + 5 < header.size() && header[status + 5] == prefix + "decision";
  // Pass 1: every row's score, to rank them as one run would.
  std::vector<std::optional<double>> scores;
  std::vector<std::uint8_t> tiers;
  std::vector<std::string> row;
  while (shards.next(row, scores.size() + 1, status)) {
    scores.push_back(row[score].empty() ? std::nullopt : std::optional<double>(std::stod(row[score])));
    if (decided) tiers.push_back(review_tier(decision_of(row[status + 5])));
  }
  const auto ranks = rank_by_score(scores, tiers);
  // Pass 2: the rows again, with their rank.
  shards.open();
  RunSummary summary;
  CsvWriter out(out_path);
  out.row(header);
  for (std::size_t i = 0; shards.next(row, i + 1, status); ++i) {
    row[rank] = ranks[i] ? std::to_string(ranks[i]) : "";
    count_row(summary, row[status], scores[i].has_value(), !row[flags].empty(),
              decided ? decision_of(row[status + 5]) : Decision::none);
    out.row(row);
  }
  out.finish();
  pause_before_commit_for_tests();
  out.commit();
  return summary;
}

}  // namespace envsift
