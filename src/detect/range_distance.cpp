#include "envsift/detect/range_distance.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

#include <Eigen/Geometry>

namespace envsift {
namespace {

constexpr double kDegree = M_PI / 180;
constexpr double kPieceDeg = 0.05;   // densification step of an edge, in degrees of longitude or latitude
constexpr std::uint32_t kLeafArcs = 8;

}  // namespace

Eigen::Vector3d unit_vector(double lon, double lat) {
  const double phi = lat * kDegree, lambda = lon * kDegree;
  return {std::cos(phi) * std::cos(lambda), std::cos(phi) * std::sin(lambda), std::sin(phi)};
}

double angle_between(const Eigen::Vector3d& u, const Eigen::Vector3d& v) {
  return std::atan2(u.cross(v).norm(), u.dot(v));
}

RangeEdges::RangeEdges(const std::vector<std::vector<LonLat>>& rings) {
  auto add = [&](const Eigen::Vector3d& a, const Eigen::Vector3d& b) {
    Eigen::Vector3d normal = a.cross(b);
    const double n = normal.norm();
    normal = n > 1e-15 ? Eigen::Vector3d(normal / n) : Eigen::Vector3d::Zero();
    arcs_.push_back({a, b, normal});
  };
  for (const auto& ring : rings) {
    const std::size_t n = ring.size();
    for (std::size_t k = 0; k < n; ++k) {
      const LonLat p = ring[k], q = ring[(k + 1) % n];
      if (p.lon == q.lon && p.lat == q.lat) continue;  // a repeated vertex (or the closing one)
      if (std::fabs(p.lat) >= 90 && p.lat == q.lat) continue;  // along a pole: a point, not an edge
      const double span = std::max(std::fabs(q.lon - p.lon), std::fabs(q.lat - p.lat));
      const int pieces = std::max(1, static_cast<int>(std::ceil(span / kPieceDeg)));
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
  for (const Arc& s : arcs_) {
    const Eigen::Vector3d m = s.a + s.b;
    middle_.push_back(m.norm() > 1e-15 ? Eigen::Vector3d(m.normalized()) : s.a);
    half_.push_back(angle_between(s.a, s.b) / 2);
  }
  if (arcs_.empty()) return;
  // build over an order of the arcs, then store the arcs in that order
  std::vector<std::uint32_t> order(arcs_.size());
  std::iota(order.begin(), order.end(), 0u);
  struct Builder {
    RangeEdges& e;
    std::vector<std::uint32_t>& order;
    std::int32_t operator()(std::uint32_t first, std::uint32_t count) {
      Cap cap;
      Eigen::Vector3d sum = Eigen::Vector3d::Zero();
      for (std::uint32_t k = first; k < first + count; ++k) sum += e.middle_[order[k]];
      cap.centre = sum.norm() > 1e-12 ? Eigen::Vector3d(sum.normalized()) : e.middle_[order[first]];
      for (std::uint32_t k = first; k < first + count; ++k)  // a point of an arc is within half its length of its middle
        cap.radius = std::max(cap.radius, angle_between(cap.centre, e.middle_[order[k]]) + e.half_[order[k]]);
      cap.first = first, cap.count = count;
      const auto at = static_cast<std::int32_t>(e.caps_.size());
      e.caps_.push_back(cap);
      if (count <= kLeafArcs) return at;
      Eigen::Vector3d low = Eigen::Vector3d::Constant(2), high = Eigen::Vector3d::Constant(-2);
      for (std::uint32_t k = first; k < first + count; ++k)
        low = low.cwiseMin(e.middle_[order[k]]), high = high.cwiseMax(e.middle_[order[k]]);
      Eigen::Index axis;
      (high - low).maxCoeff(&axis);
      const std::uint32_t half = count / 2;
      std::nth_element(order.begin() + first, order.begin() + first + half, order.begin() + first + count,
                       [&](std::uint32_t a, std::uint32_t b) {
                         const double x = e.middle_[a][axis], y = e.middle_[b][axis];
                         return x != y ? x < y : a < b;  // a total order: the same tree on every machine
                       });
      const std::int32_t left = (*this)(first, half);
      const std::int32_t right = (*this)(first + half, count - half);
      e.caps_[static_cast<std::size_t>(at)].left = left;
      e.caps_[static_cast<std::size_t>(at)].right = right;
      return at;
    }
  };
  Builder{*this, order}(0, static_cast<std::uint32_t>(arcs_.size()));
  std::vector<Arc> arcs;
  std::vector<Eigen::Vector3d> middle;
  std::vector<double> half;
  for (std::uint32_t k : order) arcs.push_back(arcs_[k]), middle.push_back(middle_[k]), half.push_back(half_[k]);
  arcs_.swap(arcs), middle_.swap(middle), half_.swap(half);
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
  std::vector<std::pair<double, std::int32_t>> stack{{0.0, 0}};  // (lower bound, cap)
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
