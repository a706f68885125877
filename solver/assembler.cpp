// Pattern, position maps and the threaded assembly loop.
#include "solver/assembler.hpp"

#include "solver/loop_threads.hpp"

#include <algorithm>
#include <omp.h>
#include <stdexcept>

namespace hearth {

TetGeometry tet_geometry(const Mesh& mesh, std::size_t element) {
  TetGeometry g;
  g.order = mesh.order;
  const std::int32_t* nodes = mesh.tet(element);
  for (int a = 0; a < mesh.nodes_per_tet(); ++a) g.x[a] = mesh.node(nodes[a]);
  return g;
}

FaceGeometry face_geometry(const Mesh& mesh, std::size_t face) {
  FaceGeometry g;
  g.order = mesh.order;
  const std::int32_t* nodes = mesh.face(face);
  for (int a = 0; a < mesh.nodes_per_face(); ++a) g.x[a] = mesh.node(nodes[a]);
  return g;
}

Assembler::Assembler(const Mesh& mesh, const DofMap& dofs, int threads) : mesh_(mesh), dofs_(dofs) {
  threads_ = threads > 0 ? threads : loop_threads(static_cast<std::int64_t>(mesh.n_tets()));
  build_pattern();
  build_positions();
  partition_rows();
}

void Assembler::build_pattern() {
  const std::size_t n_nodes = mesh_.n_nodes();
  const int npe = mesh_.nodes_per_tet();
  // Node -> elements adjacency (counting sort).
  std::vector<std::int64_t> start(n_nodes + 1, 0);
  for (std::size_t e = 0; e < mesh_.n_tets(); ++e)
    for (int a = 0; a < npe; ++a) ++start[mesh_.tet(e)[a] + 1];
  for (std::size_t i = 0; i < n_nodes; ++i) start[i + 1] += start[i];
  std::vector<std::int32_t> node_tets(start[n_nodes]);
  {
    std::vector<std::int64_t> fill(start.begin(), start.end() - 1);
    for (std::size_t e = 0; e < mesh_.n_tets(); ++e)
      for (int a = 0; a < npe; ++a) node_tets[fill[mesh_.tet(e)[a]]++] = static_cast<std::int32_t>(e);
  }
  // Cut faces couple the nodes of both sides (thermal contact): node -> cut faces.
  const int npf = mesh_.nodes_per_face();
  std::vector<std::int64_t> cstart(n_nodes + 1, 0);
  for (std::size_t f = 0; f < mesh_.n_faces(); ++f)
    if (mesh_.face_is_split(f))
      for (int a = 0; a < npf; ++a) ++cstart[mesh_.face(f)[a] + 1], ++cstart[mesh_.face_twin(f)[a] + 1];
  for (std::size_t i = 0; i < n_nodes; ++i) cstart[i + 1] += cstart[i];
  std::vector<std::int32_t> node_contacts(cstart[n_nodes]);
  {
    std::vector<std::int64_t> fill(cstart.begin(), cstart.end() - 1);
    for (std::size_t f = 0; f < mesh_.n_faces(); ++f)
      if (mesh_.face_is_split(f))
        for (int a = 0; a < npf; ++a) {
          node_contacts[fill[mesh_.face(f)[a]]++] = static_cast<std::int32_t>(f);
          node_contacts[fill[mesh_.face_twin(f)[a]]++] = static_cast<std::int32_t>(f);
        }
  }
  const std::int32_t n = dofs_.n_free();
  pattern_.n = n;
  pattern_.row_ptr.assign(n + 1, 0);
  // Two passes over the rows, each in parallel: count each row's columns, then list
  // and sort them in place and, while the row's column positions are at hand, write
  // the element position map for it (no per-row vectors, no binary searches).
  auto for_each_column = [&](std::int32_t node, auto&& visit) {
    for (std::int64_t p = start[node]; p < start[node + 1]; ++p) {
      const std::int32_t* nodes = mesh_.tet(node_tets[p]);
      for (int b = 0; b < npe; ++b) visit(dofs_.free_index[nodes[b]]);
    }
    for (std::int64_t p = cstart[node]; p < cstart[node + 1]; ++p)
      for (int b = 0; b < npf; ++b) {
        visit(dofs_.free_index[mesh_.face(node_contacts[p])[b]]);
        visit(dofs_.free_index[mesh_.face_twin(node_contacts[p])[b]]);
      }
  };
#pragma omp parallel num_threads(threads_)
  {
    std::vector<std::int32_t> marker(n, -1);
#pragma omp for schedule(dynamic, 4096)
    for (std::int32_t r = 0; r < n; ++r) {
      std::int64_t count = 0;
      for_each_column(dofs_.free_nodes[r], [&](std::int32_t c) {
        if (c >= 0 && marker[c] != r) marker[c] = r, ++count;
      });
      pattern_.row_ptr[r + 1] = count;
    }
  }
  for (std::int32_t r = 0; r < n; ++r) pattern_.row_ptr[r + 1] += pattern_.row_ptr[r];
  if (pattern_.row_ptr[n] > std::int64_t(2147483647))
    throw std::runtime_error("matrix has more than 2^31 nonzeros; the mesh is too large for one process");
  pattern_.col.resize(pattern_.row_ptr[n]);
  tet_positions_.resize(mesh_.n_tets() * npe * npe);
  const std::int64_t n_nodes64 = static_cast<std::int64_t>(n_nodes);
#pragma omp parallel num_threads(threads_)
  {
    std::vector<std::int32_t> marker(n, -1), position(n, -1);
#pragma omp for schedule(dynamic, 4096)
    for (std::int64_t node = 0; node < n_nodes64; ++node) {
      const std::int32_t r = dofs_.free_index[node];
      if (r >= 0) {
        std::int64_t fill = pattern_.row_ptr[r];
        for_each_column(static_cast<std::int32_t>(node), [&](std::int32_t c) {
          if (c >= 0 && marker[c] != r) marker[c] = r, pattern_.col[fill++] = c;
        });
        std::sort(pattern_.col.begin() + pattern_.row_ptr[r], pattern_.col.begin() + pattern_.row_ptr[r + 1]);
        for (std::int64_t k = pattern_.row_ptr[r]; k < pattern_.row_ptr[r + 1]; ++k)
          position[pattern_.col[k]] = static_cast<std::int32_t>(k);
      }
      // This node's row of each of its elements' local maps; a fixed node's row is -1.
      for (std::int64_t p = start[node]; p < start[node + 1]; ++p) {
        const std::int32_t e = node_tets[p];
        const std::int32_t* nodes = mesh_.tet(e);
        int a = 0;
        while (nodes[a] != node) ++a;
        std::int32_t* out = &tet_positions_[(std::size_t(e) * npe + a) * npe];
        for (int b = 0; b < npe; ++b) {
          const std::int32_t c = dofs_.free_index[nodes[b]];
          out[b] = (r >= 0 && c >= 0) ? position[c] : -1;
        }
      }
    }
  }
}

namespace {
std::int32_t find_position(const CsrMatrix& m, std::int32_t row, std::int32_t col) {
  const auto first = m.col.begin() + m.row_ptr[row], last = m.col.begin() + m.row_ptr[row + 1];
  return static_cast<std::int32_t>(std::lower_bound(first, last, col) - m.col.begin());
}

// Local (a, b) -> CSR position, or -1 where row or column is fixed.
void fill_positions(const CsrMatrix& m, const DofMap& dofs, const std::int32_t* nodes, int n, std::int32_t* out) {
  for (int a = 0; a < n; ++a) {
    const std::int32_t r = dofs.free_index[nodes[a]];
    for (int b = 0; b < n; ++b) {
      const std::int32_t c = dofs.free_index[nodes[b]];
      out[a * n + b] = (r >= 0 && c >= 0) ? find_position(m, r, c) : -1;
    }
  }
}
}  // namespace

void Assembler::build_positions() {
  const int npf = mesh_.nodes_per_face();
  // The elements' maps were written with the pattern (build_pattern).
  face_positions_.resize(mesh_.n_faces() * npf * npf);
  for (std::size_t f = 0; f < mesh_.n_faces(); ++f)
    fill_positions(pattern_, dofs_, mesh_.face(f), npf, &face_positions_[f * npf * npf]);
  for (std::size_t f = 0; f < mesh_.n_faces(); ++f) {
    if (!mesh_.face_is_split(f)) continue;
    const std::vector<std::int32_t> nodes = contact_nodes(f);
    contact_faces_.push_back(static_cast<std::int32_t>(f));
    contact_positions_.resize(contact_positions_.size() + 4 * npf * npf);
    fill_positions(pattern_, dofs_, nodes.data(), 2 * npf, &contact_positions_[contact_positions_.size() - 4 * npf * npf]);
  }
}

std::vector<std::int32_t> Assembler::contact_nodes(std::size_t f) const {
  const int npf = mesh_.nodes_per_face();
  std::vector<std::int32_t> nodes(mesh_.face(f), mesh_.face(f) + npf);
  nodes.insert(nodes.end(), mesh_.face_twin(f), mesh_.face_twin(f) + npf);
  return nodes;
}

void Assembler::partition_rows() {
  // Split rows into contiguous ranges of about equal nonzeros.
  const std::int32_t n = pattern_.n;
  row_begin_.assign(threads_ + 1, n);
  row_begin_[0] = 0;
  std::int32_t r = 0;
  for (int t = 1; t < threads_; ++t) {
    const std::int64_t target = pattern_.nnz() * t / threads_;
    while (r < n && pattern_.row_ptr[r] < target) ++r;
    row_begin_[t] = r;
  }
  thread_tets_.assign(threads_, {});
  thread_faces_.assign(threads_, {});
  auto owners = [&](const std::int32_t* nodes, int count, std::vector<std::vector<std::int32_t>>& lists,
                    std::int32_t item) {
    std::uint64_t mask = 0;
    for (int a = 0; a < count; ++a) {
      const std::int32_t row = dofs_.free_index[nodes[a]];
      if (row < 0) continue;
      const int t = static_cast<int>(std::upper_bound(row_begin_.begin(), row_begin_.end(), row) - row_begin_.begin()) - 1;
      mask |= std::uint64_t(1) << t;
    }
    for (int t = 0; t < threads_; ++t)
      if (mask & (std::uint64_t(1) << t)) lists[t].push_back(item);
  };
  if (threads_ > 64) throw std::runtime_error("at most 64 assembly threads");
  for (std::size_t e = 0; e < mesh_.n_tets(); ++e)
    owners(mesh_.tet(e), mesh_.nodes_per_tet(), thread_tets_, static_cast<std::int32_t>(e));
  for (std::size_t f = 0; f < mesh_.n_faces(); ++f)
    owners(mesh_.face(f), mesh_.nodes_per_face(), thread_faces_, static_cast<std::int32_t>(f));
  thread_contacts_.assign(threads_, {});
  for (std::size_t k = 0; k < contact_faces_.size(); ++k)
    owners(contact_nodes(contact_faces_[k]).data(), 2 * mesh_.nodes_per_face(), thread_contacts_,
           static_cast<std::int32_t>(k));
}

void add_element_capacity(const Mesh& mesh, const ThermalProblem& problem, std::size_t e, const TetGeometry& g,
                          const double* T, double* R, double* J) {
  if (!problem.time_levels) return;
  const RegionProperties& region = problem.regions[mesh.tet_region[e]];
  if (!region.capacity) return;
  const TimeLevels& levels = *problem.time_levels;
  const std::int32_t* nodes = mesh.tet(e);
  double T1[max_tet_nodes], T2[max_tet_nodes];
  const bool second = levels.before_previous && levels.c[2] != 0.0;
  for (int a = 0; a < mesh.nodes_per_tet(); ++a) {
    T1[a] = (*levels.previous)[nodes[a]];
    if (second) T2[a] = (*levels.before_previous)[nodes[a]];
  }
  add_capacity_terms(g, {&*region.capacity, levels.c, T1, second ? T2 : nullptr}, T, R, J);
}

void Assembler::assemble(const ThermalProblem& problem, CsrMatrix& A, std::vector<double>& b) const {
  // The linear system for T_free with the fixed values in place: A = dR/dT and
  // b = -R(T with free values 0), so that A T_free = b.
  assemble_terms(problem, dofs_.fixed_value, JacobianKind::exact, &A, b);
  for (double& v : b) v = -v;
}

void Assembler::assemble_terms(const ThermalProblem& problem, const std::vector<double>& temperature,
                               JacobianKind kind, CsrMatrix* J, std::vector<double>& R) const {
  if (J && J->row_ptr.size() != pattern_.row_ptr.size()) {
    J->n = pattern_.n;
    J->row_ptr = pattern_.row_ptr;
    J->col = pattern_.col;
  }
  if (J) J->val.resize(pattern_.nnz());
  double* values = J ? J->val.data() : nullptr;
  R.resize(pattern_.n);
  const int npe = mesh_.nodes_per_tet(), npf = mesh_.nodes_per_face();
  // Regions whose 4-node elements take the inlined constant-k path (p1_isotropic_terms):
  // their k, or a negative value for the general path.
  std::vector<double> plain_k(problem.regions.size(), -1.0);
  if (npe == 4 && !problem.source_field)
    for (std::size_t r = 0; r < plain_k.size(); ++r) {
      const Conductivity& k = problem.regions[r].conductivity;
      if (k.is_isotropic() && !k.depends_on_temperature()) plain_k[r] = k.principal[0].value(0.0);
    }
  const bool capacity = problem.time_levels.has_value();
  const double* xyz = mesh_.coords.data();

#pragma omp parallel num_threads(threads_)
  {
    const int t = omp_get_thread_num();
    const std::int32_t own_begin = row_begin_[t], own_end = row_begin_[t + 1];
    // Each thread clears the rows it owns (a serial clear of the values was a tenth of
    // the large-mesh assembly).
    if (values) std::fill(values + pattern_.row_ptr[own_begin], values + pattern_.row_ptr[own_end], 0.0);
    std::fill(R.begin() + own_begin, R.begin() + own_end, 0.0);
    // Local arrays sized for the largest local system: a 10-node element or a cut face
    // with both of its sides (2 x 6 nodes).
    constexpr int max_local = 2 * max_face_nodes > max_tet_nodes ? 2 * max_face_nodes : max_tet_nodes;
    double K[max_local * max_local], F[max_local], T[max_local];
    // Scatter one local Jacobian and residual: owned free rows, free columns only (the
    // fixed temperatures are already in T, so their columns need no correction).
    auto scatter = [&](const std::int32_t* nodes, int n, const std::int32_t* positions) {
      for (int a = 0; a < n; ++a) {
        const std::int32_t r = dofs_.free_index[nodes[a]];
        if (r < own_begin || r >= own_end) continue;  // also skips fixed rows (r = -1)
        if (values)
          for (int c = 0; c < n; ++c) {
            const std::int32_t p = positions[a * n + c];
            if (p >= 0) values[p] += K[a * n + c];
          }
        R[r] += F[a];
      }
    };
    for (const std::int32_t e : thread_tets_[t]) {
      const std::int32_t* nodes = mesh_.tet(e);
      for (int a = 0; a < npe; ++a) T[a] = temperature[nodes[a]];
      const int region = mesh_.tet_region[e];
      if (plain_k[region] >= 0.0) {
        p1_isotropic_terms(xyz + 3 * nodes[0], xyz + 3 * nodes[1], xyz + 3 * nodes[2], xyz + 3 * nodes[3],
                           plain_k[region], problem.regions[region].heat_source, T, F, K);
        if (capacity) add_element_capacity(mesh_, problem, e, tet_geometry(mesh_, e), T, F, values ? K : nullptr);
        scatter(nodes, npe, &tet_positions_[std::size_t(e) * npe * npe]);
        continue;
      }
      const TetGeometry g = tet_geometry(mesh_, e);
      tet_local_terms(g, problem.regions[mesh_.tet_region[e]], problem.source_field, problem.source_field_degree, T,
                      kind, F, values ? K : nullptr);
      add_element_capacity(mesh_, problem, e, g, T, F, values ? K : nullptr);
      scatter(nodes, npe, &tet_positions_[std::size_t(e) * npe * npe]);
    }
    for (const std::int32_t f : thread_faces_[t]) {
      const BoundaryCondition& bc = problem.boundaries[mesh_.face_boundary[f]];
      if (bc.is_fixed() || bc.is_insulated()) continue;
      const std::int32_t* nodes = mesh_.face(f);
      for (int a = 0; a < npf; ++a) T[a] = temperature[nodes[a]];
      face_local_terms(face_geometry(mesh_, f), bc, T, kind, F, values ? K : nullptr);
      scatter(nodes, npf, &face_positions_[std::size_t(f) * npf * npf]);
    }
    for (const std::int32_t k : thread_contacts_[t]) {  // thermal contact across cut faces
      const std::int32_t f = contact_faces_[k];
      const BoundaryCondition& bc = problem.boundaries[mesh_.face_boundary[f]];
      if (!bc.contact_conductance) continue;
      const std::vector<std::int32_t> nodes = contact_nodes(f);
      for (int a = 0; a < 2 * npf; ++a) T[a] = temperature[nodes[a]];
      contact_local_terms(face_geometry(mesh_, f), *bc.contact_conductance, T, F, values ? K : nullptr);
      scatter(nodes.data(), 2 * npf, &contact_positions_[std::size_t(k) * 4 * npf * npf]);
    }
  }
}

}  // namespace hearth
