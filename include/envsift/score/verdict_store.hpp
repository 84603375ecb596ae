// Verdicts kept on disk between judging and writing: a run over millions of records holds in
// memory only each record's score (for the ranking); its verdict — flags, reasons, every test's
// numbers — waits in a FieldStore, exactly (numbers as their bits), until it is written.
#pragma once
#include <cstddef>
#include <mutex>
#include <vector>

#include "envsift/read/field_store.hpp"
#include "envsift/score/scoring.hpp"

namespace envsift {

class VerdictStore {
 public:
  explicit VerdictStore(std::size_t records) : slot_(records, kNone) {}
  void put(std::size_t record, const Verdict& verdict);  // thread-safe; once per record
  bool has(std::size_t record) const { return slot_[record] != kNone; }
  void get(std::size_t record, Verdict& verdict) const;  // one thread

 private:
  static constexpr std::size_t kNone = static_cast<std::size_t>(-1);
  std::mutex lock_;
  FieldStore store_;
  std::vector<std::size_t> slot_;
  mutable std::vector<std::string> fields_;
};

}  // namespace envsift
