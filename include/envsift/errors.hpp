// Errors that stop a run. Each maps to a distinct process exit code so batch jobs can tell
// "you called it wrong" from "your data is broken" from "we could not write" from "our bug".
#pragma once
#include <stdexcept>
#include <string>

namespace envsift {

enum class ExitCode : int {
  ok = 0,
  usage = 2,         // bad command line
  bad_input = 3,     // an input file is missing, unreadable or malformed
  output_failed = 4, // an output could not be written
  internal = 5,      // a bug in envsift: please report it
  out_of_memory = 6, // the run needed more memory than it could get
};

class Error : public std::runtime_error {
 public:
  Error(ExitCode code, const std::string& message) : std::runtime_error(message), code_(code) {}
  ExitCode code() const { return code_; }

 private:
  ExitCode code_;
};

class UsageError : public Error {
 public:
  explicit UsageError(const std::string& m) : Error(ExitCode::usage, m) {}
};

// "FILE:LINE: what is wrong; what to do" in one line.
class InputError : public Error {
 public:
  InputError(const std::string& file, std::size_t line, const std::string& what, const std::string& todo);
  InputError(const std::string& file, const std::string& what, const std::string& todo);
};

class OutputError : public Error {
 public:
  OutputError(const std::string& file, const std::string& what);
};

}  // namespace envsift
