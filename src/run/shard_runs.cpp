#include "shard_runs.hpp"

#include <fstream>
#include <set>

#include <nlohmann/json.hpp>

#include "envsift/errors.hpp"
#include "envsift/write/run_manifest.hpp"

namespace envsift::run {
namespace {

using Json = nlohmann::json;

const std::string kTodo = "merge the shards of one run only: run every shard 0..N-1 with the same points, layers and options";

// Options that cannot change a result: where outputs go, and how the run uses the machine. The
// input paths are compared by their files' SHA-256 instead (a copy elsewhere is the same input).
const std::set<std::string> kOwnPerShard = {"out",     "gis",        "summary",        "report", "manifest", "decisions-template",
                                            "shard",   "threads",    "block-cache-mb", "memory-limit", "points", "layers",
                                            "decisions", "ranges",  "quiet",          "progress"};

Json read_manifest(const std::string& shard) {
  const std::string path = shard_manifest_path(shard);
  std::ifstream in(path);
  if (!in)
    throw InputError(shard, "has no run manifest beside it (" + path + ", which envsift screen --shard writes); merge needs it "
                            "to check that the shards come from one run",
                     "keep each shard's manifest beside its output, or run the shard again");
  try {
    return Json::parse(in);
  } catch (const Json::exception&) {
    throw InputError(path, "is not a run manifest (not JSON)", "run the shard again");
  }
}

std::string text(const Json& j, const char* key) {
  if (!j.contains(key) || j[key].is_null()) return "(none)";
  return j[key].is_string() ? j[key].get<std::string>() : j[key].dump();
}

std::string short_sha(const Json& file) { return file.is_object() ? text(file, "sha256").substr(0, 12) : "(none)"; }

// The files a run read, by role: "points", "layer dem", "ranges", "decisions".
std::vector<std::pair<std::string, std::string>> inputs(const Json& m) {
  std::vector<std::pair<std::string, std::string>> out{{"points file", short_sha(m.value("points", Json()))}};
  for (const auto& l : m.value("layers", Json::array())) out.emplace_back("layer " + text(l, "name"), short_sha(l));
  for (const char* k : {"ranges", "decisions"}) out.emplace_back(std::string(k) + " file", short_sha(m.value(k, Json())));
  return out;
}

}  // namespace

void check_shards_of_one_run(const std::vector<std::string>& paths) {
  // one file (--shard 0/1, or a whole run's output): nothing to mix, and such a run keeps no manifest
  if (paths.size() == 1 && !std::ifstream(shard_manifest_path(paths[0]))) return;
  std::vector<Json> manifests;
  for (const auto& p : paths) manifests.push_back(read_manifest(p));
  const Json& first = manifests[0];
  auto differs = [&](std::size_t k, const std::string& what) {
    throw InputError(paths[k], "is not a shard of the same run as " + paths[0] + ": " + what, kTodo);
  };
  // a shard as its manifest writes it: "I/N", or nothing for the one shard of --shard 0/1
  auto shard_of = [](const Json& m) {
    const std::string s = text(m["options"], "shard");
    return s == "(none)" || s.empty() ? std::string("0/1") : s;
  };
  std::set<std::string> seen;
  const std::string count = shard_of(first);
  for (std::size_t k = 0; k < manifests.size(); ++k) {
    const Json& m = manifests[k];
    if (text(m, "envsift_version") != text(first, "envsift_version"))
      differs(k, "made by envsift " + text(m, "envsift_version") + ", not " + text(first, "envsift_version"));
    const auto mine = inputs(m), theirs = inputs(first);
    if (mine.size() != theirs.size()) differs(k, "it sampled " + std::to_string(mine.size() - 3) + " layers, not " +
                                                     std::to_string(theirs.size() - 3));
    for (std::size_t i = 0; i < mine.size(); ++i)
      if (mine[i] != theirs[i])
        differs(k, mine[i].first == theirs[i].first
                       ? "its " + mine[i].first + " differs (SHA-256 " + mine[i].second + "… against " + theirs[i].second + "…)"
                       : "its " + mine[i].first + " stands where the first has its " + theirs[i].first);
    for (const auto& [name, value] : first["options"].items())
      if (!kOwnPerShard.count(name) && text(m["options"], name.c_str()) != text(first["options"], name.c_str()))
        differs(k, "it was made with --" + name + " " + text(m["options"], name.c_str()) + ", " + paths[0] + " with --" + name +
                       " " + text(first["options"], name.c_str()));
    const std::string shard = shard_of(m);
    if (shard.substr(shard.find('/')) != count.substr(count.find('/'))) differs(k, "it is shard " + shard + ", the first " + count);
    if (!seen.insert(shard).second) throw InputError(paths[k], "shard " + shard + " is given twice", "give each shard once");
  }
  const std::size_t n = std::stoul(count.substr(count.find('/') + 1));
  for (std::size_t i = 0; i < n; ++i)
    if (!seen.count(std::to_string(i) + "/" + std::to_string(n)))
      throw InputError(paths[0], "shard " + std::to_string(i) + "/" + std::to_string(n) + " of its run is missing",
                       "give every shard 0.." + std::to_string(n - 1) + " of the run");
}

}  // namespace envsift::run
