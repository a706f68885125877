// Mesh stage: Gmsh scripts written to a temporary folder, meshed, and checked against
// closed forms (volumes and areas of boxes, radii of cylinders, midpoints of edges).
#include <gtest/gtest.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <fstream>
#include <map>
#include <numeric>
#include <random>
#include <set>
#include <string>
#include <vector>

#include "mesh/gmsh_arrays.hpp"
#include "mesh/gmsh_mesher.hpp"
#include "mesh/mesh_error.hpp"
#include "mesh/mesh_quality.hpp"
#include "mesh/mesh_topology.hpp"
#include "mesh/renumber.hpp"

namespace hearth {
namespace {

namespace fs = std::filesystem;

// A fresh folder under the system's temporary folder, removed at the end of the test.
class ScratchFolder {
 public:
  ScratchFolder() {
    std::random_device random;
    path_ = fs::temp_directory_path() / ("hearth_test_mesh_" + std::to_string(random()));
    fs::create_directories(path_);
  }
  ~ScratchFolder() {
    std::error_code ignored;
    fs::remove_all(path_, ignored);
  }
  fs::path write(const std::string& name, const std::string& text) const {
    const fs::path file = path_ / name;
    std::ofstream(file) << text;
    return file;
  }
  const fs::path& path() const { return path_; }

 private:
  fs::path path_;
};

// A unit box with a physical volume, the faces z = 0 and z = 1 named and the four
// sides left unnamed.
const char* const kUnitBox = R"(
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1, 1, 1};
e = 1e-6;
Physical Volume("solid") = {1};
Physical Surface("bottom") = Surface In BoundingBox{-e, -e, -e, 1 + e, 1 + e, e};
Physical Surface("top") = Surface In BoundingBox{-e, -e, 1 - e, 1 + e, 1 + e, 1 + e};
)";

// One meshing thread keeps the tests quick on a busy machine; the unit-box test runs
// the default (two threads).
MeshRequest request_for(const fs::path& file, double size, int order = 1) {
  MeshRequest request;
  request.geometry_file = file;
  request.size = size;
  request.order = order;
  request.threads = 1;
  return request;
}

Point3 midpoint(const Point3& a, const Point3& b) { return {(a[0] + b[0]) / 2, (a[1] + b[1]) / 2, (a[2] + b[2]) / 2}; }

double distance(const Point3& a, const Point3& b) {
  return std::sqrt((a[0] - b[0]) * (a[0] - b[0]) + (a[1] - b[1]) * (a[1] - b[1]) + (a[2] - b[2]) * (a[2] - b[2]));
}

double total_volume(const Mesh& mesh) {
  double volume = 0.0;
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* t = mesh.tet(e);
    volume += tet_signed_volume(mesh.node(t[0]), mesh.node(t[1]), mesh.node(t[2]), mesh.node(t[3]));
  }
  return volume;
}

int boundary_index(const Mesh& mesh, const std::string& name) {
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b)
    if (mesh.boundaries[b].name == name) return static_cast<int>(b);
  ADD_FAILURE() << "no boundary " << name;
  return -1;
}

// Vector area (sum of right-hand normals times areas) of the straight triangles of a boundary.
Point3 vector_area(const Mesh& mesh, const std::string& name) {
  const int b = boundary_index(mesh, name);
  Point3 sum{0, 0, 0};
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    if (mesh.face_boundary[f] != b) continue;
    const std::int32_t* v = mesh.face(f);
    const Point3 p0 = mesh.node(v[0]), p1 = mesh.node(v[1]), p2 = mesh.node(v[2]);
    const Point3 a{p1[0] - p0[0], p1[1] - p0[1], p1[2] - p0[2]}, c{p2[0] - p0[0], p2[1] - p0[1], p2[2] - p0[2]};
    sum[0] += 0.5 * (a[1] * c[2] - a[2] * c[1]);
    sum[1] += 0.5 * (a[2] * c[0] - a[0] * c[2]);
    sum[2] += 0.5 * (a[0] * c[1] - a[1] * c[0]);
  }
  return sum;
}

double area(const Mesh& mesh, const std::string& name) {
  const int b = boundary_index(mesh, name);
  double sum = 0.0;
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    if (mesh.face_boundary[f] != b) continue;
    const std::int32_t* v = mesh.face(f);
    const Point3 p0 = mesh.node(v[0]), p1 = mesh.node(v[1]), p2 = mesh.node(v[2]);
    const Point3 a{p1[0] - p0[0], p1[1] - p0[1], p1[2] - p0[2]}, c{p2[0] - p0[0], p2[1] - p0[1], p2[2] - p0[2]};
    const Point3 n{a[1] * c[2] - a[2] * c[1], a[2] * c[0] - a[0] * c[2], a[0] * c[1] - a[1] * c[0]};
    sum += 0.5 * std::sqrt(n[0] * n[0] + n[1] * n[1] + n[2] * n[2]);
  }
  return sum;
}

std::vector<std::string> names(const std::vector<NamedEntity>& entities) {
  std::vector<std::string> list;
  for (const NamedEntity& entity : entities) list.push_back(entity.name);
  return list;
}

