#include "envsift/write/run_manifest.hpp"

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <memory>

#include <nlohmann/json.hpp>
#include <openssl/evp.h>

#include "envsift/errors.hpp"
#include <omp.h>

#include "envsift/detect/range_check.hpp"
#include "envsift/write/record_sink.hpp"

namespace envsift {

std::string sha256_of_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, "cannot read it to compute its SHA-256", "check the path");
  std::unique_ptr<EVP_MD_CTX, decltype(&EVP_MD_CTX_free)> ctx(EVP_MD_CTX_new(), EVP_MD_CTX_free);
  EVP_DigestInit_ex(ctx.get(), EVP_sha256(), nullptr);
  std::vector<char> buffer(1 << 20);
  while (in) {
    in.read(buffer.data(), static_cast<std::streamsize>(buffer.size()));
    EVP_DigestUpdate(ctx.get(), buffer.data(), static_cast<std::size_t>(in.gcount()));
  }
  unsigned char digest[EVP_MAX_MD_SIZE];
  unsigned int length = 0;
  EVP_DigestFinal_ex(ctx.get(), digest, &length);
  std::string hex;
  char two[3];
  for (unsigned int i = 0; i < length; ++i) {
    std::snprintf(two, sizeof two, "%02x", digest[i]);
    hex += two;
  }
  return hex;
}

std::string shard_manifest_path(const std::string& out) { return out + ".manifest.json"; }

namespace {

nlohmann::json file_entry(const std::string& path) {
  if (path == "-") return {{"path", "-"}, {"bytes", nullptr}, {"sha256", nullptr}};  // standard input: read once, not kept
  std::error_code ec;
  const auto size = std::filesystem::file_size(path, ec);
  return {{"path", path}, {"bytes", ec ? 0 : size}, {"sha256", sha256_of_file(path)}};
}

}  // namespace

std::string manifest_json(const RunManifest& m) {
  nlohmann::ordered_json j;
  j["envsift_version"] = ENVSIFT_VERSION;
  j["command_line"] = m.command_line;
  nlohmann::ordered_json options = nlohmann::ordered_json::object();
  for (const auto& [name, value] : m.options) options[name] = value;
  j["options"] = options;
  j["seed"] = m.seed;
  j["threads"] = m.threads;
  j["points"] = file_entry(m.points);
  nlohmann::ordered_json layers = nlohmann::ordered_json::array();
  {
    for (const LayerInfo& l : m.layers) {
      if (!l.derived_from.empty()) continue;  // a circular layer's sine or cosine: not a file
      nlohmann::ordered_json layer = file_entry(l.spec.path);
      layer["name"] = l.spec.name;
      layer["band"] = l.spec.band;
      layer["width"] = l.width;
      layer["height"] = l.height;
      layer["data_type"] = l.data_type;
      layer["nodata"] = l.nodata ? nlohmann::ordered_json(*l.nodata) : nlohmann::ordered_json(nullptr);
      layer["scale"] = l.scale;
      layer["offset"] = l.offset;
      layer["geotransform"] = l.geotransform;
      layer["crs_wkt"] = l.crs_wkt;
      layers.push_back(layer);
    }
  }
  j["layers"] = layers;
  if (!m.decisions.empty()) {  // a reviewer's decisions from earlier rounds: which file, and what it did
    nlohmann::ordered_json d = file_entry(m.decisions);
    nlohmann::ordered_json counts = nlohmann::ordered_json::object();
    for (const auto& [decision, count] : m.decided) counts[decision] = count;
    d["records_decided"] = counts;
    j["decisions"] = d;
  }
  if (!m.ranges.empty()) j["ranges"] = file_entry(m.ranges);
  nlohmann::ordered_json seconds = nlohmann::ordered_json::object();
  for (const auto& [stage, s] : m.seconds) seconds[stage] = s;
  j["seconds"] = seconds;
  return j.dump(2) + "\n";
}

RunManifest make_manifest(const RunContext& run, const RunSummary& summary) {
  RunManifest m;
  m.command_line = run.inputs.command_line;
  m.options = run.options;
  m.points = run.inputs.points;
  if (!run.table.layers_are_columns) m.layers = run.table.layers;
  m.seed = run.screened() ? run.test_settings->seed : 0;
  m.threads = omp_get_max_threads();
  m.seconds = summary.seconds;
  if (run.screened())
    m.decisions = run.inputs.decisions, m.decided = summary.decided,
    m.ranges = run.test_settings->own.get<RangeSettings>().path;
  return m;
}

}  // namespace envsift
