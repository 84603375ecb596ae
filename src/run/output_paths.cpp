#include "envsift/run/output_paths.hpp"

#include <filesystem>
#include <optional>
#include <sys/stat.h>

#include <cpl_error.h>
#include <gdal_priv.h>

#include "../gdal_init.hpp"
#include "envsift/detect/range_check.hpp"
#include "envsift/errors.hpp"
#include "envsift/read/darwin_core_archive.hpp"
#include "envsift/read/point_reader.hpp"
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

// Every file a GDAL dataset is made of (GDALDataset::GetFileList: a .grd's .gri, a Shapefile's
// .shx/.dbf/.prj/.cpg, world files, overviews, an existing .aux.xml), and the .aux.xml side file
// GDAL may write beside it even when it does not exist yet.
void add_dataset_files(const std::string& option, const std::string& path, unsigned kind, std::vector<NamedPath>& inputs) {
  inputs.push_back({option, path});
  inputs.push_back({option, path + ".aux.xml", path});
  // only files on this machine: a pipe would lose the bytes GDAL reads to identify it, and a
  // /vsicurl/ address has no companions here
  std::error_code ec;
  if (!std::filesystem::is_regular_file(path, ec) && !std::filesystem::is_directory(path, ec)) return;
  CPLErrorHandlerPusher quiet(CPLQuietErrorHandler);  // a file GDAL cannot open is refused later, with the reason
  std::unique_ptr<GDALDataset> ds(GDALDataset::Open(path.c_str(), kind | GDAL_OF_READONLY));
  if (!ds) return;
  char** files = ds->GetFileList();
  for (char** f = files; f && *f; ++f) inputs.push_back({option, *f, path});
  CSLDestroy(files);
}

// The points' files: a text file itself, a Darwin Core Archive folder's meta.xml and core, a
// vector dataset's every file.
void add_points_files(const std::string& path, std::vector<NamedPath>& inputs) {
  inputs.push_back({"--points", path});
  if (path == "-") return;
  std::optional<ArchiveCore> archive;
  try {
    archive = read_archive_meta(path);
  } catch (const Error&) {
    return;  // reading the points says what is wrong, with the file and line
  }
  if (archive) {
    for (const auto& f : archive->files) inputs.push_back({"--points", f, path});
  } else if (!is_delimited_text(path) && !std::filesystem::is_directory(path)) {
    add_dataset_files("--points", path, GDAL_OF_VECTOR, inputs);
  }
}

}  // namespace

void refuse_unsafe_outputs(const ScreenSettings& s, bool sample) {
  ensure_gdal_registered();
  std::vector<NamedPath> outputs, inputs;
  for (const auto& e : output_registry()) {
    const std::string path = e.option.get(s.outputs);
    if (!path.empty() && (e.in_sample || !sample)) outputs.push_back({"--" + e.option.name, path});
  }
  add_points_files(s.input.points, inputs);
  if (s.input.value_columns.empty())
    for (const auto& spec : expand_layer_arguments(s.input.layers)) add_dataset_files("--layers", spec.path, GDAL_OF_RASTER, inputs);
  if (!sample && !s.review.decisions.empty()) inputs.push_back({"--decisions", s.review.decisions});
  const std::string& ranges = s.tests.own.get<RangeSettings>().path;
  if (!sample && !ranges.empty()) add_dataset_files("--ranges", ranges, GDAL_OF_VECTOR, inputs);
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
    const std::string out_where = where(out.path);
    for (const NamedPath& in : inputs)
      if ((id && id == file_identity(in.path)) || out_where == where(in.path))
        throw UsageError(out.option + " " + out.path + " is " +
                         (in.named.empty() ? "the input " + in.option + " " + in.path
                                           : in.path + ", a file of the input " + in.option + " " + in.named) +
                         ": writing it would destroy the input; write the output to another file");
    for (std::size_t j = 0; j < k; ++j)
      if (where(outputs[j].path) == where(out.path) || (id && id == file_identity(outputs[j].path)))
        throw UsageError(outputs[j].option + " and " + out.option + " are the same file (" + out.path +
                         "): one would overwrite the other; give each output its own file");
  }
}

}  // namespace envsift
