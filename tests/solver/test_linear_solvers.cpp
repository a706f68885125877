// The direct and multigrid solvers on one problem; symmetry of the assembled matrix.
// Contract check shared by every solver variant: same known problem, same answer,
// inputs unchanged.
#include "verification_support.hpp"

#include <cmath>

#include "solver/assembler.hpp"
#include "solver/gmres.hpp"

namespace hearth::testing {
namespace {

// A layered block with a conductivity contrast of 1000, a source and convection: no
// closed form needed, the check is agreement (common practice, no source).
const char* layered_block = R"(SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.1, 0.2, 0.2};
Box(2) = {0.1, 0, 0, 0.1, 0.2, 0.2};
v() = BooleanFragments{ Volume{1, 2}; Delete; }{};
eps = 1e-6;
Physical Volume("dense") = {Volume In BoundingBox{-eps, -eps, -eps, 0.1 + eps, 0.2 + eps, 0.2 + eps}};
Physical Volume("board") = {Volume In BoundingBox{0.1 - eps, -eps, -eps, 0.2 + eps, 0.2 + eps, 0.2 + eps}};
Physical Surface("hot") = {Surface In BoundingBox{-eps, -eps, -eps, eps, 0.2 + eps, 0.2 + eps}};
Physical Surface("cold") = {Surface In BoundingBox{0.2 - eps, -eps, -eps, 0.2 + eps, 0.2 + eps, 0.2 + eps}};
)";

// The block with a source in the dense layer, the hot face fixed and the cold face to air.
ThermalProblem layered_problem(const Mesh& mesh) {
  ThermalProblem p = problem_for(mesh, {{"dense", 40.0}, {"board", 0.04}}, {{"dense", 2e4}});
  condition(mesh, p, "hot").temperature = 900 + celsius;
  condition(mesh, p, "cold").convection = Convection{12, 25 + celsius};
  return p;
}

class SolverAgreement : public ::testing::TestWithParam<int> {};

TEST_P(SolverAgreement, DirectAndMultigridGiveTheSameTemperatures) {
  const int order = GetParam();
  const Mesh mesh = mesh_script("agree.geo", layered_block, 0.025, order);
  ThermalProblem p = layered_problem(mesh);
  const ThermalProblem before = p;
  const Solved direct = solve(mesh, p, LinearSolverKind::direct, 1e-12);
  const Solved amg = solve(mesh, p, LinearSolverKind::iterative, 1e-12);
  EXPECT_EQ(direct.solution.linear.solver, "cholmod");
  EXPECT_EQ(amg.solution.linear.solver, "boomeramg-pcg");
  EXPECT_GT(amg.solution.linear.iterations, 0);
  double diff = 0, norm = 0;
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i) {
    diff = std::max(diff, std::abs(direct.solution.temperature[i] - amg.solution.temperature[i]));
    norm = std::max(norm, std::abs(direct.solution.temperature[i]));
  }
  EXPECT_LT(diff / norm, 1e-8);
  EXPECT_NEAR(direct.heat_rate(mesh, "hot"), amg.heat_rate(mesh, "hot"), 1e-8 * std::abs(direct.heat_rate(mesh, "hot")));
  // Energy balance closes to the solver tolerance for both.
  EXPECT_LT(std::abs(direct.results.balance.relative_imbalance), 1e-9);
  EXPECT_LT(std::abs(amg.results.balance.relative_imbalance), 1e-9);
  // Inputs unchanged.
  EXPECT_EQ(before.boundaries.size(), p.boundaries.size());
  EXPECT_EQ(*p.boundaries[boundary_index(mesh, "hot")].temperature, 900 + celsius);
}

