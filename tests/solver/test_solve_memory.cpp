// Memory estimate of a steady solve (solver/solve_memory.hpp): it names the solver the
// solve will use, and it is at least the per-unknown figures measured for design.md
// (this project's own measurements, no published source).
#include <gtest/gtest.h>

#include "solver/linear_solver.hpp"
#include "solver/solve_memory.hpp"

namespace hearth {
namespace {

TEST(SolveMemory, NamesTheSolverTheSolvePicks) {
  for (auto kind : {LinearSolverKind::automatic, LinearSolverKind::direct, LinearSolverKind::iterative})
    for (std::int64_t unknowns : {1000, 20000, 20001, 500000})
      for (bool symmetric : {true, false}) {
        LinearSolverSettings settings;
        settings.kind = kind;
        const auto solver = make_linear_solver(settings, unknowns, symmetric);
        EXPECT_EQ(estimate_solve_memory(unknowns, 1, settings, symmetric).linear_solver, solver->name())
            << unknowns << (symmetric ? " symmetric" : " non-symmetric");
      }
}

TEST(SolveMemory, AtLeastTheMeasuredFigures) {
  LinearSolverSettings direct, iterative;
  direct.kind = LinearSolverKind::direct;
  iterative.kind = LinearSolverKind::iterative;
  // design.md, measured on this project's 2-core machine: CHOLMOD 3.4 KB per unknown
  // (53 thousand P1 unknowns) and 6.4 KB (213 thousand P2); BoomerAMG-PCG 430 B (1
  // million P1) and about 880 B (1 million P2).
  EXPECT_GE(estimate_solve_memory(53000, 1, direct, true).bytes, 53000 * 3400.0);
  EXPECT_GE(estimate_solve_memory(213000, 2, direct, true).bytes, 213000 * 6400.0);
  EXPECT_GE(estimate_solve_memory(1000000, 1, iterative, true).bytes, 1e6 * 430.0);
  EXPECT_GE(estimate_solve_memory(1000000, 2, iterative, true).bytes, 1e6 * 880.0);
  // ... and not wildly above them: within a factor of 2 of the direct figure.
  EXPECT_LE(estimate_solve_memory(53000, 1, direct, true).bytes, 2 * 53000 * 3400.0);
  // A direct factor grows faster than the unknowns; multigrid does not.
  EXPECT_GT(estimate_solve_memory(2000000, 1, direct, true).bytes / 2e6,
            estimate_solve_memory(100000, 1, direct, true).bytes / 1e5);
  EXPECT_DOUBLE_EQ(estimate_solve_memory(2000000, 1, iterative, true).bytes / 2e6,
                   estimate_solve_memory(100000, 1, iterative, true).bytes / 1e5);
}

}  // namespace
}  // namespace hearth
