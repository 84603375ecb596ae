// Step 3 of the pipeline: gather the records of each taxon.
#pragma once
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

namespace envsift {

struct TaxonGroup {
  std::string taxon;
  std::vector<std::size_t> records;  // indices into the point table, ascending
};

// Groups the records whose `eligible` flag is set by taxon: `taxon_of[i]` indexes `names`.
// Groups come sorted by name (byte order), so the result never depends on input order or thread
// count.
std::vector<TaxonGroup> group_by_taxon(const std::vector<std::uint32_t>& taxon_of, const std::vector<std::string>& names,
                                       const std::vector<bool>& eligible);

}  // namespace envsift
