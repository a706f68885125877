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
