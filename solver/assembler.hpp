// Assembler: the reduced conduction system A T_free = b on a CSR pattern built once.
#pragma once

#include <cstdint>
#include <vector>

#include "mesh/mesh.hpp"
#include "solver/csr_matrix.hpp"
#include "solver/dof_map.hpp"
#include "solver/local_terms.hpp"
#include "solver/problem.hpp"
#include "solver/tet_element.hpp"

namespace hearth {

TetGeometry tet_geometry(const Mesh& mesh, std::size_t element);
FaceGeometry face_geometry(const Mesh& mesh, std::size_t face);

// Adds element e's capacity term of the current time step (problem.time_levels) to its
// local R and, when J is not null, J. Nothing for a steady problem or a region without
// heat capacity.
void add_element_capacity(const Mesh& mesh, const ThermalProblem& problem, std::size_t e, const TetGeometry& g,
                          const double* T, double* R, double* J);

// Builds the sparsity pattern of the free-node system and, per element and per face,
// the position in CSR storage of every local (a, b) pair, once. assemble() then writes
// element matrices straight into place: re-assembly in Newton or time loops costs one
// pass over the elements. Threads own contiguous row ranges, so no two threads write
// the same entry (no atomics); an element straddling two ranges is computed by both.
// Fixed temperatures are eliminated symmetrically: their columns move to b (the
// residual form evaluates them at their fixed values).
class Assembler {
 public:
  Assembler(const Mesh& mesh, const DofMap& dofs, int threads = 0);

  // Linear problems: A T_free = b with the fixed temperatures eliminated. A gets the
  // pattern (on first use) and the values; b the load. Units: W/K and W.
  void assemble(const ThermalProblem& problem, CsrMatrix& A, std::vector<double>& b) const;

  // Residual R (free rows, W) and Jacobian J = dR/dT_free (W/K) at the nodal
  // temperatures `temperature` (all nodes, K; fixed nodes hold their values). J may be
  // null: residual only (line searches).
  void assemble_terms(const ThermalProblem& problem, const std::vector<double>& temperature, JacobianKind kind,
                      CsrMatrix* J, std::vector<double>& R) const;

  const CsrMatrix& pattern() const { return pattern_; }
  int threads() const { return threads_; }

 private:
  void build_pattern();
  void build_positions();
  void partition_rows();
  std::vector<std::int32_t> contact_nodes(std::size_t face) const;  // behind, then in front

  const Mesh& mesh_;
  const DofMap& dofs_;
  int threads_ = 1;
  CsrMatrix pattern_;                          // row_ptr and col only
  std::vector<std::int32_t> tet_positions_;    // n_tets * npe * npe, -1: not in the system
  std::vector<std::int32_t> face_positions_;   // n_faces * npf * npf
  std::vector<std::int32_t> contact_faces_;    // cut faces (Mesh::face_twin_nodes)
  std::vector<std::int32_t> contact_positions_;  // per cut face, (2 npf)^2
  std::vector<std::int32_t> row_begin_;        // threads + 1
  std::vector<std::vector<std::int32_t>> thread_tets_, thread_faces_, thread_contacts_;
};

}  // namespace hearth
