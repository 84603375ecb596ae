#include "envsift/table/circular_layers.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>

#include "envsift/errors.hpp"
#include "envsift/table/record_table.hpp"

namespace envsift {

bool looks_circular(const std::string& name) {
  std::string lower = name;
  std::transform(lower.begin(), lower.end(), lower.begin(), [](unsigned char c) { return std::tolower(c); });
  for (const char* word : {"aspect", "azimuth", "bearing", "direction", "orientation"})
    if (lower.find(word) != std::string::npos) return true;
  return false;
}

std::vector<std::size_t> circular_layers(const std::vector<std::string>& names, const std::vector<std::string>& declared) {
  for (const auto& d : declared)
    if (std::find(names.begin(), names.end(), d) == names.end()) {
      std::string all;
      for (const auto& n : names) all += (all.empty() ? "" : ", ") + n;
      throw UsageError("--circular " + d + " is not one of the layers (" + all + ")");
    }
  std::vector<std::size_t> circular;
  for (std::size_t l = 0; l < names.size(); ++l)
    if (looks_circular(names[l]) || std::find(declared.begin(), declared.end(), names[l]) != declared.end())
      circular.push_back(l);
  return circular;
}

void add_circular_components(RecordTable& t, const std::vector<std::size_t>& circular) {
  if (circular.empty()) return;
  const auto n = static_cast<Eigen::Index>(t.size());
  const auto before = static_cast<Eigen::Index>(t.layers.size());
  const auto after = before + 2 * static_cast<Eigen::Index>(circular.size());
  for (Eigen::Index c = before; c < after; ++c) t.values.add_column(false);
  if (t.has_discs)
    for (Eigen::MatrixXd* m : {&t.discs.min, &t.discs.mean, &t.discs.max}) {
      m->conservativeResize(n, after);
      m->rightCols(after - before).setConstant(std::nan(""));  // a disc of directions has no interval
    }
  Eigen::Index column = before;
  for (std::size_t l : circular) {
    t.layers[l].judged = false;
    const LayerInfo source = t.layers[l];
    for (const char* part : {"_sin", "_cos"}) {
      LayerInfo derived;
      derived.spec.name = source.spec.name + part;
      derived.derived_from = source.spec.name;
      t.layers.push_back(derived);
      const bool sine = part[1] == 's';
      for (Eigen::Index i = 0; i < n; ++i) {
        const double radians = t.values(i, static_cast<Eigen::Index>(l)) * M_PI / 180;
        t.values.set(i, column, sine ? std::sin(radians) : std::cos(radians));
      }
      ++column;
    }
  }
}

void refuse_circular_layers(const std::vector<std::string>& names) {
  for (const auto& name : names)
    if (looks_circular(name))
      throw UsageError("layer '" + name + "' looks circular (a direction: 359° and 1° are neighbours), which evaluate "
                       "cannot yet give virtual taxa on; give its sine and cosine as two layers instead (e.g. "
                       "gdal_calc.py -A " + name + ".tif --calc=\"sin(radians(A))\"), or name the layer otherwise "
                       "(NAME=PATH) if it is not a direction");
}

}  // namespace envsift
