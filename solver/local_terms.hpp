// Element and face contributions to the residual R(T) and its Jacobian dR/dT, for
// linear and nonlinear conduction alike.
//
// R_a = int_e grad N_a . K(T) grad T - int_e f N_a
//     + int_f [ h(T)(T - T_inf) + eps sigma (T^4 - T_sur^4) - q_in ] N_a
// Exact Jacobian: int grad N_a . K grad N_b + int grad N_a . (dK/dT grad T) N_b
//     + int [ h + h'(T)(T - T_inf) + 4 eps sigma T^3 ] N_a N_b.
// The Picard (linearised) matrix drops dK/dT and h', and takes the secant
// eps sigma (T^2 + T_sur^2)(T + T_sur) for radiation, so that M(T) T - b(T) = R(T).
#pragma once

#include <array>
#include <functional>

#include "solver/material.hpp"
#include "solver/problem.hpp"
#include "solver/tet_element.hpp"

namespace hearth {

enum class JacobianKind { exact, picard };

// R (n values) and, when J is not null, J (n x n, row-major) of one tetrahedron, for the
// element's nodal temperatures T (K). R and J are overwritten.
void tet_local_terms(const TetGeometry& g, const RegionProperties& region,
                     const std::function<double(const std::array<double, 3>&)>& source_field, int source_degree,
                     const double* T, JacobianKind kind, double* R, double* J);

// The case large linear solves are made of, inlined into the assembly loop: a 4-node
// element of constant isotropic conductivity k (W/(m K)) and uniform source f (W/m3),
// from its corner coordinates (x, y, z each, m). K = k V G G^T with the constant
// gradients G = g / det (g from p1_scaled_gradients, det = 6 V), so
// K_ab = k (g_a . g_b) / (6 det); R = K T - f V / 4. The values of tet_local_terms,
// without copying the element's geometry or reading k and f from their tables per
// element. K is always written (R needs it).
inline void p1_isotropic_terms(const double* x0, const double* x1, const double* x2, const double* x3, double k,
                               double f, const double* T, double* R, double* K) {
  double g[4][3];
  const double det = p1_scaled_gradients(x0, x1, x2, x3, g);
  const double w = k / (6.0 * det), share = f * det / 24.0;
  for (int i = 0; i < 4; ++i)
    for (int j = i; j < 4; ++j) K[i * 4 + j] = K[j * 4 + i] = w * (g[i][0] * g[j][0] + g[i][1] * g[j][1] + g[i][2] * g[j][2]);
  for (int i = 0; i < 4; ++i)
    R[i] = K[i * 4] * T[0] + K[i * 4 + 1] * T[1] + K[i * 4 + 2] * T[2] + K[i * 4 + 3] * T[3] - share;
}

// The capacity term of a time step for one element (see TimeLevels): the element's
// nodal temperatures at the two previous levels, T2 null when c[2] = 0.
struct CapacityTerm {
  const HeatCapacity* capacity = nullptr;
  std::array<double, 3> c{};
  const double* T1 = nullptr;
  const double* T2 = nullptr;
};

// R += C_a and J += c0 int N_a rho c(T) N_b (the consistent mass matrix).
void add_capacity_terms(const TetGeometry& g, const CapacityTerm& term, const double* T, double* R, double* J);

// int H(T) dV over one element, J (stored energy relative to HeatCapacity's reference).
double tet_enthalpy(const TetGeometry& g, const HeatCapacity& capacity, const double* T);

// The same for one boundary triangle under its condition (not fixed).
void face_local_terms(const FaceGeometry& g, const BoundaryCondition& bc, const double* T, JacobianKind kind,
                      double* R, double* J);

// A cut face with thermal contact conductance h_c: nodes 0..n-1 are the side behind,
// n..2n-1 the side in front. R_a = +-int h_c (T_behind - T_front) N_a; J = h_c [M -M; -M M].
void contact_local_terms(const FaceGeometry& g, double conductance, const double* T, double* R, double* J);

// Heat entering the body through one face under its condition, W (positive into the body):
// int [ q_in - h(T)(T - T_inf) - eps sigma (T^4 - T_sur^4) ] dA.
double face_heat_in(const FaceGeometry& g, const BoundaryCondition& bc, const double* T);

// K(T) grad T at reference point xi: the heat flux is minus this (W/m2).
std::array<double, 3> conducted_gradient(const TetGeometry& g, const Conductivity& k, const double* T,
                                         const std::array<double, 3>& xi);

// K += int grad N_a . K grad N_b for a conductivity independent of temperature.
void add_constant_conductance(const TetGeometry& g, const Conductivity& k, double* K);

}  // namespace hearth
