// Outputs that would destroy something: an output that is the same file as an input or as any
// file an input is made of (compared by device and inode, and by resolved path for side files
// that do not exist yet: a .grd's .gri, a Shapefile's .dbf, an .aux.xml GDAL may write, a Darwin
// Core Archive folder's meta.xml and core), two outputs that are one file, and an
// output path that exists and is not a regular file (a device, FIFO, directory or symbolic link,
// which renaming the finished output over it would replace).
#pragma once
#include <string>
#include <vector>

#include "envsift/settings/settings.hpp"

namespace envsift {

// A path as the command line named it: the option ("--out") and the path.
struct NamedPath {
  std::string option, path;
  std::string named = {};  // for a file an input is made of (a .grd's .gri): the input as the user named it
};

// Throws UsageError naming the two paths that collide, or the path that is not a file, and what to do.
void refuse_unsafe_outputs(const std::vector<NamedPath>& outputs, const std::vector<NamedPath>& inputs);
// The same for the outputs and inputs of a screen (or of `sample`).
void refuse_unsafe_outputs(const ScreenSettings& settings, bool sample);

}  // namespace envsift
