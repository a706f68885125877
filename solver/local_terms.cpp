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

// rho c N_a N_b is degree 2p on a straight element; a temperature-dependent rho c and
// curved 10-node elements take more points.
int capacity_degree(const TetGeometry& g, bool varies) {
  if (g.order == 1) return 2;  // a varying rho c is integrated to second order, as the P1 field itself
  return g.affine() ? (varies ? 5 : 4) : 6;
}

double interpolate(const double* N, const double* T, int n) {
  double t = 0.0;
  for (int b = 0; b < n; ++b) t += N[b] * T[b];
  return t;
}

// int N_a N_b over the reference element (volume 1/6), for the straight-element mass matrix.
const std::vector<double>& reference_mass(int order) {
  static const std::vector<double> mass[2] = {[] {
    std::vector<double> m(16, 0.0);
    double N[max_tet_nodes];
    for (const auto& q : tet_rule(2)) {
      tet_shape_values(1, q.xi, N);
      for (int a = 0; a < 4; ++a)
        for (int b = 0; b < 4; ++b) m[a * 4 + b] += q.weight * N[a] * N[b];
    }
    return m;
  }(), [] {
    std::vector<double> m(100, 0.0);
    double N[max_tet_nodes];
    for (const auto& q : tet_rule(4)) {
      tet_shape_values(2, q.xi, N);
      for (int a = 0; a < 10; ++a)
        for (int b = 0; b < 10; ++b) m[a * 10 + b] += q.weight * N[a] * N[b];
    }
    return m;
  }()};
  return mass[order == 2 ? 1 : 0];
}

double straight_jacobian(const TetGeometry& g) {
  if (g.order == 1) {  // det of the edge vectors, without the shape-function machinery
    const Point& o = g.x[0];
    const double a[3] = {g.x[1][0] - o[0], g.x[1][1] - o[1], g.x[1][2] - o[2]};
    const double b[3] = {g.x[2][0] - o[0], g.x[2][1] - o[1], g.x[2][2] - o[2]};
    const double c[3] = {g.x[3][0] - o[0], g.x[3][1] - o[1], g.x[3][2] - o[2]};
    return a[0] * (b[1] * c[2] - b[2] * c[1]) + a[1] * (b[2] * c[0] - b[0] * c[2]) + a[2] * (b[0] * c[1] - b[1] * c[0]);
  }
  double Jac[3][3];
  return tet_jacobian(g, {0.25, 0.25, 0.25}, Jac);
}

// Straight 4-node element with K(T): the gradients and grad T are constant, so
// int grad N_a . K(T) grad N_b = grad N_a . (int K(T)) grad N_b, and the Newton term
// int grad N_a . (dK/dT grad T) N_b needs only the quadrature sums of dK N_b: one
// geometry evaluation and four conductivity look-ups instead of four full passes.
void add_p1_temperature_dependent_conduction(const TetGeometry& g, const Conductivity& k, const double* T,
                                             JacobianKind kind, double* R, double* J) {
  double grad[4][3];
  const double det = p1_gradients(g, grad);
  double gt[3] = {0, 0, 0};
  for (int b = 0; b < 4; ++b)
    for (int d = 0; d < 3; ++d) gt[d] += grad[b][d] * T[b];
  const bool newton_term = J && kind == JacobianKind::exact;
  Matrix3 Kbar{}, dK_N[4]{};  // int K dV, and int dK/dT N_b dV for each b
  for (const auto& q : tet_rule(2)) {
    const double N[4] = {1.0 - q.xi[0] - q.xi[1] - q.xi[2], q.xi[0], q.xi[1], q.xi[2]};
    const double t = N[0] * T[0] + N[1] * T[1] + N[2] * T[2] + N[3] * T[3];
    const double w = q.weight * det;
    if (k.is_isotropic()) {  // the common case without 3 x 3 tensors
      const double kt = k.principal[0].value(t);
      for (int i = 0; i < 3; ++i) Kbar[i][i] += w * kt;
      if (newton_term) {
        const double dk = k.principal[0].slope(t);
        for (int b = 0; b < 4; ++b)
          for (int i = 0; i < 3; ++i) dK_N[b][i][i] += w * N[b] * dk;
      }
      continue;
    }
    Matrix3 K, dK;
    k.at(t, K, newton_term ? &dK : nullptr);
    for (int i = 0; i < 3; ++i)
      for (int j = 0; j < 3; ++j) {
        Kbar[i][j] += w * K[i][j];
        if (newton_term)
          for (int b = 0; b < 4; ++b) dK_N[b][i][j] += w * N[b] * dK[i][j];
      }
  }
  const double kg[3] = {Kbar[0][0] * gt[0] + Kbar[0][1] * gt[1] + Kbar[0][2] * gt[2],
                        Kbar[1][0] * gt[0] + Kbar[1][1] * gt[1] + Kbar[1][2] * gt[2],
                        Kbar[2][0] * gt[0] + Kbar[2][1] * gt[1] + Kbar[2][2] * gt[2]};
  for (int a = 0; a < 4; ++a) R[a] += grad[a][0] * kg[0] + grad[a][1] * kg[1] + grad[a][2] * kg[2];
  if (!J) return;
  for (int b = 0; b < 4; ++b) {
    // Column b: Kbar grad N_b, plus (int dK/dT N_b) grad T for Newton.
    double col[3];
    for (int i = 0; i < 3; ++i) {
      col[i] = Kbar[i][0] * grad[b][0] + Kbar[i][1] * grad[b][1] + Kbar[i][2] * grad[b][2];
      if (newton_term) col[i] += dK_N[b][i][0] * gt[0] + dK_N[b][i][1] * gt[1] + dK_N[b][i][2] * gt[2];
    }
    for (int a = 0; a < 4; ++a) J[a * 4 + b] += grad[a][0] * col[0] + grad[a][1] * col[1] + grad[a][2] * col[2];
  }
}

}  // namespace

