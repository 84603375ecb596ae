// The options that choose and tune the statistical tests, shared by `screen` and `evaluate` (so
// an evaluation measures exactly the settings a screen would use).
#pragma once
#include <string>
#include <vector>

#include "options.hpp"

namespace envsift::cli {

struct TestChoices {
  std::string tests = "robust_z,reverse_jackknife,mahalanobis";  // default_test_names()
  std::size_t min_records = 10;
};

void add_test_options(po::options_description& d, ScreenOptions& o, TestChoices& c);
// Checks the values and copies them where the tests read them.
void finish_test_options(const po::variables_map& vm, ScreenOptions& o, const TestChoices& c);

std::vector<std::string> split_list(const std::string& text);  // "a,b,,c" → a, b, c

}  // namespace envsift::cli
