// temperature.vtu and mesh.vtu through VTK's XML writer (binary, LZ4-compressed by default).
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "io/case.hpp"
#include "io/vtk_xml_common.hpp"
#include "mesh/mesh.hpp"

namespace hearth {

// Point and cell fields to write beside the mesh. Temperatures in K (converted to the
// case's unit on writing), fluxes in W/m2, coordinates written in the case's length unit.
struct VtuFields {
  const std::vector<double>* temperature = nullptr;  // per node, K
  const std::vector<double>* nodal_flux = nullptr;   // 3 per node, W/m2
  const std::vector<double>* cell_flux = nullptr;    // 3 per element, W/m2
  bool quality = false;                              // cell field "quality" (mesh.vtu)
  // Field data that lets a later run start from this result on exactly this mesh
  // (analysis.initial_temperature: {result: ...}): the boundary triangles and their names.
  bool restart_data = true;
  double time = -1.0;                                // s; >= 0: field data TimeValue (transient)
  std::string title;                                 // field data "title" when not empty
};

// Writes an unstructured grid of 4-node (VTK_TETRA) or 10-node (VTK_QUADRATIC_TETRA)
// cells with cell field "region" (the region's tag), field data "region_names" and
// "region_tags", "units" (and "title"), the boundary triangles ("boundary_faces",
// "boundary_face_index", "boundary_names", "boundary_tags") and the requested fields.
// Written to a temporary name, then renamed.
void write_vtu(const std::filesystem::path& path, const Mesh& mesh, const Units& units, const VtuFields& fields,
               VtkEncoding encoding = VtkEncoding::lz4);

}  // namespace hearth