// The fixture scripts that write their mesh or STEP file with Save: the geometry guard
// refuses Save unless the script is trusted (mesh/geometry_guard.hpp).
MeshRequest trusted(MeshRequest request) {
  request.trust_geometry = true;
  return request;
}

std::string error_of(const MeshRequest& request) {
  try {
    build_mesh(request);
  } catch (const MeshError& error) {
    return error.what();
  }
  ADD_FAILURE() << "no MeshError";
  return "";
}

// Quarter of a cylindrical shell, inner radius 0.5, outer radius 1, height 0.5.
const char* const kQuarterShell = R"(
SetFactory("OpenCASCADE");
Cylinder(1) = {0, 0, 0, 0, 0, 0.5, 1.0, Pi/2};
Cylinder(2) = {0, 0, -1, 0, 0, 2.5, 0.5, Pi/2};
BooleanDifference(3) = { Volume{1}; Delete; }{ Volume{2}; Delete; };
)";

// Checks that every edge node of the triangles on the two cylindrical faces of the
// quarter shell lies on its cylinder (to 1e-9 relative); returns how many it checked.
// A triangle is on a cylinder when its vertices are and it is not in one of the
// planes z = 0, z = 0.5, x = 0, y = 0.
std::size_t check_edge_nodes_on_cylinders(const Mesh& mesh) {
  auto radius = [&](std::int32_t node) { return std::hypot(mesh.node(node)[0], mesh.node(node)[1]); };
  std::size_t checked = 0;
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const std::int32_t* v = mesh.face(f);
    bool in_plane = false;
    for (int d = 0; d < 3; ++d)
      in_plane = in_plane || (mesh.node(v[0])[d] == mesh.node(v[1])[d] && mesh.node(v[1])[d] == mesh.node(v[2])[d]);
    if (in_plane) continue;
    for (double surface : {1.0, 0.5}) {
      if (!std::all_of(v, v + 3, [&](std::int32_t n) { return std::fabs(radius(n) - surface) < 1e-9 * surface; }))
        continue;
      for (int k = 3; k < 6; ++k) {
        EXPECT_NEAR(radius(v[k]), surface, 1e-9 * surface) << "face " << f << " node " << k;
        ++checked;
      }
    }
  }
  return checked;
}

TEST(Quality, GammaIsOneForTheRegularTetAndZeroForAFlatOne) {
  const double s = 1.0 / std::sqrt(2.0);
  EXPECT_NEAR(tet_gamma({1, 0, -s}, {-1, 0, -s}, {0, 1, s}, {0, -1, s}), 1.0, 1e-14);
  EXPECT_NEAR(tet_gamma({0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {1, 1, 0}), 0.0, 1e-14);
  // Corner tet (0, e1, e2, e3): r = 1/(3+sqrt(3)), R = sqrt(3)/2, gamma = 3r/R.
  const double corner = 3.0 / (3.0 + std::sqrt(3.0)) / (std::sqrt(3.0) / 2.0);
  EXPECT_NEAR(tet_gamma({0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}), corner, 1e-14);
  EXPECT_NEAR(tet_gamma({0, 0, 0}, {0, 1, 0}, {1, 0, 0}, {0, 0, 1}), corner, 1e-14);  // either orientation
}

TEST(Conversion, PermutationFromGmshLocalCoordinates) {
  // Local node coordinates of Gmsh's 10-node tetrahedron (element type 11) and 6-node
  // triangle (type 9) as getElementProperties reports them in Gmsh 4.8.
  const std::vector<double> tet10 = {0, 0, 0,   1, 0, 0,   0, 1, 0,     0, 0, 1,   0.5, 0, 0,
                                     0.5, 0.5, 0, 0, 0.5, 0, 0, 0, 0.5, 0, 0.5, 0.5, 0.5, 0, 0.5};
  EXPECT_EQ(canonical_node_permutation(3, tet10), (std::vector<int>{0, 1, 2, 3, 4, 5, 6, 7, 9, 8}));
  const std::vector<double> tri6 = {0, 0, 1, 0, 0, 1, 0.5, 0, 0.5, 0.5, 0, 0.5};
  EXPECT_EQ(canonical_node_permutation(2, tri6), (std::vector<int>{0, 1, 2, 3, 4, 5}));
  EXPECT_THROW(canonical_node_permutation(3, std::vector<double>(15, 0.0)), std::invalid_argument);
}

TEST(Mesher, UnitBoxNamesVolumeAreasAndOrientation) {
  ScratchFolder folder;
  std::vector<std::string> progress;
  MeshRequest request = request_for(folder.write("box.geo", kUnitBox), 0.2);
  request.threads = 0;
  request.progress = [&](const std::string& line) { progress.push_back(line); };
  testing::internal::CaptureStdout();
  testing::internal::CaptureStderr();
  const Mesh mesh = build_mesh(request);
  EXPECT_EQ(testing::internal::GetCapturedStdout(), "");
  EXPECT_EQ(testing::internal::GetCapturedStderr(), "");

  EXPECT_EQ(mesh.order, 1);
  EXPECT_EQ(names(mesh.regions), (std::vector<std::string>{"solid"}));
  EXPECT_EQ(names(mesh.boundaries), (std::vector<std::string>{"bottom", "top"}));
  EXPECT_GT(mesh.n_tets(), 100u);
  EXPECT_NEAR(total_volume(mesh), 1.0, 1e-12);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* t = mesh.tet(e);
    ASSERT_GT(tet_signed_volume(mesh.node(t[0]), mesh.node(t[1]), mesh.node(t[2]), mesh.node(t[3])), 0.0) << e;
    ASSERT_EQ(mesh.tet_region[e], 0);
  }
  EXPECT_NEAR(area(mesh, "bottom"), 1.0, 1e-12);
  EXPECT_NEAR(area(mesh, "top"), 1.0, 1e-12);
  // The box's faces are oriented outwards by the geometry: bottom -z, top +z.
  EXPECT_NEAR(vector_area(mesh, "bottom")[2], -1.0, 1e-12);
  EXPECT_NEAR(vector_area(mesh, "top")[2], 1.0, 1e-12);
  EXPECT_EQ(internal_boundaries(mesh), (std::vector<bool>{false, false}));
  // The four unnamed sides make up the rest of the exterior.
  EXPECT_EQ(mesh.unnamed_exterior_faces + mesh.n_faces(), exterior_faces(mesh).size());
  EXPECT_GT(mesh.unnamed_exterior_faces, 0u);
  ASSERT_EQ(mesh.tet_quality.size(), mesh.n_tets());
  for (double q : mesh.tet_quality) {
    EXPECT_GT(q, 0.0);
    EXPECT_LE(q, 1.0);
  }
  const QualitySummary quality = summarize_quality(mesh);
  EXPECT_GT(quality.min, 0.1);
  EXPECT_GT(quality.mean, quality.min);
  // Coordinates lie in the box.
  for (double c : mesh.coords) {
    EXPECT_GE(c, -1e-12);
    EXPECT_LE(c, 1.0 + 1e-12);
  }
  const bool reported = std::any_of(progress.begin(), progress.end(), [](const std::string& line) {
    return line.rfind("meshing box.geo: ", 0) == 0 && line.find("(HXT)") != std::string::npos;
  });
  EXPECT_TRUE(reported);
}

