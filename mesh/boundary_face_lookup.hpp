// Finding the elements on each side of the mesh's boundary triangles, without listing
// all element faces. Header-only and free of Gmsh, so that solver/ (which links no
// mesh library) uses the same code as the mesh checks.
#pragma once

#include <algorithm>
#include <array>
#include <cstddef>
#include <cstdint>
#include <utility>
#include <vector>

#include "mesh/mesh.hpp"

namespace hearth {

// A triangle by its three vertex node numbers in increasing order.
using SortedTriangle = std::array<std::int32_t, 3>;

// The triangle through vertices a, b, c with its numbers sorted.
inline SortedTriangle sorted_triangle(std::int32_t a, std::int32_t b, std::int32_t c) {
  if (a > b) std::swap(a, b);
  if (b > c) std::swap(b, c);
  if (a > b) std::swap(a, b);
  return {a, b, c};
}

// The vertex faces of a tetrahedron and, for each, the vertex opposite it.
constexpr int kTetFaceVertices[4][3] = {{0, 1, 2}, {0, 1, 3}, {0, 2, 3}, {1, 2, 3}};
constexpr int kTetFaceOpposite[4] = {3, 2, 1, 0};

// Calls visit(f, e, k) for every boundary triangle f of mesh.face_nodes that is face k
// (kTetFaceVertices) of element e. The boundary triangles are few next to the 4 faces
// of every element, so they are looked up by their smallest vertex among the triangles
// starting there, and a face with a vertex on no boundary triangle is skipped at once:
// one pass over the elements, in parallel, without listing or sorting all their faces.
// visit must be safe to call from several threads at once.
template <class Visit>
void for_each_boundary_face_of_elements(const Mesh& mesh, Visit visit) {
  const std::size_t n_nodes = mesh.n_nodes(), n_faces = mesh.n_faces();
  std::vector<char> on_boundary(n_nodes, 0);
  std::vector<std::size_t> start(n_nodes + 1, 0);
  std::vector<SortedTriangle> key(n_faces);
  for (std::size_t f = 0; f < n_faces; ++f) {
    const std::int32_t* v = mesh.face(f);
    key[f] = sorted_triangle(v[0], v[1], v[2]);
    for (int a = 0; a < 3; ++a) on_boundary[v[a]] = 1;
    ++start[key[f][0] + 1];
  }
  for (std::size_t i = 0; i < n_nodes; ++i) start[i + 1] += start[i];
  std::vector<std::int32_t> faces_from(n_faces);
  {
    std::vector<std::size_t> fill(start.begin(), start.end() - 1);
    for (std::size_t f = 0; f < n_faces; ++f) faces_from[fill[key[f][0]]++] = static_cast<std::int32_t>(f);
  }
  const std::int64_t n_tets = static_cast<std::int64_t>(mesh.n_tets());
#pragma omp parallel for schedule(static)
  for (std::int64_t e = 0; e < n_tets; ++e) {
    const std::int32_t* t = mesh.tet(static_cast<std::size_t>(e));
    for (int k = 0; k < 4; ++k) {
      const std::int32_t a = t[kTetFaceVertices[k][0]], b = t[kTetFaceVertices[k][1]], c = t[kTetFaceVertices[k][2]];
      if (!on_boundary[a] || !on_boundary[b] || !on_boundary[c]) continue;
      const SortedTriangle face = sorted_triangle(a, b, c);
      for (std::size_t p = start[face[0]]; p < start[face[0] + 1]; ++p)
        if (key[faces_from[p]] == face) visit(static_cast<std::size_t>(faces_from[p]), static_cast<std::int32_t>(e), k);
    }
  }
}

// For every boundary triangle of `mesh.face_nodes`, the elements it is a face of:
// {behind, in front of} its normal (the right-hand normal of its vertex order), -1 where
// there is none (exterior faces have one). A face cut for a thermal contact finds only the
// element behind it: the one in front holds the twin nodes.
using FaceElements = std::array<std::int32_t, 2>;

inline std::vector<FaceElements> boundary_face_elements(const Mesh& mesh) {
  std::vector<FaceElements> elements(mesh.n_faces(), FaceElements{-1, -1});
  for_each_boundary_face_of_elements(mesh, [&](std::size_t f, std::int32_t e, int k) {
    // Which side: the element's fourth vertex against the face's own normal.
    const std::int32_t* v = mesh.face(f);
    const auto x0 = mesh.node(v[0]), x1 = mesh.node(v[1]), x2 = mesh.node(v[2]);
    const auto opposite = mesh.node(mesh.tet(static_cast<std::size_t>(e))[kTetFaceOpposite[k]]);
    double u[3], w[3], d[3];
    for (int i = 0; i < 3; ++i) u[i] = x1[i] - x0[i], w[i] = x2[i] - x0[i], d[i] = opposite[i] - x0[i];
    const double side = d[0] * (u[1] * w[2] - u[2] * w[1]) + d[1] * (u[2] * w[0] - u[0] * w[2]) +
                        d[2] * (u[0] * w[1] - u[1] * w[0]);
    elements[f][side < 0 ? 0 : 1] = e;  // one element a side in a valid mesh: no two threads write one entry
  });
  return elements;
}

}  // namespace hearth
