// A test of one record on its own (the reported elevation against the DEM), beside the taxon
// tests of detector.hpp: it is prepared once from the whole table, then judges any record,
// taxon or not. Its findings are scored like every test's.
#pragma once
#include <cstddef>
#include <string>

#include "envsift/detect/detector.hpp"

namespace envsift {

struct RecordTable;

class RecordCheck {
 public:
  virtual ~RecordCheck() = default;
  virtual std::string name() const = 0;  // the word written to `flags`, and the prefix of its columns
  // Once, before judging; may add reason codes to the table (e.g. an unreadable elevation).
  virtual void prepare(RecordTable& table) = 0;
  virtual Finding judge(std::size_t record) const = 0;  // thread-safe
};

}  // namespace envsift
