// Request and mesh passed through files in a private temporary folder; the child is
// this program (/proc/self/exe), started with posix_spawn.
#include "tools/driver/mesh_worker.hpp"

#include <fcntl.h>
#include <signal.h>
#include <sys/prctl.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <stdexcept>

#include "io/atomic_file.hpp"
#include "io/write_error.hpp"
#include "mesh/gmsh_mesher.hpp"
#include "mesh/mesh_error.hpp"
#include "tools/driver/errors.hpp"
#include "tools/driver/sandbox.hpp"
#include "tools/driver/mesh_file.hpp"

extern char** environ;

namespace hearth {

namespace fs = std::filesystem;

namespace {

nlohmann::json request_json(const MeshRequest& r) {
  return {{"geometry_file", r.geometry_file.string()}, {"length_unit", r.length_unit}, {"size", r.size},
          {"order", r.order},  {"local_sizes", r.local_sizes},  {"refinements", r.refinements},
          {"threads", r.threads}, {"renumber", r.renumber},     {"algorithm", r.algorithm},
          {"trust_geometry", r.trust_geometry}, {"local_size_origins", r.local_size_origins}};
}

MeshRequest request_from_json(const nlohmann::json& j) {
  MeshRequest r;
  r.geometry_file = j.at("geometry_file").get<std::string>();
  r.length_unit = j.at("length_unit").get<std::string>();
  r.size = j.at("size").get<double>();
  r.order = j.at("order").get<int>();
  r.local_sizes = j.at("local_sizes").get<std::map<std::string, double>>();
  r.refinements = j.at("refinements").get<int>();
  r.threads = j.at("threads").get<int>();
  r.renumber = j.at("renumber").get<bool>();
  r.algorithm = j.at("algorithm").get<std::string>();
  r.trust_geometry = j.at("trust_geometry").get<bool>();
  r.local_size_origins = j.at("local_size_origins").get<std::map<std::string, std::string>>();
  return r;
}

// How the worker ended, with the sandbox's conventions undone: bubblewrap exits with
// 128 + N when the command it runs dies on signal N.
struct WorkerEnd {
  bool exited = false;  // exited with `code`, else killed by `signal`
  int code = 0;
  int signal = 0;
};

WorkerEnd worker_end(int status, bool sandboxed) {
  if (WIFSIGNALED(status)) return {false, 0, WTERMSIG(status)};
  const int code = WIFEXITED(status) ? WEXITSTATUS(status) : 1;
  if (sandboxed && code > 128 && code < 128 + 65) return {false, 0, code - 128};
  return {true, code, 0};
}

// Waits (briefly) until process `pid` is gone: the sandbox's own process, which goes
// with everything inside it when bubblewrap is stopped.
void wait_until_gone(pid_t pid) {
  for (int k = 0; k < 150 && pid > 0 && kill(pid, 0) == 0; ++k) usleep(20000);
}

// Runs the worker, in the sandbox when `sandbox` is set and bubblewrap works here;
// returns how it ended. `note` receives a line when a sandbox was asked for and
// cannot be had.
WorkerEnd run_worker(const fs::path& dir, const fs::path& request_file, const fs::path& mesh_file, bool quiet,
                     bool sandbox, std::string& note) {
  std::string exe = fs::read_symlink("/proc/self/exe").string();
  int info[2] = {-1, -1};  // bubblewrap reports the sandbox's process id here
  if (sandbox && pipe2(info, O_CLOEXEC) != 0) info[0] = info[1] = -1;
  std::vector<std::string> args;
  bool sandboxed = false;
  if (sandbox) {
    if (info[1] >= 0) fcntl(info[1], F_SETFD, 0);  // the write end goes to bubblewrap
    const SandboxPrefix prefix = sandbox_prefix(dir, info[1]);
    if (prefix.arguments.empty()) note = "parsing the geometry without a sandbox: " + prefix.unavailable;
    args = prefix.arguments;
    sandboxed = !args.empty();
  }
  for (const std::string& a : {exe, std::string(mesh_worker_verb), request_file.string(), mesh_file.string()})
    args.push_back(a);
  if (quiet) args.push_back("--quiet");
  std::vector<char*> argv;
  for (auto& a : args) argv.push_back(a.data());
  argv.push_back(nullptr);
  pid_t pid = 0;
  const int spawned = posix_spawn(&pid, argv[0], nullptr, nullptr, argv.data(), environ);
  if (info[1] >= 0) close(info[1]);
  struct CloseInfo {
    int fd;
    ~CloseInfo() {
      if (fd >= 0) close(fd);
    }
  } close_info{info[0]};
  if (spawned != 0) throw std::runtime_error("cannot start the meshing process " + args.front());
  if (info[0] >= 0) fcntl(info[0], F_SETFL, O_NONBLOCK);
  // Poll, so that an interrupt of this process stops the worker too (Ctrl-C reaches the
  // whole process group anyway; a SIGTERM sent to this process alone would not).
  int status = 0;
  bool forwarded = false;
  for (;;) {
    const pid_t done = waitpid(pid, &status, WNOHANG);
    if (done == pid || (done < 0 && errno != EINTR)) break;
    if (interrupt_requested() && !forwarded) {
      kill(pid, SIGTERM);
      forwarded = true;
    }
    usleep(20000);
  }
  if (forwarded && sandboxed && info[0] >= 0) {
    char buffer[4096];
    const ssize_t n = read(info[0], buffer, sizeof buffer - 1);
    wait_until_gone(sandbox_child_pid(std::string(buffer, n > 0 ? static_cast<std::size_t>(n) : 0)));
  }
  check_interrupt("while meshing; nothing was written");
  return worker_end(status, sandboxed);
}

}  // namespace

Mesh build_mesh_isolated(const MeshRequest& request, bool quiet, bool sandbox) {
  char pattern[] = "/tmp/hearth-mesh-XXXXXX";
  if (!mkdtemp(pattern))
    throw WriteError(std::string("cannot create a temporary folder for meshing in /tmp: ") + std::strerror(errno));
  const fs::path dir = pattern;
  struct Cleanup {
    fs::path dir;
    ~Cleanup() {
      std::error_code ignored;
      fs::remove_all(dir, ignored);
    }
  } cleanup{dir};
  MeshRequest attempt = request;
  for (int round = 0; round < 2; ++round) {
    const fs::path request_file = dir / "request.json", mesh_file = dir / "mesh.bin";
    {
      std::ofstream out(request_file);
      out << request_json(attempt).dump();
      out.close();
      if (!out) throw WriteError(write_failure(request_file, errno) + " (the meshing request, in /tmp)");
    }
    std::string note;
    const WorkerEnd end = run_worker(dir, request_file, mesh_file, quiet, sandbox, note);
    if (!note.empty() && round == 0 && !quiet) std::fprintf(stderr, "note: %s\n", note.c_str());
    if (end.exited && end.code == 0) {
      std::error_code error;
      if (!fs::is_regular_file(mesh_file, error))  // a script's Exit command ends Gmsh, and the worker with it
        throw MeshError(request.geometry_file.string() +
                        ": the meshing process ended before it made a mesh; a geometry script must not end Gmsh "
                        "(remove an Exit command)");
      return read_mesh_file(mesh_file);
    }
    if (end.exited) {
      std::ifstream error(mesh_file.string() + ".error");
      std::string text((std::istreambuf_iterator<char>(error)), std::istreambuf_iterator<char>());
      throw MeshError(text.empty() ? "meshing failed (status " + std::to_string(end.code) + ")" : text);
    }
    const int signal = end.signal;
    if (signal == SIGINT) throw Interrupted("interrupted (SIGINT) while meshing; nothing was written", exit_interrupted);
    if (signal == SIGTERM) throw Interrupted("terminated (SIGTERM) while meshing; nothing was written", exit_terminated);
    if (attempt.algorithm == "delaunay")
      throw MeshError(request.geometry_file.filename().string() + ": Gmsh crashed while meshing (signal " +
                      std::to_string(signal) + ", also with the Delaunay algorithm); try another mesh size or " +
                      "a local size on small features");
    if (!quiet)
      std::fprintf(stderr, "meshing %s: Gmsh's HXT algorithm crashed (signal %d, %s); meshing again with Delaunay\n",
                   request.geometry_file.filename().c_str(), signal, strsignal(signal));
    attempt.algorithm = "delaunay";
  }
  throw MeshError("meshing failed");
}

int mesh_worker_command(const std::string& request_file, const std::string& mesh_file, bool quiet) {
  // Go when the driver goes (killed, say): nobody would read this mesh.
  prctl(PR_SET_PDEATHSIG, SIGKILL);
  try {
    std::ifstream in(request_file);
    MeshRequest request = request_from_json(nlohmann::json::parse(in));
    if (!quiet) request.progress = [](const std::string& line) { std::fprintf(stderr, "           %s\n", line.c_str()); };
    write_mesh_file(mesh_file, build_mesh(request));
    return 0;
  } catch (const std::exception& e) {
    std::ofstream(mesh_file + ".error") << e.what();
    return 1;
  }
}

}  // namespace hearth