TEST(Mesher, OrderTwoStraightBoxHasEdgeNodesAtMidpointsInVtkOrder) {
  ScratchFolder folder;
  const Mesh mesh = build_mesh(request_for(folder.write("box.geo", kUnitBox), 0.25, 2));
  ASSERT_EQ(mesh.order, 2);
  ASSERT_EQ(mesh.tet_nodes.size(), 10 * mesh.n_tets());
  ASSERT_EQ(mesh.face_nodes.size(), 6 * mesh.n_faces());
  EXPECT_NEAR(total_volume(mesh), 1.0, 1e-12);
  static constexpr int kEdges[6][2] = {{0, 1}, {1, 2}, {0, 2}, {0, 3}, {1, 3}, {2, 3}};
  std::set<std::int32_t> vertices;
  std::set<std::pair<std::int32_t, std::int32_t>> edges;
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* t = mesh.tet(e);
    for (int k = 0; k < 6; ++k) {
      const Point3 mid = midpoint(mesh.node(t[kEdges[k][0]]), mesh.node(t[kEdges[k][1]]));
      ASSERT_LT(distance(mesh.node(t[4 + k]), mid), 1e-12) << "element " << e << " edge node " << 4 + k;
      edges.emplace(std::min(t[kEdges[k][0]], t[kEdges[k][1]]), std::max(t[kEdges[k][0]], t[kEdges[k][1]]));
    }
    vertices.insert(t, t + 4);
  }
  // Every node is a vertex or the one node of an edge.
  EXPECT_EQ(mesh.n_nodes(), vertices.size() + edges.size());
  static constexpr int kFaceEdges[3][2] = {{0, 1}, {1, 2}, {2, 0}};
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const std::int32_t* v = mesh.face(f);
    for (int k = 0; k < 3; ++k)
      ASSERT_LT(distance(mesh.node(v[3 + k]), midpoint(mesh.node(v[kFaceEdges[k][0]]), mesh.node(v[kFaceEdges[k][1]]))),
                1e-12);
  }
  EXPECT_NEAR(area(mesh, "bottom"), 1.0, 1e-12);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) ASSERT_NEAR(min_jacobian_ratio(mesh, e), 1.0, 1e-9);
}

TEST(Mesher, OrderTwoEdgeNodesFollowTheCurvedGeometry) {
  ScratchFolder folder;
  const Mesh mesh = build_mesh(request_for(folder.write("shell.geo", kQuarterShell), 0.15, 2));
  ASSERT_EQ(mesh.order, 2);
  EXPECT_GT(check_edge_nodes_on_cylinders(mesh), 300u);
  // Quarter annulus times height: (pi/4)(1 - 0.25)(0.5); the straight-sided volume is a
  // little smaller.
  const double exact = M_PI / 4 * 0.75 * 0.5;
  EXPECT_LT(total_volume(mesh), exact);
  EXPECT_GT(total_volume(mesh), 0.98 * exact);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) ASSERT_GT(min_jacobian_ratio(mesh, e), 0.0);
}

