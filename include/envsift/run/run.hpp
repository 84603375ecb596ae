// The commands as a program embedding envsift calls them. Each validates its settings (with the
// command line's messages), runs the fixed sequence of steps, and writes every output it is asked
// for — all of them, or none:
//   read points → sample the raster stack → group by taxon → tests → score and rank → write.
#pragma once
#include <string>
#include <vector>

#include "envsift/run_summary.hpp"
#include "envsift/settings/settings.hpp"
#include "envsift/write/record_sink.hpp"

namespace envsift {

// Samples every layer at every record: the record table with a `status` column.
RunSummary run_sample(const ScreenSettings& settings);

// Screens: every record judged against its taxon, ranked. `extra_outputs` receive the run as
// the registered outputs do (the evaluation tallies its virtual records this way).
RunSummary run_screen(const ScreenSettings& settings, const std::vector<RecordSink*>& extra_outputs = {});

// Combines the outputs of shards 0..N-1 of one screen (any order) into `out`, re-ranking.
// Throws InputError when the files are not shards of the same run.
RunSummary merge_shards(const std::vector<std::string>& shard_outputs, const std::string& out);

// The shard that owns a taxon (records without a taxon: the shard of the empty name).
std::size_t shard_of(const std::string& taxon, std::size_t shard_count);

}  // namespace envsift