TEST_P(SolverAgreement, AssembledMatrixIsSymmetricWithPositiveDiagonal) {
  const int order = GetParam();
  const Mesh mesh = mesh_script("sym.geo", layered_block, 0.04, order);
  ThermalProblem p = problem_for(mesh, {{"dense", 40.0}, {"board", 0.04}});
  condition(mesh, p, "hot").temperature = 900 + celsius;
  condition(mesh, p, "cold").convection = Convection{12, 25 + celsius};
  const DofMap dofs = make_dof_map(mesh, p);
  const Assembler assembler(mesh, dofs, 2);
  CsrMatrix A;
  std::vector<double> b;
  assembler.assemble(p, A, b);
  auto entry = [&](std::int32_t r, std::int32_t c) {
    for (std::int64_t k = A.row_ptr[r]; k < A.row_ptr[r + 1]; ++k)
      if (A.col[k] == c) return A.val[k];
    return 0.0;
  };
  double max_asym = 0, max_entry = 0;
  for (std::int32_t r = 0; r < A.n; ++r)
    for (std::int64_t k = A.row_ptr[r]; k < A.row_ptr[r + 1]; ++k) {
      max_asym = std::max(max_asym, std::abs(A.val[k] - entry(A.col[k], r)));
      max_entry = std::max(max_entry, std::abs(A.val[k]));
      if (A.col[k] == r) EXPECT_GT(A.val[k], 0.0);
    }
  EXPECT_LT(max_asym, 1e-13 * max_entry);
  // The same assembly with one thread gives the same matrix (row ownership, no races).
  const Assembler serial(mesh, dofs, 1);
  CsrMatrix A1;
  std::vector<double> b1;
  serial.assemble(p, A1, b1);
  for (std::size_t k = 0; k < A.val.size(); ++k) ASSERT_NEAR(A.val[k], A1.val[k], 1e-14 * max_entry);
}

// A multigrid hierarchy kept from an earlier matrix (Newton steps, time steps) only
// preconditions: the Krylov method must solve each new matrix on the same pattern,
// the second one handed over as a new hypre matrix, the third copied into it in place.
// Checked against CHOLMOD on each matrix (agreement, common practice, no source).
TEST(KeptMultigrid, EachNewMatrixIsSolvedNotTheFirst) {
  const Mesh mesh = mesh_script("kept.geo", layered_block, 0.03, 1);
  ThermalProblem p = layered_problem(mesh);
  const DofMap dofs = make_dof_map(mesh, p);
  const Assembler assembler(mesh, dofs);
  for (const bool symmetric : {true, false}) {
    auto amg = make_amg_krylov_solver(1e-11, 500, symmetric);
    ThermalProblem q = p;
    for (int variant = 0; variant < 3; ++variant) {
      if (variant > 0) {  // board three times better, a stronger film each time
        q.regions[region_index(mesh, "board")].conductivity = Conductivity(0.04 * std::pow(3.0, variant));
        condition(mesh, q, "cold").convection = Convection{12.0 * (1 + variant), 25 + celsius};
      }
      CsrMatrix A;
      std::vector<double> b;
      assembler.assemble(q, A, b);
      amg->keep_preconditioner(variant > 0);
      amg->setup(A);
      std::vector<double> x(A.n, 0.0), reference(A.n, 0.0);
      const LinearSolveReport report = amg->solve(b, x);
      EXPECT_TRUE(report.converged()) << report.message;
      auto direct = make_cholmod_solver();
      direct->setup(A);
      direct->solve(b, reference);
      double diff = 0, norm = 0;
      for (std::int32_t i = 0; i < A.n; ++i) {
        diff = std::max(diff, std::abs(x[i] - reference[i]));
        norm = std::max(norm, std::abs(reference[i]));
      }
      EXPECT_LT(diff / norm, 1e-8) << (symmetric ? "CG" : "GMRES") << ", matrix " << variant;
    }
  }
}