TEST(Mesher, MillimetreGeometryIsScaledToMetres) {
  ScratchFolder folder;
  const fs::path file = folder.write("box_mm.geo", R"(
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1000, 1000, 1000};
)");
  MeshRequest request = request_for(file, 0.25);  // metres
  request.length_unit = "mm";
  const Mesh mesh = build_mesh(request);
  EXPECT_NEAR(total_volume(mesh), 1.0, 1e-12);
  EXPECT_NEAR(*std::max_element(mesh.coords.begin(), mesh.coords.end()), 1.0, 1e-12);
  // About 4 elements along an edge at size 0.25 m, not 4000.
  EXPECT_LT(mesh.n_tets(), 2000u);
}

TEST(Mesher, ScriptMeshSettingsDoNotOverrideTheRequest) {
  ScratchFolder folder;
  const fs::path file = folder.write("settings.geo", std::string(kUnitBox) +
                                                        "Mesh.ElementOrder = 2;\nMesh.MeshSizeFactor = 0.25;\n"
                                                        "Mesh.CharacteristicLengthMax = 0.05;\n");
  const Mesh mesh = build_mesh(request_for(file, 0.25));
  EXPECT_EQ(mesh.order, 1);
  EXPECT_LT(mesh.n_tets(), 2000u);  // about 4 elements an edge, not 16 or 20
}

TEST(Mesher, UnnamedEntitiesAreNamedByTheirTags) {
  ScratchFolder folder;
  const char* const two_boxes = R"(
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1, 1, 1};
Box(2) = {1, 0, 0, 1, 1, 1};
BooleanFragments{ Volume{1, 2}; Delete; }{}
)";
  const Mesh unnamed = build_mesh(request_for(folder.write("two.geo", two_boxes), 0.34));
  EXPECT_EQ(names(unnamed.regions), (std::vector<std::string>{"volume_1", "volume_2"}));
  EXPECT_EQ(unnamed.regions[1].tag, 2);
  ASSERT_EQ(unnamed.boundaries.size(), 11u);  // 6 + 6 faces, one shared
  for (const NamedEntity& boundary : unnamed.boundaries)
    EXPECT_EQ(boundary.name, "surface_" + std::to_string(boundary.tag));
  EXPECT_EQ(unnamed.unnamed_exterior_faces, 0u);
  EXPECT_NEAR(total_volume(unnamed), 2.0, 1e-12);
  // The shared face is the one internal boundary.
  const std::vector<bool> internal = internal_boundaries(unnamed);
  EXPECT_EQ(std::count(internal.begin(), internal.end(), true), 1);

  const Mesh partly = build_mesh(request_for(
      folder.write("partly.geo", std::string(two_boxes) + "Physical Volume(\"left\") = {1};\nPhysical Volume(7) = {2};\n"),
      0.34));
  EXPECT_EQ(names(partly.regions), (std::vector<std::string>{"left", "volume_7"}));
  std::size_t in_left = std::count(partly.tet_region.begin(), partly.tet_region.end(), 0);
  EXPECT_GT(in_left, 0u);
  EXPECT_LT(in_left, partly.n_tets());
}

TEST(Mesher, InternalNamedSurfaceKeepsOneOrientation) {
  // Two layers sharing the face x = 0.3, named as a cut.
  ScratchFolder folder;
  const fs::path file = folder.write("layers.geo", R"(
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.3, 1, 1};
Box(2) = {0.3, 0, 0, 0.7, 1, 1};
BooleanFragments{ Volume{1, 2}; Delete; }{}
e = 1e-6;
Physical Volume("inner") = {1};
Physical Volume("outer") = {2};
Physical Surface("hot") = Surface In BoundingBox{-e, -e, -e, e, 1 + e, 1 + e};
Physical Surface("cut") = Surface In BoundingBox{0.3 - e, -e, -e, 0.3 + e, 1 + e, 1 + e};
)");
  const Mesh mesh = build_mesh(request_for(file, 0.2));
  EXPECT_EQ(names(mesh.boundaries), (std::vector<std::string>{"hot", "cut"}));
  EXPECT_EQ(internal_boundaries(mesh), (std::vector<bool>{false, true}));
  EXPECT_NEAR(area(mesh, "cut"), 1.0, 1e-12);
  // All triangles of the cut share one normal direction (+x or -x), so the vector area
  // is as long as the area.
  EXPECT_NEAR(std::fabs(vector_area(mesh, "cut")[0]), 1.0, 1e-12);
  EXPECT_NEAR(total_volume(mesh), 1.0, 1e-12);
}

TEST(Mesher, GeoSyntaxErrorNamesTheFileAndLine) {
  ScratchFolder folder;
  const fs::path file = folder.write("broken.geo", "SetFactory(\"OpenCASCADE\");\nBox(1) = {0, 0, 0, 1, 1, 1};\nPhysical Volume(\"a\") = {1;\n");
  const std::string message = error_of(request_for(file, 0.2));
  EXPECT_NE(message.find("broken.geo:3: syntax error"), std::string::npos) << message;
}

