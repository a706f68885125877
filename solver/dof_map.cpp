// Fixed-temperature nodes from the faces of fixed boundaries; free nodes numbered in
// node order (which the mesh stage has made bandwidth-reducing).
#include "solver/dof_map.hpp"

#include "solver/csr_matrix.hpp"
#include "solver/loop_threads.hpp"

namespace hearth {

DofMap make_dof_map(const Mesh& mesh, const ThermalProblem& problem) {
  DofMap map;
  const std::size_t n = mesh.n_nodes();
  std::vector<char> fixed(n, 0);
  map.fixed_value.assign(n, 0.0);
  const int npf = mesh.nodes_per_face();
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const auto& bc = problem.boundaries[mesh.face_boundary[f]];
    if (!bc.is_fixed()) continue;
    for (int a = 0; a < npf; ++a) {
      const std::int32_t node = mesh.face(f)[a];
      fixed[node] = 1;
      map.fixed_value[node] = bc.temperature_field ? bc.temperature_field(mesh.node(node)) : *bc.temperature;
    }
  }
  map.free_index.assign(n, -1);
  for (std::size_t i = 0; i < n; ++i)
    if (!fixed[i]) {
      map.free_index[i] = static_cast<std::int32_t>(map.free_nodes.size());
      map.free_nodes.push_back(static_cast<std::int32_t>(i));
    }
  return map;
}

void CsrMatrix::multiply(const std::vector<double>& x, std::vector<double>& y) const {
  y.resize(n);
#pragma omp parallel for schedule(static) num_threads(loop_threads(n))
  for (std::int32_t i = 0; i < n; ++i) {
    double sum = 0.0;
    for (std::int64_t p = row_ptr[i]; p < row_ptr[i + 1]; ++p) sum += val[p] * x[col[p]];
    y[i] = sum;
  }
}

}  // namespace hearth
