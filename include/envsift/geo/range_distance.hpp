// The great-circle distance from a point to the nearest edge of a taxon's range polygons, on the
// sphere of the uncertainty discs (great_circle.hpp). Range maps are drawn on longitude/latitude
// maps, so an edge is the straight line between its vertices in longitude/latitude: edges are
// cut into great-circle arcs that stay within 1 m of the drawn line (and span at most 2°). Nearest-edge search: a hierarchy of spherical caps
// over the arcs (each cap holds its arcs whole), built bottom-up over the arcs sorted along a
// Z-order curve (one sort), searched branch and bound: a query costs about O(log n) for points
// near the range.
#pragma once
#include <cstddef>
#include <cstdint>
#include <vector>

#include <Eigen/Core>

namespace envsift {

struct LonLat {
  double lon = 0, lat = 0;  // degrees
};

class RangeEdges {
 public:
  // Closed rings (the closing edge is implied; a repeated first vertex is fine).
  explicit RangeEdges(const std::vector<std::vector<LonLat>>& rings);
  // Angle (radians) from the point to the nearest edge; infinity without edges.
  double nearest_angle(double lon, double lat) const;
  std::size_t arcs() const { return arcs_.size(); }
  std::size_t bytes() const;

 private:
  struct Arc {
    Eigen::Vector3d a, b, normal;  // unit vectors; normal = a × b normalised (zero: a point)
  };
  static void add_ring(const std::vector<LonLat>& ring, std::vector<Arc>& arcs);
  struct Cap {
    Eigen::Vector3d centre;
    double radius = 0;               // radians: every point of its arcs lies within it
    std::uint32_t first = 0, count = 0;  // its arcs, [first, first + count)
    std::int32_t left = -1, right = -1;  // children (-1: a leaf)
  };
  std::vector<Arc> arcs_;
  std::vector<Eigen::Vector3d> middle_;  // per arc: its midpoint
  std::vector<double> half_;             // per arc: half its length (radians)
  std::vector<Cap> caps_;
  std::int32_t root_ = -1;
};

// The unit vector of a longitude/latitude point, and the angle between two unit vectors
// (atan2 of |u × v| and u · v: accurate at any distance).
Eigen::Vector3d unit_vector(double lon, double lat);
double angle_between(const Eigen::Vector3d& u, const Eigen::Vector3d& v);

}  // namespace envsift
