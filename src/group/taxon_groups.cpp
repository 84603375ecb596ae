#include "envsift/group/taxon_groups.hpp"

#include <algorithm>
#include <numeric>

namespace envsift {

std::vector<TaxonGroup> group_by_taxon(const std::vector<std::uint32_t>& taxon_of, const std::vector<std::string>& names,
                                       const std::vector<bool>& eligible) {
  std::vector<std::size_t> size(names.size(), 0);
  for (std::size_t i = 0; i < taxon_of.size(); ++i)
    if (eligible[i]) ++size[taxon_of[i]];
  std::vector<std::uint32_t> by_name(names.size());
  std::iota(by_name.begin(), by_name.end(), 0u);
  std::sort(by_name.begin(), by_name.end(), [&](std::uint32_t a, std::uint32_t b) { return names[a] < names[b]; });
  std::vector<std::size_t> group_of(names.size(), static_cast<std::size_t>(-1));
  std::vector<TaxonGroup> groups;
  for (std::uint32_t t : by_name)
    if (size[t]) {
      group_of[t] = groups.size();
      groups.push_back({names[t], {}});
      groups.back().records.reserve(size[t]);
    }
  for (std::size_t i = 0; i < taxon_of.size(); ++i)
    if (eligible[i]) groups[group_of[taxon_of[i]]].records.push_back(i);
  return groups;
}

}  // namespace envsift
