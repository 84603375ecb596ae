// Progress of a long run, reported by the library and shown by the command line (a live line on
// a terminal, periodic log lines otherwise). Every method may be called from several threads.
#pragma once
#include <cstddef>
#include <string>

namespace envsift {

class Progress {
 public:
  virtual ~Progress() = default;
  // A new stage ("sampling", "screening", ...) of `total` units ("records", "taxa").
  virtual void stage(const std::string& name, std::size_t total, const std::string& unit) = 0;
  virtual void advance(std::size_t done) = 0;  // `done` more units of the current stage
  virtual void finish() = 0;                   // the run is over
};

}  // namespace envsift