TEST(Mesher, UnreadableStepGivesTheReadersMessageAndPrintsNothing) {
  ScratchFolder folder;
  std::vector<std::string> progress;
  MeshRequest request = request_for(folder.write("part.step", "ISO-10303-21;\nnot a step file\n"), 0.1);
  request.progress = [&](const std::string& line) { progress.push_back(line); };
  testing::internal::CaptureStdout();
  testing::internal::CaptureStderr();
  const std::string message = error_of(request);
  EXPECT_EQ(testing::internal::GetCapturedStdout(), "");
  EXPECT_EQ(testing::internal::GetCapturedStderr(), "");
  EXPECT_NE(message.find("part.step"), std::string::npos) << message;
  EXPECT_FALSE(progress.empty());
}

TEST(Mesher, MissingFileAndBadRequestsAreErrors) {
  ScratchFolder folder;
  EXPECT_NE(error_of(request_for(folder.path() / "nowhere.geo", 0.1)).find("nowhere.geo"), std::string::npos);
  const fs::path box = folder.write("box.geo", kUnitBox);
  EXPECT_NE(error_of(request_for(box, 0.0)).find("size"), std::string::npos);
  EXPECT_NE(error_of(request_for(box, 0.1, 3)).find("order"), std::string::npos);
  EXPECT_NE(error_of(request_for(folder.write("part.iges", "x"), 0.1)).find(".iges"), std::string::npos);
  EXPECT_NE(error_of(request_for(folder.write("flat.geo", "SetFactory(\"OpenCASCADE\");\nRectangle(1) = {0, 0, 0, 1, 1};\n"), 0.1))
                .find("no volume"),
            std::string::npos);
}

TEST(Mesher, UnknownLocalSizeNameListsTheNames) {
  ScratchFolder folder;
  MeshRequest request = request_for(folder.write("box.geo", kUnitBox), 0.2);
  request.local_sizes = {{"botom", 0.05}};
  const std::string message = error_of(request);
  for (const char* expected : {"'botom'", "bottom", "top", "solid"})
    EXPECT_NE(message.find(expected), std::string::npos) << expected << " in: " << message;
}

TEST(Mesher, LocalSizesRefineNearABoundaryAndInsideARegion) {
  ScratchFolder folder;
  const fs::path file = folder.write("layers.geo", R"(
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1, 1, 1};
Box(2) = {0.4, 0.4, 0.4, 0.2, 0.2, 0.2};
BooleanFragments{ Volume{1}; Delete; }{ Volume{2}; Delete; }
e = 1e-6;
Physical Volume("core") = Volume In BoundingBox{0.4 - e, 0.4 - e, 0.4 - e, 0.6 + e, 0.6 + e, 0.6 + e};
Physical Volume("body") = {1};
Physical Surface("hot") = Surface In BoundingBox{-e, -e, -e, e, 1 + e, 1 + e};
)");
  const Mesh plain = build_mesh(request_for(file, 0.2));
  MeshRequest request = request_for(file, 0.2);
  request.local_sizes = {{"hot", 0.04}, {"core", 0.03}};
  const Mesh refined = build_mesh(request);
  EXPECT_NEAR(total_volume(refined), 1.0, 1e-12);
  // Mean edge length of the elements touching x = 0, and inside the core.
  auto mean_edge = [](const Mesh& mesh, auto&& select) {
    double sum = 0.0;
    std::size_t count = 0;
    for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
      if (!select(mesh, e)) continue;
      const std::int32_t* t = mesh.tet(e);
      for (int a = 0; a < 4; ++a)
        for (int b = a + 1; b < 4; ++b) sum += distance(mesh.node(t[a]), mesh.node(t[b])), ++count;
    }
    return count ? sum / static_cast<double>(count) : 0.0;
  };
  auto at_hot_face = [](const Mesh& mesh, std::size_t e) {
    const std::int32_t* t = mesh.tet(e);
    return std::any_of(t, t + 4, [&](std::int32_t n) { return mesh.node(n)[0] < 1e-12; });
  };
  auto in_core = [](const Mesh& mesh, std::size_t e) { return mesh.regions[mesh.tet_region[e]].name == "core"; };
  EXPECT_GT(mean_edge(plain, at_hot_face), 0.12);
  EXPECT_LT(mean_edge(refined, at_hot_face), 0.06);
  EXPECT_GT(mean_edge(plain, in_core), 0.09);
  EXPECT_LT(mean_edge(refined, in_core), 0.045);
}

