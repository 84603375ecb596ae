// Circular layers (aspect, wind or flow direction, in degrees) cannot be judged on a line: 359°
// and 1° are neighbours, but a median, a MAD or a covariance sees them 358° apart. A layer that
// says so by its name, or that --circular declares, enters the tests as its sine and cosine
// (columns LAYER_sin and LAYER_cos, written beside the layer's own value) — the usual treatment
// of directional data (Mardia & Jupp 2000, Directional Statistics, ch. 2 — from memory); the
// tests do not see the degrees themselves.
#pragma once
#include <string>
#include <vector>

namespace envsift {

struct RecordTable;

// True for names that say direction: aspect, azimuth, bearing, direction, orientation (any case,
// any part).
bool looks_circular(const std::string& layer_name);

// The layers to treat as circular: those whose names say so, and the `declared` ones; throws
// UsageError for a declared name that is not a layer.
std::vector<std::size_t> circular_layers(const std::vector<std::string>& layer_names, const std::vector<std::string>& declared);

// Adds LAYER_sin and LAYER_cos after the table's layers for each circular layer, and marks the
// layer itself as not judged.
void add_circular_components(RecordTable& table, const std::vector<std::size_t>& circular);

// For commands that cannot handle them yet (evaluate): throws UsageError naming the first.
void refuse_circular_layers(const std::vector<std::string>& layer_names);

}  // namespace envsift
