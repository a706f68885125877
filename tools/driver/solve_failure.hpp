// The message of a solve that failed (exit status 2): why, with the numbers, and what
// to try; for temperatures that overflowed, the case's largest input value and its line.
#pragma once

#include <filesystem>
#include <string>

#include "io/case.hpp"
#include "solver/steady_solver.hpp"

namespace hearth {

std::string solve_failure_message(const Case& c, const SteadySolution& solution, const std::filesystem::path& out);

}  // namespace hearth