TEST(Mesher, RefinementsSplitUniformly) {
  // Gmsh's HXT does not always make the same mesh twice, so the coarse mesh is saved
  // once and refined as a ready mesh; the geometry path is checked for the split
  // counts alone.
  ScratchFolder folder;
  folder.write("save.geo", std::string(kUnitBox) + "Mesh.MeshSizeMax = 0.34;\nMesh 3;\nSave \"coarse.msh\";\n");
  build_mesh(trusted(request_for(folder.path() / "save.geo", 0.34)));
  MeshRequest request = request_for(folder.path() / "coarse.msh", 0.34);
  const Mesh coarse = build_mesh(request);
  request.refinements = 1;
  const Mesh fine = build_mesh(request);
  EXPECT_EQ(fine.n_tets(), 8 * coarse.n_tets());
  EXPECT_EQ(fine.n_faces(), 4 * coarse.n_faces());
  EXPECT_NEAR(total_volume(fine), 1.0, 1e-12);

  MeshRequest geometry = request_for(folder.write("box.geo", kUnitBox), 0.34);
  geometry.refinements = 2;
  const Mesh twice = build_mesh(geometry);
  EXPECT_EQ(twice.n_tets() % 64, 0u);
  EXPECT_EQ(twice.n_faces() % 16, 0u);
  EXPECT_NEAR(total_volume(twice), 1.0, 1e-12);
  EXPECT_NEAR(area(twice, "top"), 1.0, 1e-12);
}

TEST(Mesher, LevelsAreNestedAndStayOnTheCurvedGeometry) {
  ScratchFolder folder;
  MeshRequest request = request_for(folder.write("shell.geo", kQuarterShell), 0.3, 2);
  request.threads = 0;
  const std::vector<Mesh> levels = build_mesh_levels(request, 3);
  ASSERT_EQ(levels.size(), 3u);
  const double exact = M_PI / 4 * 0.75 * 0.5;
  double previous_gap = 1.0;
  for (std::size_t k = 0; k < levels.size(); ++k) {
    const Mesh& mesh = levels[k];
    EXPECT_EQ(mesh.order, 2);
    if (k > 0) {
      EXPECT_EQ(mesh.n_tets(), 8 * levels[k - 1].n_tets());
      EXPECT_EQ(mesh.n_faces(), 4 * levels[k - 1].n_faces());
    }
    // Vertices made by splitting were edge nodes on the geometry, and the new edge
    // nodes are placed on it again.
    EXPECT_GT(check_edge_nodes_on_cylinders(mesh), 0u) << "level " << k;
    const double gap = exact - total_volume(mesh);  // straight-sided volume, from below
    EXPECT_GT(gap, 0.0);
    EXPECT_LT(gap, previous_gap / 3.0) << "level " << k;
    previous_gap = gap;
  }
  EXPECT_THROW(build_mesh_levels(request, 0), MeshError);
}

TEST(Renumbering, ReverseCuthillMcKeeKeepsTheMeshAndNarrowsTheBand) {
  ScratchFolder folder;
  const fs::path file = folder.write("slab.geo", R"(
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 4, 1, 0.5};
Physical Volume("slab") = {1};
Physical Surface("end") = {1};
)");
  for (int order : {1, 2}) {
    MeshRequest request = request_for(file, 0.15, order);
    request.renumber = false;
    Mesh mesh = build_mesh(request);
    const double volume = total_volume(mesh);
    const double end_area = area(mesh, "end");
    const std::size_t before = node_bandwidth(mesh);
    // Shuffle first so the test does not depend on Gmsh's own numbering.
    std::vector<std::int32_t> shuffled(mesh.n_nodes());
    std::iota(shuffled.begin(), shuffled.end(), 0);
    std::shuffle(shuffled.begin(), shuffled.end(), std::mt19937(7));
    apply_node_numbering(mesh, shuffled);
    const std::size_t shuffled_band = node_bandwidth(mesh);
    const std::vector<std::int32_t> order_found = reverse_cuthill_mckee_order(mesh);
    std::vector<std::int32_t> sorted = order_found;
    std::sort(sorted.begin(), sorted.end());
    for (std::size_t i = 0; i < sorted.size(); ++i) ASSERT_EQ(sorted[i], static_cast<std::int32_t>(i));
    apply_node_numbering(mesh, order_found);
    const std::size_t after = node_bandwidth(mesh);
    EXPECT_NEAR(total_volume(mesh), volume, 1e-12 * volume);
    EXPECT_NEAR(area(mesh, "end"), end_area, 1e-12);
    EXPECT_LT(after, before) << "order " << order;
    EXPECT_LT(5 * after, shuffled_band) << "order " << order;
    request.renumber = true;
    EXPECT_LT(node_bandwidth(build_mesh(request)), before);  // build_mesh renumbers too
  }
}

TEST(Mesher, ReadyMeshIsReadWithoutRemeshingAndOrientationIsFixed) {
  // One tetrahedron given left-handed, in Gmsh's MSH 2.2 text format.
  ScratchFolder folder;
  const fs::path file = folder.write("one.msh", R"($MeshFormat
2.2 0 8
$EndMeshFormat
$Nodes
4
1 0 0 0
2 1 0 0
3 0 1 0
4 0 0 1
$EndNodes
$Elements
1
1 4 2 1 1 1 3 2 4
$EndElements
)");
  const Mesh mesh = build_mesh(request_for(file, 0.01));
  ASSERT_EQ(mesh.n_tets(), 1u);
  EXPECT_NEAR(total_volume(mesh), 1.0 / 6.0, 1e-15);
  EXPECT_EQ(names(mesh.regions), (std::vector<std::string>{"volume_1"}));
  EXPECT_EQ(mesh.unnamed_exterior_faces, 4u);

  const fs::path flat = folder.write("flat.msh", R"($MeshFormat
2.2 0 8
$EndMeshFormat
$Nodes
4
1 0 0 0
2 1 0 0
3 0 1 0
4 1 1 0
$EndNodes
$Elements
1
1 4 2 1 1 1 2 3 4
$EndElements
)");
  const std::string message = error_of(request_for(flat, 0.01));
  EXPECT_NE(message.find("1 of 1 tetrahedra have a zero or negative Jacobian"), std::string::npos) << message;
  // A ready mesh is not remeshed: the advice is to mesh again where it came from.
  EXPECT_NE(message.find("mesh the geometry again"), std::string::npos) << message;
}

