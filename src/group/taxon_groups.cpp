#include "envsift/group/taxon_groups.hpp"

#include <map>

namespace envsift {

std::vector<TaxonGroup> group_by_taxon(const std::vector<std::string>& taxa, const std::vector<bool>& eligible) {
  std::map<std::string, std::vector<std::size_t>> by_name;
  for (std::size_t i = 0; i < taxa.size(); ++i)
    if (eligible[i]) by_name[taxa[i]].push_back(i);
  std::vector<TaxonGroup> groups;
  groups.reserve(by_name.size());
  for (auto& [name, records] : by_name) groups.push_back({name, std::move(records)});
  return groups;
}

}  // namespace envsift
