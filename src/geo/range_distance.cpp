// Distance from a point to great-circle arcs on the unit sphere: to the arc's great circle when
// the point's projection falls between its ends (the cross-track distance of spherical
// trigonometry, asin |p · n|, here as atan2 for accuracy), else to the nearer end; the bound on how
// far a line drawn in longitude/latitude leaves a great circle is from the sphere's metric
// (differential geometry; the derivation is at pieces_of). Textbook geometry, from memory.
#include "envsift/geo/range_distance.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include <Eigen/Geometry>

#include "envsift/geo/great_circle.hpp"

namespace envsift {
namespace {

constexpr double kDegree = M_PI / 180;
constexpr double kMaxPieceDeg = 2;        // pieces of an edge span at most this (the bound below holds)
constexpr double kMaxGapM = 0.8;          // and lie within this of the drawn line (a metre, with room)
constexpr std::uint32_t kLeafArcs = 8;

// How many great-circle pieces keep within kMaxGapM of the edge drawn straight in
// longitude/latitude. On the sphere (ds² = cos²φ dλ² + dφ²) the drawn line λ = λ0 + tΔλ,
// φ = φ0 + tΔφ is a geodesic but for its covariant acceleration (from the Christoffel symbols
// Γ^φ_λλ = sin φ cos φ, Γ^λ_λφ = −tan φ), of size |sin φ| |Δλ| √(4Δφ² + cos²φ Δλ²); a curve with
// acceleration a over t in [0, 1] leaves the geodesic through its ends by about a/8. So n pieces
// suffice when s |Δλ| √(4Δφ² + Δλ²) / (8 n²) ≤ gap, s the largest |sin φ| on the edge: meridians
// and the equator need one.
int pieces_of(const LonLat& p, const LonLat& q) {
  const double span_deg = std::max(std::fabs(q.lon - p.lon), std::fabs(q.lat - p.lat));
  const double s = std::sin(std::max(std::fabs(p.lat), std::fabs(q.lat)) * kDegree);
  const double dlambda = std::fabs(q.lon - p.lon) * kDegree, dphi = std::fabs(q.lat - p.lat) * kDegree;
  const double by_gap = std::sqrt(s * dlambda * std::sqrt(4 * dphi * dphi + dlambda * dlambda) / (8 * kMaxGapM / kEarthRadiusM));
  return std::max({1, static_cast<int>(std::ceil(by_gap)), static_cast<int>(std::ceil(span_deg / kMaxPieceDeg))});
}

}  // namespace

Eigen::Vector3d unit_vector(double lon, double lat) {
  const double phi = lat * kDegree, lambda = lon * kDegree;
  return {std::cos(phi) * std::cos(lambda), std::cos(phi) * std::sin(lambda), std::sin(phi)};
}

double angle_between(const Eigen::Vector3d& u, const Eigen::Vector3d& v) {
  return std::atan2(u.cross(v).norm(), u.dot(v));
}

// The arcs of one ring, each edge cut into pieces short enough to be treated as great-circle arcs.
void RangeEdges::add_ring(const std::vector<LonLat>& ring, std::vector<Arc>& arcs) {
  auto add = [&](const Eigen::Vector3d& a, const Eigen::Vector3d& b) {
    Eigen::Vector3d normal = a.cross(b);
    const double n = normal.norm();
    normal = n > 1e-15 ? Eigen::Vector3d(normal / n) : Eigen::Vector3d::Zero();
    arcs.push_back({a, b, normal});
  };
  const std::size_t n = ring.size();
  for (std::size_t k = 0; k < n; ++k) {
    const LonLat p = ring[k], q = ring[(k + 1) % n];
    if (p.lon == q.lon && p.lat == q.lat) continue;  // a repeated vertex (or the closing one)
    if (std::fabs(p.lat) >= 90 && p.lat == q.lat) continue;  // along a pole: a point, not an edge
    const int pieces = pieces_of(p, q);
    Eigen::Vector3d from = unit_vector(p.lon, p.lat);
    for (int s = 1; s <= pieces; ++s) {
      const double t = static_cast<double>(s) / pieces;
      const Eigen::Vector3d to = s == pieces ? unit_vector(q.lon, q.lat)
                                             : unit_vector(p.lon + t * (q.lon - p.lon), p.lat + t * (q.lat - p.lat));
      add(from, to);
      from = to;
    }
  }
}

namespace {

// A point of the unit sphere's position along a Z-order (Morton) curve of the unit cube.
std::uint64_t morton_key(const Eigen::Vector3d& point) {
  auto spread = [](std::uint64_t v) {  // 21 bits to every third of 63
    v &= 0x1fffff;
    v = (v | v << 32) & 0x1f00000000ffffull;
    v = (v | v << 16) & 0x1f0000ff0000ffull;
    v = (v | v << 8) & 0x100f00f00f00f00full;
    v = (v | v << 4) & 0x10c30c30c30c30c3ull;
    v = (v | v << 2) & 0x1249249249249249ull;
    return v;
  };
  const Eigen::Vector3d q = (point.array() + 1) * 0.5 * 2097151.0;
  return spread(static_cast<std::uint64_t>(q.x())) | spread(static_cast<std::uint64_t>(q.y())) << 1 |
         spread(static_cast<std::uint64_t>(q.z())) << 2;
}

}  // namespace

RangeEdges::RangeEdges(const std::vector<std::vector<LonLat>>& rings) {
  for (const auto& ring : rings) add_ring(ring, arcs_);
  for (const Arc& s : arcs_) {
    const Eigen::Vector3d m = s.a + s.b;
    middle_.push_back(m.norm() > 1e-15 ? Eigen::Vector3d(m.normalized()) : s.a);
    half_.push_back(angle_between(s.a, s.b) / 2);
  }
  if (arcs_.empty()) return;
  // Arcs in the order of their middles along a Z-order (Morton) curve of the unit cube, so that
  // neighbours in the order are neighbours on the sphere; then caps bottom-up: runs of
  // kLeafArcs arcs, then pairs of caps. One sort and O(n) work.
  std::vector<std::pair<std::uint64_t, std::uint32_t>> keyed(arcs_.size());
  for (std::size_t k = 0; k < arcs_.size(); ++k) keyed[k] = {morton_key(middle_[k]), static_cast<std::uint32_t>(k)};
  std::sort(keyed.begin(), keyed.end());  // ties by index: the same order on every machine
  std::vector<Arc> arcs;
  std::vector<Eigen::Vector3d> middle;
  std::vector<double> half;
  for (const auto& [key, k] : keyed) arcs.push_back(arcs_[k]), middle.push_back(middle_[k]), half.push_back(half_[k]);
  arcs_.swap(arcs), middle_.swap(middle), half_.swap(half);
  std::vector<std::int32_t> level;
  for (std::uint32_t first = 0; first < arcs_.size(); first += kLeafArcs) {
    Cap cap;
    cap.first = first;
    cap.count = std::min<std::uint32_t>(kLeafArcs, static_cast<std::uint32_t>(arcs_.size()) - first);
    Eigen::Vector3d sum = Eigen::Vector3d::Zero();
    for (std::uint32_t k = first; k < first + cap.count; ++k) sum += middle_[k];
    cap.centre = sum.norm() > 1e-12 ? Eigen::Vector3d(sum.normalized()) : middle_[first];
    for (std::uint32_t k = first; k < first + cap.count; ++k)  // a point of an arc is within half its length of its middle
      cap.radius = std::max(cap.radius, angle_between(cap.centre, middle_[k]) + half_[k]);
    level.push_back(static_cast<std::int32_t>(caps_.size()));
    caps_.push_back(cap);
  }
  while (level.size() > 1) {
    std::vector<std::int32_t> up;
    for (std::size_t k = 0; k + 1 < level.size(); k += 2) {
      const Cap a = caps_[static_cast<std::size_t>(level[k])], b = caps_[static_cast<std::size_t>(level[k + 1])];
      Cap cap;
      cap.first = a.first, cap.count = a.count + b.count;
      cap.left = level[k], cap.right = level[k + 1];
      const Eigen::Vector3d sum = a.centre * a.count + b.centre * b.count;
      cap.centre = sum.norm() > 1e-12 ? Eigen::Vector3d(sum.normalized()) : a.centre;
      for (const Cap* child : {&a, &b})  // holds its children's caps whole
        cap.radius = std::max(cap.radius, angle_between(cap.centre, child->centre) + child->radius);
      up.push_back(static_cast<std::int32_t>(caps_.size()));
      caps_.push_back(cap);
    }
    if (level.size() % 2) up.push_back(level.back());
    level.swap(up);
  }
  root_ = level.front();
}

namespace {

// From p to the nearest point of the arc: to the great circle when p's projection on its plane
// falls between the ends, else to the nearer end.
double arc_angle(const Eigen::Vector3d& a, const Eigen::Vector3d& b, const Eigen::Vector3d& normal,
                 const Eigen::Vector3d& p) {
  if (normal.squaredNorm() == 0) return angle_between(p, a);
  const double sine = p.dot(normal);
  const Eigen::Vector3d c = p - sine * normal;
  if (c.squaredNorm() > 1e-30 && a.cross(c).dot(normal) >= 0 && c.cross(b).dot(normal) >= 0)
    return std::atan2(std::fabs(sine), c.norm());
  return std::min(angle_between(p, a), angle_between(p, b));
}

}  // namespace

double RangeEdges::nearest_angle(double lon, double lat) const {
  double best = std::numeric_limits<double>::infinity();
  if (caps_.empty()) return best;
  const Eigen::Vector3d p = unit_vector(lon, lat);
  std::vector<std::pair<double, std::int32_t>> stack{{0.0, root_}};  // (lower bound, cap)
  while (!stack.empty()) {
    const auto [bound, c] = stack.back();
    stack.pop_back();
    if (bound >= best) continue;
    const Cap& cap = caps_[static_cast<std::size_t>(c)];
    if (cap.left < 0) {
      for (std::uint32_t k = cap.first; k < cap.first + cap.count; ++k)
        best = std::min(best, arc_angle(arcs_[k].a, arcs_[k].b, arcs_[k].normal, p));
      continue;
    }
    std::pair<double, std::int32_t> children[2];
    for (int s = 0; s < 2; ++s) {
      const std::int32_t child = s == 0 ? cap.left : cap.right;
      const Cap& k = caps_[static_cast<std::size_t>(child)];
      children[s] = {std::max(0.0, angle_between(p, k.centre) - k.radius), child};
    }
    if (children[0].first < children[1].first) std::swap(children[0], children[1]);
    stack.push_back(children[0]);  // the nearer one last: searched first
    stack.push_back(children[1]);
  }
  return best;
}

std::size_t RangeEdges::bytes() const {
  return arcs_.capacity() * sizeof(Arc) + middle_.capacity() * sizeof(Eigen::Vector3d) +
         half_.capacity() * sizeof(double) + caps_.capacity() * sizeof(Cap);
}

}  // namespace envsift
