#include "envsift/detect/circular_layers.hpp"

#include <algorithm>
#include <cctype>

#include "envsift/errors.hpp"

namespace envsift {

bool looks_circular(const std::string& name) {
  std::string lower = name;
  std::transform(lower.begin(), lower.end(), lower.begin(), [](unsigned char c) { return std::tolower(c); });
  for (const char* word : {"aspect", "azimuth", "bearing", "direction"})
    if (lower.find(word) != std::string::npos) return true;
  return false;
}

void refuse_circular_layers(const std::vector<std::string>& names) {
  for (const auto& name : names)
    if (looks_circular(name))
      throw UsageError("layer '" + name + "' looks circular (a direction: 359° and 1° are neighbours), which the tests "
                       "cannot judge on a line; give its sine and cosine as two layers instead (e.g. gdal_calc.py -A " +
                       name + ".tif --calc=\"sin(radians(A))\"), or name the layer otherwise (NAME=PATH) if it is not "
                       "a direction");
}

}  // namespace envsift
