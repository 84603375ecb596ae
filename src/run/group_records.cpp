#include <algorithm>

#include "envsift/errors.hpp"
#include "envsift/reason_codes.hpp"
#include "steps.hpp"

namespace envsift::run {

Membership group_records(RecordTable& t, const ScreenSettings& s, const DecisionFile* decisions) {
  const std::size_t n = t.size();
  Membership m;
  m.taxon_names = s.input.single_taxon ? std::vector<std::string>{"", kSingleTaxon} : t.points.taxa;
  m.taxon_of.resize(n);
  m.mine.resize(n);
  m.eligible.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    m.mine[i] = owned_by_this_shard(s, t.points, i);
    if (!m.mine[i]) t.codes.set(i, {reason::other_shard});
  }
  for (std::size_t i = 0; i < n; ++i) {
    m.taxon_of[i] = s.input.single_taxon ? 1u : t.points.records[i].taxon;
    if (m.taxon_of[i] == 0 && t.points.records[i].has_coordinates() && m.mine[i]) t.codes.add(i, reason::taxon_missing);
    m.eligible[i] = m.mine[i] && m.taxon_of[i] != 0 && t.has_any_value(i);
  }
  if (decisions) {
    const auto& columns = t.points.columns;
    const auto id = std::find(columns.begin(), columns.end(), s.input.reader.columns.id);
    if (id == columns.end())
      throw UsageError("--decisions matches records by their ID, but the points have no '" + s.input.reader.columns.id +
                       "' column; name the ID column with --id-column");
    m.decisions = apply_decisions(*decisions, t.points, static_cast<std::size_t>(id - columns.begin()));
    t.warnings.insert(t.warnings.end(), m.decisions.warnings.begin(), m.decisions.warnings.end());
    m.left_out.resize(n);
    for (std::size_t i = 0; i < n; ++i) {
      if (!m.mine[i]) m.decisions.of[i] = Decision::none;  // another shard's record: that shard applies it
      m.left_out[i] = m.decisions.of[i] == Decision::error;
    }
  }
  return m;
}

}  // namespace envsift::run
