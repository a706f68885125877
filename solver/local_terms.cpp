// Local residuals and Jacobians by quadrature; constant isotropic conductivity takes
// the closed-form element matrix.
#include "solver/local_terms.hpp"

#include <algorithm>

#include "solver/quadrature.hpp"

namespace hearth {

namespace {

int tet_nodes(int order) { return order == 2 ? 10 : 4; }
int face_nodes(int order) { return order == 2 ? 6 : 3; }

// Rules: k(T) varies with the interpolated temperature, so one degree above the
// constant-coefficient integrand; curved 10-node elements take degree 4 as elsewhere.
int nonlinear_tet_degree(const TetGeometry& g) { return g.order == 1 ? 2 : (g.affine() ? 3 : 4); }
int face_degree(const FaceGeometry& g, const BoundaryCondition& bc) {
  if (bc.radiation) return g.order == 1 ? 5 : 8;  // T^4 N_a
  return g.order == 1 ? 3 : 5;
}

}  // namespace

void add_constant_conductance(const TetGeometry& g, const Conductivity& k, double* K) {
  if (k.is_isotropic()) return add_tet_conductance(g, k.principal[0].value(0.0), K);
  Matrix3 Km;
  k.at(0.0, Km);
  const int n = tet_nodes(g.order);
  double grad[max_tet_nodes][3];
  for (const auto& q : tet_rule(g.order == 1 ? 1 : (g.affine() ? 2 : 4))) {
    const double w = q.weight * tet_physical_gradients(g, q.xi, grad);
    for (int b = 0; b < n; ++b) {
      const double kg[3] = {Km[0][0] * grad[b][0] + Km[0][1] * grad[b][1] + Km[0][2] * grad[b][2],
                            Km[1][0] * grad[b][0] + Km[1][1] * grad[b][1] + Km[1][2] * grad[b][2],
                            Km[2][0] * grad[b][0] + Km[2][1] * grad[b][1] + Km[2][2] * grad[b][2]};
      for (int a = 0; a < n; ++a) K[a * n + b] += w * (grad[a][0] * kg[0] + grad[a][1] * kg[1] + grad[a][2] * kg[2]);
    }
  }
}

void tet_local_terms(const TetGeometry& g, const RegionProperties& region,
                     const std::function<double(const std::array<double, 3>&)>& source_field, int source_degree,
                     const double* T, JacobianKind kind, double* R, double* J) {
  const int n = tet_nodes(g.order);
  double F[max_tet_nodes];
  std::fill(F, F + n, 0.0);
  add_tet_source(g, region.heat_source, F);                            // int f N_a
  if (source_field) add_tet_source_field(g, source_field, source_degree, F);
  if (!region.conductivity.depends_on_temperature()) {
    // Constant K: the element matrix itself is the Jacobian; R = K T - F.
    double local[max_tet_nodes * max_tet_nodes];
    double* K = J ? J : local;
    std::fill(K, K + n * n, 0.0);
    add_constant_conductance(g, region.conductivity, K);               // int grad N_a . K grad N_b
    for (int a = 0; a < n; ++a) {
      double r = -F[a];
      for (int b = 0; b < n; ++b) r += K[a * n + b] * T[b];
      R[a] = r;
    }
    return;
  }
  for (int a = 0; a < n; ++a) R[a] = -F[a];
  if (J) std::fill(J, J + n * n, 0.0);
  double N[max_tet_nodes], grad[max_tet_nodes][3];
  for (const auto& q : tet_rule(nonlinear_tet_degree(g))) {
    const double w = q.weight * tet_physical_gradients(g, q.xi, grad);
    tet_shape_values(g.order, q.xi, N);
    double t = 0.0, gt[3] = {0, 0, 0};
    for (int b = 0; b < n; ++b) {
      t += N[b] * T[b];
      for (int d = 0; d < 3; ++d) gt[d] += grad[b][d] * T[b];
    }
    Matrix3 K, dK;
    region.conductivity.at(t, K, &dK);
    const double kg[3] = {K[0][0] * gt[0] + K[0][1] * gt[1] + K[0][2] * gt[2],
                          K[1][0] * gt[0] + K[1][1] * gt[1] + K[1][2] * gt[2],
                          K[2][0] * gt[0] + K[2][1] * gt[1] + K[2][2] * gt[2]};
    const double dkg[3] = {dK[0][0] * gt[0] + dK[0][1] * gt[1] + dK[0][2] * gt[2],
                           dK[1][0] * gt[0] + dK[1][1] * gt[1] + dK[1][2] * gt[2],
                           dK[2][0] * gt[0] + dK[2][1] * gt[1] + dK[2][2] * gt[2]};
    for (int a = 0; a < n; ++a) {
      R[a] += w * (grad[a][0] * kg[0] + grad[a][1] * kg[1] + grad[a][2] * kg[2]);  // grad N_a . K grad T
      if (!J) continue;
      const double a_dkg = grad[a][0] * dkg[0] + grad[a][1] * dkg[1] + grad[a][2] * dkg[2];
      for (int b = 0; b < n; ++b) {
        double kb = 0.0;  // grad N_a . K grad N_b
        for (int i = 0; i < 3; ++i)
          kb += grad[a][i] * (K[i][0] * grad[b][0] + K[i][1] * grad[b][1] + K[i][2] * grad[b][2]);
        J[a * n + b] += w * (kb + (kind == JacobianKind::exact ? a_dkg * N[b] : 0.0));
      }
    }
  }
}

void face_local_terms(const FaceGeometry& g, const BoundaryCondition& bc, const double* T, JacobianKind kind,
                      double* R, double* J) {
  const int n = face_nodes(g.order);
  std::fill(R, R + n, 0.0);
  if (J) std::fill(J, J + n * n, 0.0);
  double N[max_face_nodes];
  for (const auto& q : triangle_rule(face_degree(g, bc))) {
    triangle_shape_values(g.order, q.xi[0], q.xi[1], N);
    const double w = q.weight * face_jacobian(g, q.xi[0], q.xi[1]);
    double t = 0.0;
    for (int b = 0; b < n; ++b) t += N[b] * T[b];
    double r = -bc.heat_flux, dr = 0.0;
    if (bc.convection) {
      const double h = bc.convection->coefficient.value(t);
      r += h * (t - bc.convection->ambient);
      dr += h + (kind == JacobianKind::exact ? bc.convection->coefficient.slope(t) * (t - bc.convection->ambient) : 0.0);
    }
    if (bc.radiation) {
      const double es = bc.radiation->emissivity * stefan_boltzmann, ts = bc.radiation->surroundings;
      r += es * (t * t * t * t - ts * ts * ts * ts);
      dr += kind == JacobianKind::exact ? 4.0 * es * t * t * t : es * (t * t + ts * ts) * (t + ts);
    }
    for (int a = 0; a < n; ++a) {
      R[a] += w * r * N[a];
      if (J)
        for (int b = 0; b < n; ++b) J[a * n + b] += w * dr * N[a] * N[b];
    }
  }
}

void contact_local_terms(const FaceGeometry& g, double conductance, const double* T, double* R, double* J) {
  const int n = face_nodes(g.order), m = 2 * n;
  double M[max_face_nodes * max_face_nodes] = {0};
  add_face_mass(g, conductance, M);  // int h_c N_a N_b
  for (int a = 0; a < n; ++a) {
    double jump = 0.0;
    for (int b = 0; b < n; ++b) jump += M[a * n + b] * (T[b] - T[n + b]);
    R[a] = jump;
    R[n + a] = -jump;
  }
  if (!J) return;
  for (int a = 0; a < n; ++a)
    for (int b = 0; b < n; ++b) {
      const double v = M[a * n + b];
      J[a * m + b] = v;
      J[a * m + n + b] = -v;
      J[(n + a) * m + b] = -v;
      J[(n + a) * m + n + b] = v;
    }
}

double face_heat_in(const FaceGeometry& g, const BoundaryCondition& bc, const double* T) {
  double R[max_face_nodes];
  face_local_terms(g, bc, T, JacobianKind::picard, R, nullptr);
  double sum = 0.0;  // sum_a R_a = int r (shape functions sum to one)
  for (int a = 0; a < face_nodes(g.order); ++a) sum += R[a];
  return -sum;
}

std::array<double, 3> conducted_gradient(const TetGeometry& g, const Conductivity& k, const double* T,
                                         const std::array<double, 3>& xi) {
  const int n = tet_nodes(g.order);
  double N[max_tet_nodes], grad[max_tet_nodes][3];
  tet_physical_gradients(g, xi, grad);
  tet_shape_values(g.order, xi, N);
  double t = 0.0, gt[3] = {0, 0, 0};
  for (int b = 0; b < n; ++b) {
    t += N[b] * T[b];
    for (int d = 0; d < 3; ++d) gt[d] += grad[b][d] * T[b];
  }
  Matrix3 K;
  k.at(t, K);
  return {K[0][0] * gt[0] + K[0][1] * gt[1] + K[0][2] * gt[2], K[1][0] * gt[0] + K[1][1] * gt[1] + K[1][2] * gt[2],
          K[2][0] * gt[0] + K[2][1] * gt[1] + K[2][2] * gt[2]};
}

}  // namespace hearth
