// Heat flux recovery, consistent heat rates, energy balance and field statistics.
#include "solver/post_processing.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <optional>
#include <omp.h>

#include "mesh/boundary_face_lookup.hpp"
#include "solver/assembler.hpp"
#include "solver/local_terms.hpp"
#include "solver/loop_threads.hpp"
#include "solver/quadrature.hpp"

namespace hearth {

namespace {

Point sub(const Point& a, const Point& b) { return {a[0] - b[0], a[1] - b[1], a[2] - b[2]}; }
double dot(const Point& a, const Point& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }
Point cross(const Point& a, const Point& b) {
  return {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
}

// Straight-triangle normal times twice the area (right-hand rule of the vertex order).
Point face_area_normal(const Mesh& mesh, std::size_t f) {
  const std::int32_t* n = mesh.face(f);
  return cross(sub(mesh.node(n[1]), mesh.node(n[0])), sub(mesh.node(n[2]), mesh.node(n[0])));
}

int volume_degree(const TetGeometry& g) { return g.affine() ? g.order : 4; }

}  // namespace

std::vector<double> nodal_residual(const Mesh& mesh, const ThermalProblem& problem,
                                   const std::vector<double>& temperature, const std::vector<char>* element_mask,
                                   const std::vector<char>* face_mask) {
  const int npe = mesh.nodes_per_tet(), npf = mesh.nodes_per_face();
  const std::int64_t n_tets = static_cast<std::int64_t>(mesh.n_tets());
  const int threads = loop_threads(n_tets);
  std::vector<std::vector<double>> partial(threads, std::vector<double>(mesh.n_nodes(), 0.0));
#pragma omp parallel num_threads(threads)
  {
    std::vector<double>& r = partial[omp_get_thread_num()];
    double R[max_tet_nodes], T[max_tet_nodes];
#pragma omp for schedule(static)
    for (std::int64_t e = 0; e < n_tets; ++e) {
      if (element_mask && !(*element_mask)[e]) continue;
      const std::int32_t* nodes = mesh.tet(e);
      for (int a = 0; a < npe; ++a) T[a] = temperature[nodes[a]];
      const TetGeometry g = tet_geometry(mesh, e);
      tet_local_terms(g, problem.regions[mesh.tet_region[e]], problem.source_field, problem.source_field_degree, T,
                      JacobianKind::exact, R, nullptr);
      add_element_capacity(mesh, problem, e, g, T, R, nullptr);
      for (int a = 0; a < npe; ++a) r[nodes[a]] += R[a];
    }
  }
  std::vector<double> residual(mesh.n_nodes(), 0.0);
  for (const auto& r : partial)
    for (std::size_t i = 0; i < residual.size(); ++i) residual[i] += r[i];
  // Boundary terms: + int [h (T - T_inf) + eps sigma (T^4 - T_sur^4) - q_in] N_a.
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    if (face_mask && !(*face_mask)[f]) continue;
    const BoundaryCondition& bc = problem.boundaries[mesh.face_boundary[f]];
    if (bc.is_fixed() || bc.is_insulated()) continue;
    const std::int32_t* nodes = mesh.face(f);
    double R[max_face_nodes], T[max_face_nodes];
    for (int a = 0; a < npf; ++a) T[a] = temperature[nodes[a]];
    face_local_terms(face_geometry(mesh, f), bc, T, JacobianKind::exact, R, nullptr);
    for (int a = 0; a < npf; ++a) residual[nodes[a]] += R[a];
  }
  // Thermal contact across cut faces couples both sides (whole-body residuals only).
  if (!element_mask)
    for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
      const BoundaryCondition& bc = problem.boundaries[mesh.face_boundary[f]];
      if (!mesh.face_is_split(f) || !bc.contact_conductance) continue;
      double R[2 * max_face_nodes], T[2 * max_face_nodes];
      for (int a = 0; a < npf; ++a) {
        T[a] = temperature[mesh.face(f)[a]];
        T[npf + a] = temperature[mesh.face_twin(f)[a]];
      }
      contact_local_terms(face_geometry(mesh, f), *bc.contact_conductance, T, R, nullptr);
      for (int a = 0; a < npf; ++a) {
        residual[mesh.face(f)[a]] += R[a];
        residual[mesh.face_twin(f)[a]] += R[npf + a];
      }
    }
  return residual;
}

