// Private to `merge`: shards belong together only when one run made them — the same points, layers,
// ranges and decisions (by SHA-256), the same settings (every option that can change a result;
// output paths, threads and memory cannot) and the same envsift, with shards 0..N-1 each once. Each
// shard's manifest, written beside its output (shard_manifest_path), says how it was made.
#pragma once
#include <string>
#include <vector>

namespace envsift::run {

// Throws InputError naming the shard that differs from the first and in what.
void check_shards_of_one_run(const std::vector<std::string>& shard_outputs);

}  // namespace envsift::run
