// The hearth commands. Each returns an exit status or throws (InputError, MeshError,
// SolveFailed, Interrupted), which main maps to the documented statuses.
#pragma once

#include "tools/driver/pipeline.hpp"

namespace hearth {

int run_command(const CommonOptions& options);
int check_command(const CommonOptions& options);
int mesh_command(const CommonOptions& options);
int materials_command();  // lists the shipped material library on stdout

}  // namespace hearth