namespace {

// Heat through the fixed-temperature boundaries from the nodal reactions; each node's
// reaction is shared among the fixed boundaries touching it by their face areas there.
// int_f (K grad T . n_out) N_a dA for one boundary face from its element's own flux: the
// heat entering at each face node as the element sees it (exact when the field is).
void face_flux_loads(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T, std::size_t f,
                     std::int32_t element, double* loads) {
  const int npf = mesh.nodes_per_face(), npe = mesh.nodes_per_tet();
  const FaceGeometry fg = face_geometry(mesh, f);
  const TetGeometry tg = tet_geometry(mesh, element);
  const std::int32_t* tet = mesh.tet(element);
  // The face's vertices in the element's reference coordinates: a point (s, t) of the face
  // is the same point of the element, curved or not.
  Point corner[3];
  for (int k = 0; k < 3; ++k)
    for (int a = 0; a < 4; ++a)
      if (tet[a] == mesh.face(f)[k]) corner[k] = tet_node_reference(a);
  Point centroid{0, 0, 0};
  for (int a = 0; a < 4; ++a)
    for (int d = 0; d < 3; ++d) centroid[d] += 0.25 * tg.x[a][d];
  double t_local[max_tet_nodes], N[max_face_nodes];
  for (int a = 0; a < npe; ++a) t_local[a] = T[tet[a]];
  const Conductivity& k = problem.regions[mesh.tet_region[element]].conductivity;
  for (int a = 0; a < npf; ++a) loads[a] = 0.0;
  for (const auto& q : triangle_rule(mesh.order == 1 ? 2 : 4)) {
    const double s = q.xi[0], t = q.xi[1];
    Point xi, n;
    for (int d = 0; d < 3; ++d) xi[d] = corner[0][d] + s * (corner[1][d] - corner[0][d]) + t * (corner[2][d] - corner[0][d]);
    const double w = q.weight * face_jacobian(fg, s, t, &n);
    const Point x = tet_map(tg, xi);
    if (dot(n, sub(x, centroid)) < 0) n = {-n[0], -n[1], -n[2]};  // outward
    const Point kg = conducted_gradient(tg, k, t_local, xi);
    triangle_shape_values(mesh.order, s, t, N);
    for (int a = 0; a < npf; ++a) loads[a] += w * dot(kg, n) * N[a];
  }
}

// Heat through the fixed-temperature boundaries from the nodal reactions r_i. Where a node
// touches one fixed boundary it takes all of r_i. Where it touches several, each boundary
// takes its own flux load at that node (from the element fluxes) plus a share of what
// that estimate leaves of r_i by face area, so the parts still add up to r_i.
void add_reaction_heat_rates(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& residual,
                             const std::vector<double>& T,
                             const std::vector<std::array<std::int32_t, 2>>& neighbours,
                             std::vector<BoundaryResult>& boundaries) {
  const int npf = mesh.nodes_per_face();
  std::vector<double> node_area(mesh.n_nodes(), 0.0), node_load(mesh.n_nodes(), 0.0);
  std::vector<double> face_areas(mesh.n_faces(), 0.0), loads(mesh.n_faces() * npf, 0.0);
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    if (!problem.boundaries[mesh.face_boundary[f]].is_fixed()) continue;
    face_areas[f] = face_area(face_geometry(mesh, f));
    const std::int32_t element = neighbours[f][0] >= 0 ? neighbours[f][0] : neighbours[f][1];
    if (element >= 0) face_flux_loads(mesh, problem, T, f, element, &loads[f * npf]);
    for (int a = 0; a < npf; ++a) {
      node_area[mesh.face(f)[a]] += face_areas[f];
      node_load[mesh.face(f)[a]] += loads[f * npf + a];
    }
  }
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    if (!problem.boundaries[mesh.face_boundary[f]].is_fixed()) continue;
    double q = 0.0;
    for (int a = 0; a < npf; ++a) {
      const std::int32_t i = mesh.face(f)[a];
      q += loads[f * npf + a] + (residual[i] - node_load[i]) * face_areas[f] / node_area[i];
    }
    boundaries[mesh.face_boundary[f]].heat_rate += q;
  }
}

