// Node duplication across an internal surface by flood fill around each surface node.
#include "mesh/interface_split.hpp"

#include <algorithm>
#include <array>
#include <map>
#include <set>
#include <unordered_map>
#include <unordered_set>

#include "mesh/mesh_error.hpp"
#include "mesh/mesh_topology.hpp"

namespace hearth {

namespace {

using Triple = SortedTriangle;
struct TripleHash {
  std::size_t operator()(const Triple& k) const {
    return std::hash<std::int64_t>()((std::int64_t(k[0]) << 32) ^ k[1]) ^ (std::size_t(k[2]) * 0x9e3779b97f4a7c15ULL);
  }
};
constexpr int tet_faces[4][3] = {{0, 1, 2}, {0, 1, 3}, {0, 2, 3}, {1, 2, 3}};

std::array<double, 3> minus(const std::array<double, 3>& a, const std::array<double, 3>& b) {
  return {a[0] - b[0], a[1] - b[1], a[2] - b[2]};
}

}  // namespace

std::size_t split_interface(Mesh& mesh, int boundary) {
  const int npe = mesh.nodes_per_tet(), npf = mesh.nodes_per_face();
  std::unordered_set<Triple, TripleHash> surface;
  std::set<std::int32_t> surface_nodes;
  for (std::size_t f = 0; f < mesh.n_faces(); ++f)
    if (mesh.face_boundary[f] == boundary) {
      const std::int32_t* n = mesh.face(f);
      surface.insert(sorted_triangle(n[0], n[1], n[2]));
      for (int a = 0; a < npf; ++a) surface_nodes.insert(n[a]);
    }
  const std::string name = mesh.boundaries[boundary].name;
  if (surface.empty()) throw MeshError("interface '" + name + "' has no faces in the mesh");

  // Elements on either side of each surface face: front = the side the normal points to.
  std::unordered_map<Triple, std::array<std::int32_t, 2>, TripleHash> sides;
  std::unordered_map<std::int32_t, std::vector<std::int32_t>> node_elements;
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* n = mesh.tet(e);
    for (int a = 0; a < npe; ++a)
      if (surface_nodes.count(n[a])) node_elements[n[a]].push_back(static_cast<std::int32_t>(e));
    for (int k = 0; k < 4; ++k) {
      const Triple key = sorted_triangle(n[tet_faces[k][0]], n[tet_faces[k][1]], n[tet_faces[k][2]]);
      if (surface.count(key)) sides.emplace(key, std::array<std::int32_t, 2>{-1, -1});
    }
  }
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    if (mesh.face_boundary[f] != boundary) continue;
    const std::int32_t* n = mesh.face(f);
    const auto p0 = mesh.node(n[0]);
    const auto u = minus(mesh.node(n[1]), p0), v = minus(mesh.node(n[2]), p0);
    const std::array<double, 3> normal{u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]};
    auto& side = sides[sorted_triangle(n[0], n[1], n[2])];
    for (const std::int32_t e : node_elements[n[0]]) {
      const std::int32_t* t = mesh.tet(e);
      int shared = 0, other = -1;
      for (int a = 0; a < 4; ++a)
        if (t[a] == n[0] || t[a] == n[1] || t[a] == n[2]) ++shared;
        else other = t[a];
      if (shared != 3) continue;
      const auto w = minus(mesh.node(other), p0);
      side[(w[0] * normal[0] + w[1] * normal[1] + w[2] * normal[2]) > 0 ? 1 : 0] = e;
    }
    if (side[0] < 0 || side[1] < 0)
      throw MeshError("interface '" + name + "' is not an internal surface (some of its faces have material on one "
                      "side only); a thermal contact joins two volumes along a surface between them");
  }

  // Around each surface node, flood from the front elements through faces that are not
  // on the surface; the elements reached take the copy.
  std::map<std::int32_t, std::int32_t> copy_of;  // node -> its copy
  std::unordered_map<std::int32_t, std::vector<std::int32_t>> front_elements;  // node -> elements taking the copy
  for (const auto& [node, elements] : node_elements) {
    std::set<std::int32_t> front, back;
    for (const auto& [key, side] : sides) {
      (void)key;
      for (int s = 0; s < 2; ++s)
        if (std::find(elements.begin(), elements.end(), side[s]) != elements.end()) (s ? front : back).insert(side[s]);
    }
    if (front.empty()) continue;
    std::vector<std::int32_t> stack(front.begin(), front.end());
    std::set<std::int32_t> reached(front.begin(), front.end());
    bool leaks = false;
    while (!stack.empty()) {
      const std::int32_t e = stack.back();
      stack.pop_back();
      for (const std::int32_t g : elements) {
        if (reached.count(g)) continue;
        // Neighbours through a shared face (three shared vertices) that is not on the surface.
        std::vector<std::int32_t> common;
        for (int a = 0; a < 4; ++a)
          for (int b = 0; b < 4; ++b)
            if (mesh.tet(e)[a] == mesh.tet(g)[b]) common.push_back(mesh.tet(e)[a]);
        if (common.size() != 3 || surface.count(sorted_triangle(common[0], common[1], common[2]))) continue;
        if (back.count(g)) leaks = true;
        reached.insert(g);
        stack.push_back(g);
      }
    }
    if (leaks) continue;  // the surface does not separate the material here: keep the node shared
    front_elements[node] = std::vector<std::int32_t>(reached.begin(), reached.end());
  }
  for (const auto& [node, elements] : front_elements) {
    (void)elements;
    const auto copy = static_cast<std::int32_t>(mesh.n_nodes());
    const auto x = mesh.node(node);
    mesh.coords.insert(mesh.coords.end(), x.begin(), x.end());
    copy_of[node] = copy;
  }
  for (const auto& [node, elements] : front_elements)
    for (const std::int32_t e : elements)
      for (int a = 0; a < npe; ++a)
        if (mesh.tet_nodes[std::size_t(e) * npe + a] == node) mesh.tet_nodes[std::size_t(e) * npe + a] = copy_of[node];

  // Faces: the surface's own get twins; other boundary faces of front elements take copies.
  if (mesh.face_twin_nodes.empty()) mesh.face_twin_nodes.assign(mesh.n_faces() * npf, -1);
  std::unordered_map<Triple, std::int32_t, TripleHash> element_of_face;
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* n = mesh.tet(e);
    for (int k = 0; k < 4; ++k) element_of_face[sorted_triangle(n[tet_faces[k][0]], n[tet_faces[k][1]], n[tet_faces[k][2]])] = e;
  }
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    std::int32_t* n = &mesh.face_nodes[f * npf];
    if (mesh.face_boundary[f] == boundary) {
      for (int a = 0; a < npf; ++a) {
        const auto it = copy_of.find(n[a]);
        mesh.face_twin_nodes[f * npf + a] = it == copy_of.end() ? n[a] : it->second;
      }
      continue;
    }
    // A face whose nodes now exist only as copies in its element follows the element.
    bool touches = false;
    for (int a = 0; a < npf; ++a) touches |= copy_of.count(n[a]) > 0;
    if (!touches || element_of_face.count(sorted_triangle(n[0], n[1], n[2]))) continue;
    std::int32_t m[6];
    for (int a = 0; a < npf; ++a) {
      const auto it = copy_of.find(n[a]);
      m[a] = it == copy_of.end() ? n[a] : it->second;
    }
    if (element_of_face.count(sorted_triangle(m[0], m[1], m[2])))
      for (int a = 0; a < npf; ++a) n[a] = m[a];
  }
  return copy_of.size();
}

}  // namespace hearth