TEST(Mesher, ReadyMeshTakesItsOrderOrIsElevated) {
  ScratchFolder folder;
  // Scripts that save a mesh of the unit box; meshing them once writes the .msh files.
  folder.write("save1.geo", std::string(kUnitBox) + "Mesh.MeshSizeMax = 0.3;\nMesh 3;\nSave \"box1.msh\";\n");
  folder.write("save2.geo", std::string(kUnitBox) + "Mesh.MeshSizeMax = 0.3;\nMesh 3;\nSetOrder 2;\nSave \"box2.msh\";\n");
  build_mesh(trusted(request_for(folder.path() / "save1.geo", 0.3)));
  build_mesh(trusted(request_for(folder.path() / "save2.geo", 0.3)));
  ASSERT_TRUE(fs::exists(folder.path() / "box1.msh"));
  ASSERT_TRUE(fs::exists(folder.path() / "box2.msh"));

  const Mesh linear = build_mesh(request_for(folder.path() / "box1.msh", 0.01));
  EXPECT_EQ(linear.order, 1);
  EXPECT_EQ(names(linear.boundaries), (std::vector<std::string>{"bottom", "top"}));
  EXPECT_NEAR(total_volume(linear), 1.0, 1e-12);
  const Mesh elevated = build_mesh(request_for(folder.path() / "box1.msh", 0.01, 2));
  EXPECT_EQ(elevated.order, 2);
  EXPECT_EQ(elevated.n_tets(), linear.n_tets());  // not remeshed
  const Mesh quadratic = build_mesh(request_for(folder.path() / "box2.msh", 0.01, 1));
  EXPECT_EQ(quadratic.order, 2);
  EXPECT_EQ(quadratic.n_tets(), linear.n_tets());
  EXPECT_NEAR(area(quadratic, "top"), 1.0, 1e-12);
  MeshRequest refine = request_for(folder.path() / "box2.msh", 0.01, 1);
  refine.refinements = 1;
  const Mesh refined = build_mesh(refine);
  EXPECT_EQ(refined.order, 2);
  EXPECT_EQ(refined.n_tets(), 8 * linear.n_tets());
  EXPECT_NEAR(total_volume(refined), 1.0, 1e-12);
}

TEST(Mesher, TouchingCadSolidsAreJoined) {
  // Two boxes written to STEP as separate solids sharing the face x = 1.
  ScratchFolder folder;
  folder.write("save.geo", R"(
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1, 1, 1};
Box(2) = {1, 0, 0, 1, 1, 1};
Save "two.step";
)");
  // Meshed as a script, the two boxes do not share their face: an error that says so.
  EXPECT_NE(error_of(trusted(request_for(folder.path() / "save.geo", 0.5))).find("touch without sharing"), std::string::npos);
  const Mesh mesh = build_mesh(request_for(folder.path() / "two.step", 0.34));
  EXPECT_EQ(mesh.regions.size(), 2u);
  EXPECT_EQ(mesh.boundaries.size(), 11u);
  const std::vector<bool> internal = internal_boundaries(mesh);
  EXPECT_EQ(std::count(internal.begin(), internal.end(), true), 1);
  std::size_t shared = 0;
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) shared += internal[mesh.face_boundary[f]] ? 1 : 0;
  EXPECT_EQ(exterior_faces(mesh).size(), mesh.n_faces() - shared);
  EXPECT_NEAR(total_volume(mesh), 2.0, 1e-9);
}

TEST(Cases, FurnaceWallMeshesWithItsNamedParts) {
  MeshRequest request = request_for(fs::path(HEARTH_SOURCE_DIR) / "cases/furnace_wall/wall.geo", 0.04);
  request.local_sizes = {{"anchor", 0.003}};
  const Mesh mesh = build_mesh(request);
  EXPECT_EQ(names(mesh.regions), (std::vector<std::string>{"lining", "backup", "shell", "anchor"}));
  EXPECT_EQ(names(mesh.boundaries), (std::vector<std::string>{"hot_face", "cold_face", "anchor_cut"}));
  EXPECT_EQ(internal_boundaries(mesh), (std::vector<bool>{false, false, true}));
  EXPECT_NEAR(area(mesh, "hot_face"), 0.36, 1e-12);
  EXPECT_NEAR(area(mesh, "cold_face"), 0.36, 1e-12);
  const double rod_area = M_PI * 0.006 * 0.006;
  // An inscribed polygon of about 13 sides: 2 to 4 % smaller than the circle.
  EXPECT_LT(area(mesh, "anchor_cut"), rod_area);
  EXPECT_GT(area(mesh, "anchor_cut"), 0.95 * rod_area);
  EXPECT_NEAR(total_volume(mesh), 0.36 * 0.306, 1e-4 * 0.36 * 0.306);
}

