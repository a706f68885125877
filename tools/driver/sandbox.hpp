// A sandbox for the meshing worker: Debian's bubblewrap (bwrap) runs it with the whole
// file system read-only except its own private folder (also its TMPDIR), no network
// and its own process, user and IPC namespaces. A geometry from someone else
// is then parsed by Gmsh where it cannot write or delete the user's files even if a
// construct slipped past the geometry guard (mesh/geometry_guard.hpp).
#pragma once

#include <filesystem>
#include <string>
#include <vector>

namespace hearth {

struct SandboxPrefix {
  std::vector<std::string> arguments;  // "/usr/bin/bwrap", "--ro-bind", "/", "/", ...; empty: no sandbox
  std::string unavailable;             // why there is none (empty when there is one)
};

// The command-line prefix that runs a command in the sandbox, with `writable` the one
// folder it may write and `info_fd` a file descriptor on which bubblewrap reports the
// sandbox's process id (-1: none). Bubblewrap is tried once per process (it can be
// missing, or a container can forbid the namespaces it needs); when it cannot be used
// the prefix is empty and `unavailable` says why.
SandboxPrefix sandbox_prefix(const std::filesystem::path& writable, int info_fd);

// The process id bubblewrap reported on its info descriptor ("child-pid" of its JSON),
// 0 if the text holds none.
int sandbox_child_pid(const std::string& info);

}  // namespace hearth