// Heat across an internal named surface in the direction of its normal: minus the
// residual, at the surface's nodes, of the elements (and their boundary faces) behind it.
double internal_heat_rate(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T,
                          std::int32_t boundary, const std::vector<std::array<std::int32_t, 2>>& neighbours) {
  const int npf = mesh.nodes_per_face(), npe = mesh.nodes_per_tet();
  std::vector<char> on_surface(mesh.n_nodes(), 0);
  std::vector<Point> node_normal(mesh.n_nodes(), Point{0, 0, 0});
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    if (mesh.face_boundary[f] != boundary) continue;
    const Point n = face_area_normal(mesh, f);
    for (int a = 0; a < npf; ++a) {
      const std::int32_t i = mesh.face(f)[a];
      on_surface[i] = 1;
      for (int d = 0; d < 3; ++d) node_normal[i][d] += n[d];
    }
  }
  // Elements behind the surface: those sharing a face with it on its back, and those
  // touching it at an edge or vertex whose centroid lies behind the nodal normals.
  std::vector<char> behind(mesh.n_tets(), 0), decided(mesh.n_tets(), 0);
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    if (mesh.face_boundary[f] != boundary) continue;
    for (int side = 0; side < 2; ++side)
      if (neighbours[f][side] >= 0) {
        behind[neighbours[f][side]] = side == 0;
        decided[neighbours[f][side]] = 1;
      }
  }
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    if (decided[e]) continue;
    const std::int32_t* nodes = mesh.tet(e);
    Point centroid{0, 0, 0};
    for (int a = 0; a < 4; ++a)
      for (int d = 0; d < 3; ++d) centroid[d] += 0.25 * mesh.node(nodes[a])[d];
    double side = 0.0;
    bool touches = false;
    for (int a = 0; a < npe; ++a)
      if (on_surface[nodes[a]]) {
        touches = true;
        side += dot(sub(centroid, mesh.node(nodes[a])), node_normal[nodes[a]]);
      }
    behind[e] = touches && side < 0;
  }
  std::vector<char> face_mask(mesh.n_faces(), 0);
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const auto& nb = neighbours[f];
    const bool exterior = (nb[0] < 0) != (nb[1] < 0);
    if (exterior) face_mask[f] = behind[nb[0] >= 0 ? nb[0] : nb[1]];
  }
  const std::vector<double> r = nodal_residual(mesh, problem, T, &behind, &face_mask);
  double q = 0.0;
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i)
    if (on_surface[i]) q -= r[i];
  return q;
}

