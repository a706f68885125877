// body_surface: the outside of the body for viewing, checked by hand on two elements
// and against the divergence theorem on meshed boxes.
#include <gtest/gtest.h>

#include <array>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <random>
#include <set>

#include "mesh/body_surface.hpp"
#include "mesh/gmsh_mesher.hpp"
#include "mesh/interface_split.hpp"

namespace hearth {
namespace {

namespace fs = std::filesystem;
using Vec = std::array<double, 3>;

Vec sub(const Vec& a, const Vec& b) { return {a[0] - b[0], a[1] - b[1], a[2] - b[2]}; }
Vec cross(const Vec& a, const Vec& b) {
  return {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
}
double dot(const Vec& a, const Vec& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }

// Right-hand normal times area of the straight triangle through a face's vertices.
Vec vector_area(const Mesh& mesh, const std::int32_t* face) {
  const Vec n = cross(sub(mesh.node(face[1]), mesh.node(face[0])), sub(mesh.node(face[2]), mesh.node(face[0])));
  return {n[0] / 2, n[1] / 2, n[2] / 2};
}

Vec centroid(const Mesh& mesh, const std::int32_t* face) {
  Vec c{0, 0, 0};
  for (int k = 0; k < 3; ++k)
    for (int d = 0; d < 3; ++d) c[d] += mesh.node(face[k])[d] / 3;
  return c;
}

// Two tetrahedra sharing the face (1, 2, 3); the shared face is named "middle" and
// the face z = 0 "base", written with its normal pointing into the body.
Mesh two_tets() {
  Mesh m;
  m.coords = {0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 1, 1};
  m.tet_nodes = {0, 1, 2, 3, 1, 2, 3, 4};  // both of positive volume (checked below)
  m.tet_region = {0, 1};
  m.regions = {{"a", 1}, {"b", 2}};
  m.boundaries = {{"base", 11}, {"middle", 12}};
  m.face_nodes = {0, 1, 2, 1, 2, 3};
  m.face_boundary = {0, 1};
  return m;
}

TEST(BodySurface, HandBuiltPairHasSixOutwardFacesAndTheInternalOneAsGiven) {
  const Mesh m = two_tets();
  for (std::size_t e = 0; e < 2; ++e) {
    const std::int32_t* t = m.tet(e);
    const Vec n = cross(sub(m.node(t[1]), m.node(t[0])), sub(m.node(t[2]), m.node(t[0])));
    ASSERT_GT(dot(n, sub(m.node(t[3]), m.node(t[0]))), 0.0) << "element " << e;
  }
  const BodySurface s = body_surface(m);
  // 8 element faces, 2 of them shared: 6 exterior, plus the named internal one.
  ASSERT_EQ(s.n_faces(), 7u);
  int exterior = 0, unnamed = 0;
  for (std::size_t f = 0; f < s.n_faces(); ++f) {
    const std::int32_t* v = s.face(f);
    if (!s.exterior[f]) {
      EXPECT_EQ(s.face_boundary[f], 1);
      EXPECT_EQ(std::set<int>(v, v + 3), (std::set<int>{1, 2, 3}));
      EXPECT_EQ(v[0], 1);  // kept as the mesh gave it
      EXPECT_EQ(v[1], 2);
      EXPECT_EQ(s.face_region[f], -1);
      continue;
    }
    ++exterior;
    if (s.face_boundary[f] < 0) ++unnamed;
    // Outward: the normal points away from the element the face bounds.
    const int e = s.face_region[f];  // region index equals element index here
    const std::int32_t* t = m.tet(static_cast<std::size_t>(e));
    Vec inside{0, 0, 0};
    for (int k = 0; k < 4; ++k)
      for (int d = 0; d < 3; ++d) inside[d] += m.node(t[k])[d] / 4;
    EXPECT_GT(dot(vector_area(m, v), sub(centroid(m, v), inside)), 0.0) << "face " << f;
  }
  EXPECT_EQ(exterior, 6);
  EXPECT_EQ(unnamed, 5);
  // "base" (z = 0) now faces -z: the geometry gave it +z, into the body.
  EXPECT_EQ(s.face_boundary[0], 0);
  EXPECT_LT(vector_area(m, s.face(0))[2], 0.0);
}

class ScratchFolder {
 public:
  ScratchFolder() {
    std::random_device random;
    path_ = fs::temp_directory_path() / ("hearth_test_surface_" + std::to_string(random()));
    fs::create_directories(path_);
  }
  ~ScratchFolder() {
    std::error_code ignored;
    fs::remove_all(path_, ignored);
  }
  fs::path write(const std::string& name, const std::string& text) const {
    std::ofstream(path_ / name) << text;
    return path_ / name;
  }

 private:
  fs::path path_;
};

Mesh mesh_of(const fs::path& file, double size, int order) {
  MeshRequest request;
  request.geometry_file = file;
  request.size = size;
  request.order = order;
  request.threads = 1;
  return build_mesh(request);
}

// Two unit boxes side by side in x, the face between them named "joint", the outer
// face x = 0 named "left", the rest unnamed.
const char* const kTwoBoxes = R"(
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1, 1, 1};
Box(2) = {1, 0, 0, 1, 1, 1};
BooleanFragments{ Volume{1, 2}; Delete; }{}
e = 1e-6;
Physical Volume("first") = {1};
Physical Volume("second") = {2};
Physical Surface("left") = Surface In BoundingBox{-e, -e, -e, e, 1 + e, 1 + e};
Physical Surface("joint") = Surface In BoundingBox{1 - e, -e, -e, 1 + e, 1 + e, 1 + e};
)";

// Gauss's divergence theorem over the closed outside: sum of n dA is zero and
// (1/3) sum of x.n dA is the volume (2 for the two unit boxes).
void expect_closed_outward(const Mesh& m, const BodySurface& s) {
  Vec total{0, 0, 0};
  double volume = 0, area = 0;
  for (std::size_t f = 0; f < s.n_faces(); ++f) {
    if (!s.exterior[f]) continue;
    const Vec a = vector_area(m, s.face(f));
    for (int d = 0; d < 3; ++d) total[d] += a[d];
    volume += dot(centroid(m, s.face(f)), a) / 3;
    area += std::sqrt(dot(a, a));
  }
  EXPECT_NEAR(area, 10.0, 1e-9);  // 2 x 1 x 1 box: closed form 2(2 + 2 + 1)
  for (int d = 0; d < 3; ++d) EXPECT_NEAR(total[d], 0.0, 1e-12);
  EXPECT_NEAR(volume, 2.0, 1e-9);
}

TEST(BodySurface, MeshedBoxesAreClosedAndOutwardInBothOrders) {
  ScratchFolder folder;
  const fs::path geo = folder.write("boxes.geo", kTwoBoxes);
  for (int order : {1, 2}) {
    SCOPED_TRACE("order " + std::to_string(order));
    const Mesh m = mesh_of(geo, 0.4, order);
    const BodySurface s = body_surface(m);
    ASSERT_EQ(s.nodes_per_face, order == 2 ? 6 : 3);
    expect_closed_outward(m, s);
    int internal = 0;
    for (std::size_t f = 0; f < s.n_faces(); ++f) {
      const std::string name = s.face_boundary[f] < 0 ? "" : m.boundaries[s.face_boundary[f]].name;
      EXPECT_EQ(s.exterior[f] == 0, name == "joint") << "face " << f;
      internal += s.exterior[f] == 0;
      if (order == 2)  // edge nodes lie midway between the vertices of their edge
        for (int k = 0; k < 3; ++k) {
          const std::int32_t* v = s.face(f);
          const Vec a = m.node(v[k]), b = m.node(v[(k + 1) % 3]), mid = m.node(v[3 + k]);
          for (int d = 0; d < 3; ++d) EXPECT_NEAR(mid[d], (a[d] + b[d]) / 2, 1e-12);
        }
    }
    EXPECT_GT(internal, 0);
  }
}

TEST(BodySurface, ContactSurfaceCutOpenAppearsOnceAndTheOutsideStaysClosed) {
  ScratchFolder folder;
  Mesh m = mesh_of(folder.write("boxes.geo", kTwoBoxes), 0.4, 1);
  int joint = -1;
  for (std::size_t b = 0; b < m.boundaries.size(); ++b)
    if (m.boundaries[b].name == "joint") joint = static_cast<int>(b);
  ASSERT_GE(joint, 0);
  std::size_t joint_faces = 0;
  for (std::size_t f = 0; f < m.n_faces(); ++f) joint_faces += m.face_boundary[f] == joint;
  ASSERT_GT(split_interface(m, joint), 0u);
  const BodySurface s = body_surface(m);
  std::size_t internal = 0;
  for (std::size_t f = 0; f < s.n_faces(); ++f) internal += s.exterior[f] == 0;
  EXPECT_EQ(internal, joint_faces);  // once, not once per side
  expect_closed_outward(m, s);
}

}  // namespace
}  // namespace hearth