TEST(Cases, DuctBracketStepImportsInEitherUnit) {
  // Closed form of the bracket in make_bracket.geo, mm3: flange leg 6x100x80 plus leg
  // 60x100x6 less their 6x100x6 overlap, plus the gusset's triangle (legs 48) outside
  // the legs (area 1152 - 270) times 6, less two holes of diameter 11 through 6.
  const double exact_m3 = (80400.0 + 882.0 * 6.0 - 2.0 * M_PI * 5.5 * 5.5 * 6.0) * 1e-9;
  const fs::path step = fs::path(HEARTH_SOURCE_DIR) / "cases/duct_bracket/bracket.step";
  double volumes[2], highest_z[2];
  std::size_t boundaries = 0;
  for (int k = 0; k < 2; ++k) {
    MeshRequest request = request_for(step, 0.004, 2);
    request.length_unit = k == 0 ? "mm" : "m";
    testing::internal::CaptureStdout();
    testing::internal::CaptureStderr();
    const Mesh mesh = build_mesh(request);
    EXPECT_EQ(testing::internal::GetCapturedStdout(), "");
    EXPECT_EQ(testing::internal::GetCapturedStderr(), "");
    EXPECT_EQ(names(mesh.regions), (std::vector<std::string>{"volume_1"}));
    for (const NamedEntity& boundary : mesh.boundaries) EXPECT_EQ(boundary.name, "surface_" + std::to_string(boundary.tag));
    EXPECT_EQ(mesh.unnamed_exterior_faces, 0u);
    volumes[k] = total_volume(mesh);
    highest_z[k] = 0.0;
    for (std::size_t i = 0; i < mesh.n_nodes(); ++i) highest_z[k] = std::max(highest_z[k], mesh.node(i)[2]);
    boundaries = mesh.boundaries.size();
  }
  EXPECT_NEAR(volumes[0], exact_m3, 3e-3 * exact_m3);
  EXPECT_NEAR(volumes[1], exact_m3, 3e-3 * exact_m3);
  EXPECT_NEAR(highest_z[0], 0.080, 1e-12);  // top of the flange leg
  EXPECT_NEAR(highest_z[1], 0.080, 1e-12);
  EXPECT_GT(boundaries, 10u);
}

}  // namespace
}  // namespace hearth

// --- straight refinement (mesh/straight_refinement) ---
#include "mesh/straight_refinement.hpp"

namespace hearth {
namespace {

// Splitting around the shortest diagonal keeps the shapes in a bounded number of
// similarity classes (Bey, "Tetrahedral grid refinement", Computing 55, 1995, from
// memory): the minimum quality must not collapse under repeated splitting, and the
// volume and boundary area are preserved exactly.
TEST(StraightRefinement, SplitsIntoEightAndKeepsQualityAndVolume) {
  MeshRequest request;
  const auto dir = std::filesystem::temp_directory_path() / ("hearth_refine_" + std::to_string(::getpid()));
  std::filesystem::create_directories(dir);
  request.geometry_file = dir / "box.geo";
  std::ofstream(request.geometry_file) << "SetFactory(\"OpenCASCADE\");\nBox(1) = {0, 0, 0, 1, 2, 3};\n"
                                          "Physical Volume(\"box\") = {1};\nPhysical Surface(\"all\") = {1, 2, 3, 4, 5, 6};\n";
  request.size = 0.5;
  Mesh mesh = build_mesh(request);
  double base_quality = 1.0;
  for (double q : mesh.tet_quality) base_quality = std::min(base_quality, q);
  for (int level = 1; level <= 2; ++level) {
    const Mesh fine = refine_straight(mesh);
    EXPECT_EQ(fine.n_tets(), 8 * mesh.n_tets());
    EXPECT_EQ(fine.n_faces(), 4 * mesh.n_faces());
    double volume = 0.0, quality = 1.0;
    for (std::size_t e = 0; e < fine.n_tets(); ++e) {
      const std::int32_t* v = fine.tet(e);
      const double ve = tet_signed_volume(fine.node(v[0]), fine.node(v[1]), fine.node(v[2]), fine.node(v[3]));
      ASSERT_GT(ve, 0.0);
      volume += ve;
      quality = std::min(quality, fine.tet_quality[e]);
    }
    EXPECT_NEAR(volume, 6.0, 1e-12);
    EXPECT_GT(quality, 0.4 * base_quality) << "level " << level;
    mesh = fine;
  }
  const Mesh quadratic = elevate_straight(mesh);
  EXPECT_EQ(quadratic.order, 2);
  for (std::size_t e = 0; e < quadratic.n_tets(); ++e) {
    const std::int32_t* v = quadratic.tet(e);
    for (int d = 0; d < 3; ++d) ASSERT_NEAR(quadratic.node(v[8])[d], 0.5 * (quadratic.node(v[1])[d] + quadratic.node(v[3])[d]), 1e-15);
  }
}

}  // namespace
}  // namespace hearth