// GMRES with right preconditioning: with M = A itself the first Krylov step is the
// answer, and with a factorisation of a nearby matrix a few steps reach the tolerance
// (Saad, Iterative Methods for Sparse Linear Systems, 2003, chapter 9, from memory).
// Checked against CHOLMOD on each matrix (agreement, common practice, no source).
TEST(Gmres, ExactAndNearbyFactorisationsAsPreconditioners) {
  const Mesh mesh = mesh_script("gmres.geo", layered_block, 0.03, 1);
  ThermalProblem p = layered_problem(mesh);
  const DofMap dofs = make_dof_map(mesh, p);
  const Assembler assembler(mesh, dofs);
  CsrMatrix A, B;
  std::vector<double> b, unused;
  assembler.assemble(p, A, b);
  ThermalProblem q = p;  // nearby: the board 20 % better, the film 30 % stronger
  q.regions[region_index(mesh, "board")].conductivity = Conductivity(0.048);
  condition(mesh, q, "cold").convection = Convection{15.6, 25 + celsius};
  assembler.assemble(q, B, unused);
  auto factor = make_cholmod_solver();
  factor->setup(A);
  std::vector<double> reference;
  factor->solve(b, reference);
  auto with_factor = [&](const std::vector<double>& r, std::vector<double>& z) { factor->apply_factorisation(r, z); };
  std::vector<double> x(A.n, 0.0);
  GmresOutcome g = gmres(A, b, x, with_factor, 1e-10, 50);
  EXPECT_TRUE(g.converged);
  EXPECT_LE(g.iterations, 2);  // one step, and round-off
  double diff = 0, norm = 0;
  for (std::int32_t i = 0; i < A.n; ++i) diff = std::max(diff, std::abs(x[i] - reference[i])), norm = std::max(norm, std::abs(reference[i]));
  EXPECT_LT(diff / norm, 1e-9);
  // B x = b preconditioned by A's factor.
  auto direct_b = make_cholmod_solver();
  direct_b->setup(B);
  direct_b->solve(b, reference);
  std::fill(x.begin(), x.end(), 0.0);
  g = gmres(B, b, x, with_factor, 1e-10, 50);
  EXPECT_TRUE(g.converged);
  EXPECT_LE(g.iterations, 20);
  EXPECT_LE(g.relative_residual, 1e-10);
  diff = 0, norm = 0;
  for (std::int32_t i = 0; i < A.n; ++i) diff = std::max(diff, std::abs(x[i] - reference[i])), norm = std::max(norm, std::abs(reference[i]));
  EXPECT_LT(diff / norm, 1e-8);
  std::printf("GMRES on the nearby matrix: %d iterations, relative residual %.2e\n", g.iterations, g.relative_residual);
}

// Newton's direct path (keep_factor_between_steps): a symmetric matrix is factorised by
// Cholesky, a kept factorisation serves later matrices through GMRES, and a matrix too
// far from it is factorised afresh, by LU when not symmetric (common practice, no source).
TEST(KeptFactorisation, CholeskyFirstThenGmresThenRenewal) {
  const Mesh mesh = mesh_script("keptlu.geo", layered_block, 0.03, 1);
  ThermalProblem p = layered_problem(mesh);
  const DofMap dofs = make_dof_map(mesh, p);
  const Assembler assembler(mesh, dofs);
  CsrMatrix A, near, far;
  std::vector<double> b, unused;
  assembler.assemble(p, A, b);
  ThermalProblem q = p;
  q.regions[region_index(mesh, "board")].conductivity = Conductivity(0.048);
  assembler.assemble(q, near, unused);
  // Far and not symmetric: the board 100 times better and one off-diagonal entry moved.
  q.regions[region_index(mesh, "board")].conductivity = Conductivity(4.0);
  assembler.assemble(q, far, unused);
  far.val[far.row_ptr[0] + (far.col[far.row_ptr[0]] == 0 ? 1 : 0)] *= 1.5;
  auto solver = keep_factor_between_steps(make_cholmod_solver(), make_umfpack_solver());
  solver->set_tolerance(1e-10);
  auto check = [&](const CsrMatrix& M, const char* expected_solver) {
    std::vector<double> x(M.n, 0.0);
    const LinearSolveReport r = solver->solve(b, x);
    EXPECT_TRUE(r.converged()) << r.message;
    EXPECT_EQ(r.solver, expected_solver);
    EXPECT_LT(relative_residual(M, b, x), 1e-9) << expected_solver;
    return r;
  };
  solver->setup(A);
  check(A, "cholmod");
  solver->keep_preconditioner(true);
  solver->setup(near);
  EXPECT_GT(check(near, "cholmod-gmres").iterations, 0);
  solver->setup(far);  // GMRES on A's factor gives up; LU of the far matrix
  check(far, "umfpack");
}

INSTANTIATE_TEST_SUITE_P(
LinearAndQuadratic, SolverAgreement, ::testing::Values(1, 2),
                         [](const auto& info) { return info.param == 1 ? "P1" : "P2"; });

}  // namespace
}  // namespace hearth::testing
