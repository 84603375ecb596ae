// Helpers shared by the tests: paths, running commands, reading CSV results.
#pragma once
#include <cstdio>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include <Eigen/Core>
#include <gtest/gtest.h>

#include "envsift/read/csv_reader.hpp"

namespace envsift::testing {

inline std::string source_path(const std::string& relative) { return std::string(ENVSIFT_SOURCE_DIR) + "/" + relative; }
inline std::string envsift_binary() { return ENVSIFT_BINARY; }

// The four demo rasters, in the order the demo uses.
inline std::vector<std::string> demo_layer_paths() {
  std::vector<std::string> paths;
  for (const char* name : {"dem", "temperature", "rainfall", "dry_months"})
    paths.push_back(source_path(std::string("demo-rasters/") + name + ".tif"));
  return paths;
}

// " --layers" and the four demo rasters.
inline std::string demo_layers() {
  std::string s = " --layers";
  for (const auto& path : demo_layer_paths()) s += " " + path;
  return s;
}

// A fresh directory for one test's files.
inline std::string temp_dir(const std::string& name) {
  std::string dir = ::testing::TempDir() + "envsift-" + name;
  std::string cmd = "rm -rf '" + dir + "' && mkdir -p '" + dir + "'";
  if (std::system(cmd.c_str()) != 0) ADD_FAILURE() << "cannot create " << dir;
  return dir;
}

inline void write_file(const std::string& path, const std::string& content) {
  std::ofstream(path, std::ios::binary) << content;
}

inline std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

struct CommandResult {
  int exit_code;
  std::string output;  // stdout and stderr together
};

inline CommandResult run(const std::string& command) {
  CommandResult r{-1, ""};
  std::FILE* p = ::popen((command + " 2>&1").c_str(), "r");
  if (!p) return r;
  char buf[4096];
  std::size_t got;
  while ((got = std::fread(buf, 1, sizeof buf, p)) > 0) r.output.append(buf, got);
  const int status = ::pclose(p);
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return r;
}

// A CSV file as header + rows of fields.
struct Table {
  std::vector<std::string> header;
  std::vector<std::vector<std::string>> rows;
  std::size_t column(const std::string& name) const {
    for (std::size_t i = 0; i < header.size(); ++i)
      if (header[i] == name) return i;
    ADD_FAILURE() << "no column " << name;
    return 0;
  }
};

inline Table read_csv(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  CsvReader reader(in, ',', path);
  Table t;
  std::size_t line;
  reader.next(t.header, line);
  std::vector<std::string> row;
  while (reader.next(row, line)) t.rows.push_back(row);
  return t;
}

// The rows of a table by their ID (occurrenceID).
inline std::map<std::string, std::vector<std::string>> by_id(const Table& t, const std::string& id = "occurrenceID") {
  std::map<std::string, std::vector<std::string>> m;
  for (const auto& row : t.rows) m[row[t.column(id)]] = row;
  return m;
}

// One layer of values as a records × 1 matrix.
inline Eigen::MatrixXd column(const std::vector<double>& v) {
  Eigen::MatrixXd m(static_cast<Eigen::Index>(v.size()), 1);
  for (std::size_t i = 0; i < v.size(); ++i) m(static_cast<Eigen::Index>(i), 0) = v[i];
  return m;
}

}  // namespace envsift::testing
