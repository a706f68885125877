// Edge-midpoint refinement and elevation; one edge -> midpoint map shared by both.
#include "mesh/straight_refinement.hpp"

#include <cmath>
#include <stdexcept>
#include <unordered_map>

#include "mesh/mesh_quality.hpp"
#include "mesh/renumber.hpp"

namespace hearth {

namespace {

// Midpoint nodes, created once per edge.
class EdgeMidpoints {
 public:
  explicit EdgeMidpoints(Mesh& mesh) : mesh_(mesh) {}
  std::int32_t operator()(std::int32_t a, std::int32_t b) {
    const std::uint64_t key = (std::uint64_t(std::min(a, b)) << 32) | std::uint32_t(std::max(a, b));
    const auto it = index_.find(key);
    if (it != index_.end()) return it->second;
    const auto id = static_cast<std::int32_t>(mesh_.coords.size() / 3);
    for (int d = 0; d < 3; ++d) mesh_.coords.push_back(0.5 * (mesh_.coords[3 * a + d] + mesh_.coords[3 * b + d]));
    index_.emplace(key, id);
    return id;
  }

 private:
  Mesh& mesh_;
  std::unordered_map<std::uint64_t, std::int32_t> index_;
};

double squared_distance(const Mesh& m, std::int32_t a, std::int32_t b) {
  double s = 0;
  for (int d = 0; d < 3; ++d) s += std::pow(m.coords[3 * a + d] - m.coords[3 * b + d], 2);
  return s;
}

// Appends a tetrahedron, swapping two vertices if needed so its volume is positive.
void push_tet(Mesh& m, std::int32_t a, std::int32_t b, std::int32_t c, std::int32_t d, std::int32_t region) {
  if (tet_signed_volume(m.node(a), m.node(b), m.node(c), m.node(d)) < 0) std::swap(b, c);
  m.tet_nodes.insert(m.tet_nodes.end(), {a, b, c, d});
  m.tet_region.push_back(region);
}

Mesh copy_without_elements(const Mesh& mesh) {
  if (mesh.order != 1) throw std::invalid_argument("straight refinement needs a 4-node mesh");
  Mesh out;
  out.order = 1;
  out.coords = mesh.coords;
  out.regions = mesh.regions;
  out.boundaries = mesh.boundaries;
  out.unnamed_exterior_faces = mesh.unnamed_exterior_faces;
  return out;
}

}  // namespace

Mesh refine_straight(const Mesh& mesh) {
  Mesh out = copy_without_elements(mesh);
  out.unnamed_exterior_faces *= 4;
  EdgeMidpoints mid(out);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* v = mesh.tet(e);
    const std::int32_t r = mesh.tet_region[e];
    const std::int32_t m01 = mid(v[0], v[1]), m02 = mid(v[0], v[2]), m03 = mid(v[0], v[3]);
    const std::int32_t m12 = mid(v[1], v[2]), m13 = mid(v[1], v[3]), m23 = mid(v[2], v[3]);
    push_tet(out, v[0], m01, m02, m03, r);
    push_tet(out, m01, v[1], m12, m13, r);
    push_tet(out, m02, m12, v[2], m23, r);
    push_tet(out, m03, m13, m23, v[3], r);
    // The inner octahedron: four tetrahedra around its shortest diagonal; the other
    // four midpoints form the cycle around it (consecutive ones share a parent vertex).
    const double d0 = squared_distance(out, m02, m13), d1 = squared_distance(out, m01, m23),
                 d2 = squared_distance(out, m03, m12);
    std::int32_t a, b, cycle[4];
    if (d0 <= d1 && d0 <= d2) {
      a = m02, b = m13;
      std::int32_t c[4] = {m01, m12, m23, m03};
      std::copy(c, c + 4, cycle);
    } else if (d1 <= d2) {
      a = m01, b = m23;
      std::int32_t c[4] = {m02, m12, m13, m03};
      std::copy(c, c + 4, cycle);
    } else {
      a = m03, b = m12;
      std::int32_t c[4] = {m01, m02, m23, m13};
      std::copy(c, c + 4, cycle);
    }
    for (int k = 0; k < 4; ++k) push_tet(out, a, b, cycle[k], cycle[(k + 1) % 4], r);
  }
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const std::int32_t* v = mesh.face(f);
    const std::int32_t m01 = mid(v[0], v[1]), m12 = mid(v[1], v[2]), m20 = mid(v[2], v[0]);
    const std::int32_t children[4][3] = {{v[0], m01, m20}, {m01, v[1], m12}, {m20, m12, v[2]}, {m01, m12, m20}};
    for (const auto& c : children) {  // same orientation as the parent
      out.face_nodes.insert(out.face_nodes.end(), {c[0], c[1], c[2]});
      out.face_boundary.push_back(mesh.face_boundary[f]);
    }
  }
  out.tet_quality = tet_qualities(out);
  renumber_reverse_cuthill_mckee(out);
  return out;
}

Mesh elevate_straight(const Mesh& mesh) {
  Mesh out = copy_without_elements(mesh);
  out.order = 2;
  EdgeMidpoints mid(out);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* v = mesh.tet(e);
    out.tet_nodes.insert(out.tet_nodes.end(), {v[0], v[1], v[2], v[3], mid(v[0], v[1]), mid(v[1], v[2]),
                                               mid(v[0], v[2]), mid(v[0], v[3]), mid(v[1], v[3]), mid(v[2], v[3])});
  }
  out.tet_region = mesh.tet_region;
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const std::int32_t* v = mesh.face(f);
    out.face_nodes.insert(out.face_nodes.end(),
                          {v[0], v[1], v[2], mid(v[0], v[1]), mid(v[1], v[2]), mid(v[2], v[0])});
  }
  out.face_boundary = mesh.face_boundary;
  out.tet_quality = mesh.tet_quality;
  renumber_reverse_cuthill_mckee(out);
  return out;
}

}  // namespace hearth
