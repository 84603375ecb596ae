#include "envsift/run/output_paths.hpp"

#include <filesystem>
#include <optional>
#include <sys/stat.h>

#include "envsift/errors.hpp"
#include "envsift/sample/raster_stack.hpp"
#include "envsift/write/output_registry.hpp"

namespace envsift {
namespace {

std::optional<std::pair<dev_t, ino_t>> file_identity(const std::string& path) {
  struct stat st;
  if (::stat(path.c_str(), &st) != 0) return std::nullopt;
  return std::pair{st.st_dev, st.st_ino};
}

std::string where(const std::string& path) {
  std::error_code ec;
  const auto p = std::filesystem::weakly_canonical(std::filesystem::absolute(path, ec), ec);
  return ec ? path : p.string();
}

}  // namespace

void refuse_unsafe_outputs(const ScreenSettings& s, bool sample) {
  std::vector<NamedPath> outputs, inputs{{"--points", s.input.points}};
  for (const auto& e : output_registry()) {
    const std::string path = e.option.get(s);
    if (!path.empty() && (e.in_sample || !sample)) outputs.push_back({"--" + e.option.name, path});
  }
  if (s.input.value_columns.empty())
    for (const auto& spec : expand_layer_arguments(s.input.layers)) inputs.push_back({"--layers", spec.path});
  if (!sample && !s.review.decisions.empty()) inputs.push_back({"--decisions", s.review.decisions});
  if (!sample && !s.ranges.path.empty()) inputs.push_back({"--ranges", s.ranges.path});
  refuse_unsafe_outputs(outputs, inputs);
}

void refuse_unsafe_outputs(const std::vector<NamedPath>& outputs, const std::vector<NamedPath>& inputs) {
  for (std::size_t k = 0; k < outputs.size(); ++k) {
    const NamedPath& out = outputs[k];
    struct stat st;
    if (::lstat(out.path.c_str(), &st) == 0 && !S_ISREG(st.st_mode))
      throw UsageError(out.option + " " + out.path + " exists and is not a regular file (" +
                       (S_ISLNK(st.st_mode) ? "a symbolic link" : S_ISDIR(st.st_mode) ? "a directory" : "a device or FIFO") +
                       "), which the finished output would replace; give the path of a new or regular file");
    const auto id = file_identity(out.path);
    for (const NamedPath& in : inputs)
      if (id && id == file_identity(in.path))
        throw UsageError(out.option + " " + out.path + " is the input " + in.option + " " + in.path +
                         ": writing it would destroy the input; write the output to another file");
    for (std::size_t j = 0; j < k; ++j)
      if (where(outputs[j].path) == where(out.path) || (id && id == file_identity(outputs[j].path)))
        throw UsageError(outputs[j].option + " and " + out.option + " are the same file (" + out.path +
                         "): one would overwrite the other; give each output its own file");
  }
}

}  // namespace envsift
