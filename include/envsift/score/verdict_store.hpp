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
  // `memory_bytes`: verdicts kept in memory before they go to disk (FieldStore).
  explicit VerdictStore(std::size_t records, std::size_t memory_bytes = 0) : store_(memory_bytes), slot_(records, kNone) {}
  void put(std::size_t record, const Verdict& verdict);  // thread-safe; once per record
  bool has(std::size_t record) const { return slot_[record] != kNone; }
  // Safe from several threads at once once judging is over; `scratch` is the caller's to reuse.
  struct Scratch {
    std::string bytes;
    std::vector<std::string> fields;
  };
  void get(std::size_t record, Verdict& verdict, Scratch& scratch) const;

 private:
  static constexpr std::size_t kNone = static_cast<std::size_t>(-1);
  std::mutex lock_;
  FieldStore store_;
  std::vector<std::size_t> slot_;
};

}  // namespace envsift