void add_capacity_terms(const TetGeometry& g, const CapacityTerm& term, const double* T, double* R, double* J) {
  const int n = tet_nodes(g.order);
  const HeatCapacity& k = *term.capacity;
  if (!k.depends_on_temperature() && g.affine()) {
    // Constant rho c on a straight element: H is linear in T and the c's sum to zero, so
    // C = rho c M (c0 T + c1 T_1 + c2 T_2) with the closed-form mass matrix M.
    const std::vector<double>& M = reference_mass(g.order);
    const double scale = k.volumetric(0.0) * straight_jacobian(g);
    double v[max_tet_nodes];
    for (int b = 0; b < n; ++b)
      v[b] = term.c[0] * T[b] + term.c[1] * term.T1[b] + (term.T2 ? term.c[2] * term.T2[b] : 0.0);
    for (int a = 0; a < n; ++a) {
      double r = 0.0;
      for (int b = 0; b < n; ++b) r += M[a * n + b] * v[b];
      R[a] += scale * r;
      if (J)
        for (int b = 0; b < n; ++b) J[a * n + b] += scale * term.c[0] * M[a * n + b];
    }
    return;
  }
  double N[max_tet_nodes], Jac[3][3];
  const double straight = g.affine() ? straight_jacobian(g) : 0.0;
  for (const auto& q : tet_rule(capacity_degree(g, k.depends_on_temperature()))) {
    const double w = q.weight * (g.affine() ? straight : tet_jacobian(g, q.xi, Jac));
    tet_shape_values(g.order, q.xi, N);
    const double t = interpolate(N, T, n);
    double stored = term.c[0] * k.enthalpy(t) + term.c[1] * k.enthalpy(interpolate(N, term.T1, n));
    if (term.T2 && term.c[2] != 0.0) stored += term.c[2] * k.enthalpy(interpolate(N, term.T2, n));
    for (int a = 0; a < n; ++a) R[a] += w * stored * N[a];
    if (!J) continue;
    const double m = w * term.c[0] * k.volumetric(t);
    for (int a = 0; a < n; ++a)
      for (int b = 0; b < n; ++b) J[a * n + b] += m * N[a] * N[b];
  }
}

double tet_enthalpy(const TetGeometry& g, const HeatCapacity& capacity, const double* T) {
  const int n = tet_nodes(g.order);
  if (!capacity.depends_on_temperature() && g.affine()) {
    const std::vector<double>& M = reference_mass(g.order);
    double sum = 0.0;  // sum_ab M_ab (T_b - T_ref): the rows of M sum to int N_b
    for (int a = 0; a < n; ++a)
      for (int b = 0; b < n; ++b) sum += M[a * n + b] * (T[b] - HeatCapacity::reference_temperature);
    return capacity.volumetric(0.0) * straight_jacobian(g) * sum;
  }
  double N[max_tet_nodes], Jac[3][3], sum = 0.0;
  const double straight = g.affine() ? straight_jacobian(g) : 0.0;
  for (const auto& q : tet_rule(capacity_degree(g, capacity.depends_on_temperature()))) {
    tet_shape_values(g.order, q.xi, N);
    sum += q.weight * (g.affine() ? straight : tet_jacobian(g, q.xi, Jac)) * capacity.enthalpy(interpolate(N, T, n));
  }
  return sum;
}

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
  if (g.order == 1) return add_p1_temperature_dependent_conduction(g, region.conductivity, T, kind, R, J);
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
