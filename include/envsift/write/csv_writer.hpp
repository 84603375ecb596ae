// Step 6 of the pipeline: write results. Output is written to a temporary file beside the target
// and renamed over it only by commit(), so a failed or interrupted run never leaves a file that
// looks complete.
#pragma once
#include <cstdio>
#include <string>
#include <vector>

namespace envsift {

class CsvWriter {
 public:
  explicit CsvWriter(std::string path);
  ~CsvWriter();  // removes the temporary file unless committed
  CsvWriter(const CsvWriter&) = delete;
  CsvWriter& operator=(const CsvWriter&) = delete;

  void row(const std::vector<std::string>& fields);
  void write_text(const std::string& text);  // raw text, for outputs that are not CSV
  void commit();

 private:
  std::string path_, temp_path_;
  std::FILE* file_ = nullptr;
  std::string buffer_;
  int slot_ = -1;  // in the signal handler's list of partial outputs
};

// On SIGINT, SIGTERM or SIGHUP, removes every output still being written (its temporary file),
// then lets the signal end the process as it would have. Call once, early in main().
void remove_partial_outputs_on_signal();

// For other writers: a temporary file the signal handler removes (returns a slot, or -1 when the
// list is full), and forgetting it once it is renamed or removed.
int remember_partial_output(const std::string& temporary_path);
void forget_partial_output(int slot);

// RFC 4180: a field is quoted when it holds a comma, quote, CR or LF, or starts/ends with a space.
void append_csv_field(std::string& out, const std::string& field);

}  // namespace envsift