void recover_fluxes(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T, Results& out) {
  const int npe = mesh.nodes_per_tet();
  out.cell_flux.assign(3 * mesh.n_tets(), 0.0);
  out.nodal_flux.assign(3 * mesh.n_nodes(), 0.0);
  std::vector<double> weight(mesh.n_nodes(), 0.0), volume(mesh.n_tets());
  const std::int64_t n_tets = static_cast<std::int64_t>(mesh.n_tets());
  // q = -K(T) grad T at the centroid (cell field), each element on its own: in parallel.
#pragma omp parallel for schedule(static) num_threads(loop_threads(n_tets))
  for (std::int64_t e = 0; e < n_tets; ++e) {
    double t_local[max_tet_nodes];
    const TetGeometry g = tet_geometry(mesh, e);
    for (int a = 0; a < npe; ++a) t_local[a] = T[mesh.tet(e)[a]];
    const Point c = conducted_gradient(g, problem.regions[mesh.tet_region[e]].conductivity, t_local, {0.25, 0.25, 0.25});
    for (int d = 0; d < 3; ++d) out.cell_flux[3 * e + d] = -c[d];
    volume[e] = tet_volume(g);
  }
  // Nodal field: the volume-weighted average of each element's own flux at the node (the
  // centroid value where that flux is constant: 4-node elements of constant K).
  double t_local[max_tet_nodes];
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const Conductivity& k = problem.regions[mesh.tet_region[e]].conductivity;
    const bool constant = mesh.order == 1 && !k.depends_on_temperature();
    std::optional<TetGeometry> g;
    if (!constant) {
      g = tet_geometry(mesh, e);
      for (int a = 0; a < npe; ++a) t_local[a] = T[mesh.tet(e)[a]];
    }
    const double w = volume[e];
    for (int a = 0; a < npe; ++a) {
      const Point q = constant ? Point{-out.cell_flux[3 * e], -out.cell_flux[3 * e + 1], -out.cell_flux[3 * e + 2]}
                               : conducted_gradient(*g, k, t_local, tet_node_reference(a));
      const std::int32_t i = mesh.tet(e)[a];
      for (int d = 0; d < 3; ++d) out.nodal_flux[3 * i + d] += -q[d] * w;
      weight[i] += w;
    }
  }
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i)
    if (weight[i] > 0)
      for (int d = 0; d < 3; ++d) out.nodal_flux[3 * i + d] /= weight[i];
}

void update_extremes(Stats& s, std::array<double, 3>& hottest, double t, const Point& x, bool& first) {
  if (first || t < s.min) s.min = t;
  if (first || t > s.max) {
    s.max = t;
    hottest = x;
  }
  first = false;
}

}  // namespace

std::vector<double> surface_heat_rates(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T,
                                       const std::vector<std::array<std::int32_t, 2>>& neighbours) {
  std::vector<BoundaryResult> boundaries(mesh.boundaries.size());
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const BoundaryCondition& bc = problem.boundaries[mesh.face_boundary[f]];
    if (mesh.face_is_split(f) || bc.is_fixed() || bc.is_insulated()) continue;
    double t_local[max_face_nodes];
    for (int a = 0; a < mesh.nodes_per_face(); ++a) t_local[a] = T[mesh.face(f)[a]];
    boundaries[mesh.face_boundary[f]].heat_rate += face_heat_in(face_geometry(mesh, f), bc, t_local);
  }
  bool any_fixed = false;
  for (const auto& bc : problem.boundaries) any_fixed |= bc.is_fixed();
  if (any_fixed) {
    // Reactions are needed at fixed nodes only: the residual of the elements and faces
    // that touch one is enough (not with cut contact faces, whose coupling the masked
    // residual leaves out).
    std::vector<char> fixed_node(mesh.n_nodes(), 0);
    for (std::size_t f = 0; f < mesh.n_faces(); ++f)
      if (problem.boundaries[mesh.face_boundary[f]].is_fixed())
        for (int a = 0; a < mesh.nodes_per_face(); ++a) fixed_node[mesh.face(f)[a]] = 1;
    auto touches = [&](const std::int32_t* nodes, int n) {
      for (int a = 0; a < n; ++a)
        if (fixed_node[nodes[a]]) return char(1);
      return char(0);
    };
    std::vector<double> residual;
    if (mesh.face_twin_nodes.empty()) {
      std::vector<char> element_mask(mesh.n_tets()), face_mask(mesh.n_faces());
      for (std::size_t e = 0; e < mesh.n_tets(); ++e) element_mask[e] = touches(mesh.tet(e), mesh.nodes_per_tet());
      for (std::size_t f = 0; f < mesh.n_faces(); ++f) face_mask[f] = touches(mesh.face(f), mesh.nodes_per_face());
      residual = nodal_residual(mesh, problem, T, &element_mask, &face_mask);
    } else {
      residual = nodal_residual(mesh, problem, T);
    }
    add_reaction_heat_rates(mesh, problem, residual, T, neighbours, boundaries);
  }
  std::vector<double> rates;
  for (const auto& b : boundaries) rates.push_back(b.heat_rate);
  return rates;
}

