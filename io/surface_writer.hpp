// surface.vtp: the body's surface with the names of its boundaries, for light viewing
// and for the report's pictures.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "io/case.hpp"
#include "io/vtk_xml_common.hpp"
#include "mesh/body_surface.hpp"
#include "mesh/mesh.hpp"

namespace hearth {

struct SurfaceFields {
  const std::vector<double>* temperature = nullptr;  // per mesh node, K
  const std::vector<double>* nodal_flux = nullptr;   // 3 per mesh node, W/m2
  std::string title;                                 // field data "title" when not empty
};

// Name and tag given to exterior faces on no named boundary.
inline const char* const unnamed_surface_name = "(unnamed)";
constexpr int unnamed_surface_tag = 0;

// Writes a VTK XML poly data file of 3-node triangles. Points: the surface's mesh nodes
// (coordinates in the case's length unit) with point fields "node" (the node's number
// in temperature.vtu, from 0), "temperature" and "heat_flux" when given. Cells: cell
// fields "boundary" (the boundary's tag; 0 for unnamed exterior faces) and "exterior"
// (1 outside the body, normal pointing out; 0 a named internal surface) and "region" (the
// tag of the region of the element an exterior face bounds; 0 on internal surfaces). For 10-node
// meshes each 6-node boundary triangle is written as the four 3-node triangles through
// its edge nodes, with cell field "element_face" numbering the 6-node triangle they
// came from. Field data "boundary_names", "boundary_tags" (in step), "region_names",
// "region_tags", "units" and "title". Written to a temporary name, then renamed.
void write_surface_vtp(const std::filesystem::path& path, const Mesh& mesh, const BodySurface& surface,
                       const Units& units, const SurfaceFields& fields, VtkEncoding encoding = VtkEncoding::lz4);

}  // namespace hearth
