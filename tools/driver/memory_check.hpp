// Refuses a solve the machine's memory cannot hold, before anything is assembled.
#pragma once

#include "io/case.hpp"
#include "mesh/mesh.hpp"
#include "solver/problem.hpp"
#include "solver/solve_memory.hpp"

namespace hearth {

// Bytes of memory available now: MemAvailable of /proc/meminfo; 0 when unknown.
// Test hook: the environment variable HEARTH_TEST_MEMINFO names a file read instead
// (tests/cli/test_error_table.py pretends to have little memory with it).
double available_memory_bytes();

// "2.5 MB", "12.3 GB".
std::string memory_text(double bytes);

// The solve's estimate (estimate_solve_memory) for this mesh and problem. Throws
// InputError naming mesh.size when it exceeds the available memory, with both figures
// and what would fit (a larger mesh.size, order 1, the iterative solver).
SolveMemoryEstimate check_solve_memory(const Case& c, const Mesh& mesh, const ThermalProblem& problem);

}  // namespace hearth
