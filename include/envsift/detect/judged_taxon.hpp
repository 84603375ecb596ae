// A taxon as judged: which records it has, which its statistics came from, whether it was split
// in two populations — what the outputs are told of each taxon while judging goes on.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

namespace envsift {

struct JudgedTaxon {
  std::size_t index = 0;               // position among the taxa, sorted by name
  bool two_populations = false;        // judged as two populations
  std::string taxon;
  std::vector<std::size_t> records;    // ascending
  std::vector<std::size_t> reference;  // the records its statistics were estimated from
};

}  // namespace envsift
