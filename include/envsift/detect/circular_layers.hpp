// Circular layers (aspect, wind or flow direction) cannot be judged on a line: 359° and 1° are
// neighbours, but a median, a MAD or a covariance sees them 358° apart. envsift refuses them
// rather than flag every north-facing record; the user gives sin and cos as two layers instead.
#pragma once
#include <string>
#include <vector>

namespace envsift {

// True for names that say direction: aspect, azimuth, bearing, direction (any case, any part).
bool looks_circular(const std::string& layer_name);

// Throws UsageError naming the first circular layer and what to do.
void refuse_circular_layers(const std::vector<std::string>& layer_names);

}  // namespace envsift