double stored_energy(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T) {
  double sum = 0.0;
  double t_local[max_tet_nodes];
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const RegionProperties& region = problem.regions[mesh.tet_region[e]];
    if (!region.capacity) continue;
    for (int a = 0; a < mesh.nodes_per_tet(); ++a) t_local[a] = T[mesh.tet(e)[a]];
    sum += tet_enthalpy(tet_geometry(mesh, e), *region.capacity, t_local);
  }
  return sum;
}

double storage_rate(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T) {
  if (!problem.time_levels) return 0.0;
  double sum = 0.0;
  double t_local[max_tet_nodes], R[max_tet_nodes];
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    for (int a = 0; a < mesh.nodes_per_tet(); ++a) {
      t_local[a] = T[mesh.tet(e)[a]];
      R[a] = 0.0;
    }
    add_element_capacity(mesh, problem, e, tet_geometry(mesh, e), t_local, R, nullptr);
    for (int a = 0; a < mesh.nodes_per_tet(); ++a) sum += R[a];
  }
  return sum;
}

std::vector<double> region_volumes(const Mesh& mesh) {
  std::vector<double> volumes(mesh.regions.size(), 0.0);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) volumes[mesh.tet_region[e]] += tet_volume(tet_geometry(mesh, e));
  return volumes;
}

Results post_process(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T) {
  Results out;
  recover_fluxes(mesh, problem, T, out);

  // Regions: volume, volume-averaged temperature, extremes over nodes, generated heat.
  out.regions.resize(mesh.regions.size());
  std::vector<double> t_integral(mesh.regions.size(), 0.0);
  std::vector<char> first(mesh.regions.size(), 1);
  for (std::size_t r = 0; r < mesh.regions.size(); ++r) out.regions[r].name = mesh.regions[r].name;
  double N[max_tet_nodes], J[3][3];
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const int r = mesh.tet_region[e];
    const TetGeometry g = tet_geometry(mesh, e);
    const std::int32_t* nodes = mesh.tet(e);
    if (g.order == 1) {  // exact: the mean of the corner values times the volume
      const double w = tet_volume(g);
      out.regions[r].volume += w;
      t_integral[r] += w * 0.25 * (T[nodes[0]] + T[nodes[1]] + T[nodes[2]] + T[nodes[3]]);
    } else {
      for (const auto& q : tet_rule(volume_degree(g))) {
        tet_shape_values(g.order, q.xi, N);
        const double w = q.weight * tet_jacobian(g, q.xi, J);
        double t = 0.0;
        for (int a = 0; a < mesh.nodes_per_tet(); ++a) t += N[a] * T[nodes[a]];
        out.regions[r].volume += w;
        t_integral[r] += w * t;
      }
    }
    bool f = first[r];
    for (int a = 0; a < mesh.nodes_per_tet(); ++a)
      update_extremes(out.regions[r].temperature, out.regions[r].hottest, T[nodes[a]], mesh.node(nodes[a]), f);
    first[r] = f;
  }
  for (std::size_t r = 0; r < mesh.regions.size(); ++r) {
    auto& region = out.regions[r];
    if (region.volume > 0) region.temperature.mean = t_integral[r] / region.volume;
    region.heat_generated = region.volume * problem.regions[r].heat_source;
  }
  if (problem.source_field) {  // manufactured sources: integrate them too
    for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
      const TetGeometry g = tet_geometry(mesh, e);
      for (const auto& q : tet_rule(problem.source_field_degree))
        out.regions[mesh.tet_region[e]].heat_generated +=
            q.weight * tet_jacobian(g, q.xi, J) * problem.source_field(tet_map(g, q.xi));
    }
  }

  // Boundaries: area, area-averaged temperature, extremes, heat rates.
  const auto neighbours = boundary_face_elements(mesh);
  out.boundaries.resize(mesh.boundaries.size());
  std::vector<double> bt_integral(mesh.boundaries.size(), 0.0);
  std::vector<char> bfirst(mesh.boundaries.size(), 1);
  std::vector<char> has_exterior_face(mesh.boundaries.size(), 0), is_contact(mesh.boundaries.size(), 0);
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b) out.boundaries[b].name = mesh.boundaries[b].name;
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const int b = mesh.face_boundary[f];
    BoundaryResult& br = out.boundaries[b];
    const FaceGeometry g = face_geometry(mesh, f);
    double integrals[max_face_nodes];
    face_shape_integrals(g, integrals);
    for (int a = 0; a < mesh.nodes_per_face(); ++a) {
      br.area += integrals[a];
      bt_integral[b] += integrals[a] * T[mesh.face(f)[a]];
    }
    bool fst = bfirst[b];
    for (int a = 0; a < mesh.nodes_per_face(); ++a)
      update_extremes(br.temperature, br.hottest, T[mesh.face(f)[a]], mesh.node(mesh.face(f)[a]), fst);
    bfirst[b] = fst;
    const BoundaryCondition& bc = problem.boundaries[b];
    if (mesh.face_is_split(f)) {  // cut for thermal contact: internal, heat h_c (T_behind - T_front)
      is_contact[b] = 1;
      if (bc.contact_conductance) {
        double t_both[2 * max_face_nodes], R[2 * max_face_nodes];
        for (int a = 0; a < mesh.nodes_per_face(); ++a) {
          t_both[a] = T[mesh.face(f)[a]];
          t_both[mesh.nodes_per_face() + a] = T[mesh.face_twin(f)[a]];
        }
        contact_local_terms(g, *bc.contact_conductance, t_both, R, nullptr);
        for (int a = 0; a < mesh.nodes_per_face(); ++a) br.heat_rate += R[a];
      }
      continue;
    }
    if (neighbours[f][0] < 0 || neighbours[f][1] < 0) has_exterior_face[b] = 1;
  }
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b) {
    out.boundaries[b].internal = !has_exterior_face[b] && out.boundaries[b].area > 0;
    if (out.boundaries[b].area > 0) out.boundaries[b].temperature.mean = bt_integral[b] / out.boundaries[b].area;
  }
  const std::vector<double> rates = surface_heat_rates(mesh, problem, T, neighbours);
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b) out.boundaries[b].heat_rate += rates[b];
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b)
    if (out.boundaries[b].internal && !problem.boundaries[b].is_fixed() && !is_contact[b])
      out.boundaries[b].heat_rate = internal_heat_rate(mesh, problem, T, static_cast<std::int32_t>(b), neighbours);

  // Energy balance over the exterior boundaries and the sources.
  EnergyBalance& eb = out.balance;
  for (std::size_t k = 0; k < out.boundaries.size(); ++k) {
    const BoundaryResult& b = out.boundaries[k];
    // Internal surfaces pass heat from one part of the body to another, except a fixed
    // temperature inside, which adds or removes heat like an outer one.
    if (b.internal && !problem.boundaries[k].is_fixed()) continue;
    if (b.heat_rate > 0)
      eb.boundary_in += b.heat_rate;
    else
      eb.boundary_out -= b.heat_rate;
  }
  for (const auto& r : out.regions) eb.sources += r.heat_generated;
  if (problem.time_levels) eb.stored = storage_rate(mesh, problem, T);
  const double scale = std::max({eb.boundary_in + std::abs(eb.sources), eb.boundary_out, 1e-300});
  eb.relative_imbalance = (eb.boundary_in + eb.sources - eb.boundary_out - eb.stored) / scale;
  return out;
}

}  // namespace hearth
