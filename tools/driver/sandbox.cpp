// Bubblewrap prefix for the meshing worker, tried once per process.
#include "tools/driver/sandbox.hpp"

#include <fcntl.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <fstream>
#include <iterator>
#include <optional>
#include <regex>

extern char** environ;

namespace hearth {

namespace fs = std::filesystem;

namespace {

constexpr const char* bwrap_path = "/usr/bin/bwrap";  // Debian's bubblewrap package

std::vector<std::string> bwrap_arguments(const fs::path& writable) {
  return {bwrap_path,
          "--ro-bind", "/", "/",          // everything read-only, /tmp too (geometry may live there) ...
          "--dev", "/dev",
          "--proc", "/proc",
          "--bind", writable.string(), writable.string(),  // ... but the worker's own folder
          "--setenv", "TMPDIR", writable.string(),         // where scratch files go
          "--unshare-all",                // no network; own user, process, IPC and host-name namespaces
          "--new-session",                // no access to the terminal's input
          "--die-with-parent",            // gone with hearth
          "--cap-drop", "ALL"};
}

// Runs `arguments` + /bin/true with stderr to `log`; the exit status, or -1.
int run_quietly(const std::vector<std::string>& arguments, const fs::path& log) {
  std::vector<std::string> args = arguments;
  args.push_back("/bin/true");
  std::vector<char*> argv;
  for (auto& a : args) argv.push_back(a.data());
  argv.push_back(nullptr);
  posix_spawn_file_actions_t actions;
  posix_spawn_file_actions_init(&actions);
  posix_spawn_file_actions_addopen(&actions, STDOUT_FILENO, "/dev/null", O_WRONLY, 0);
  posix_spawn_file_actions_addopen(&actions, STDERR_FILENO, log.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0600);
  pid_t pid = 0;
  const int spawned = posix_spawn(&pid, argv[0], &actions, nullptr, argv.data(), environ);
  posix_spawn_file_actions_destroy(&actions);
  if (spawned != 0) return -1;
  int status = 0;
  while (waitpid(pid, &status, 0) < 0)
    if (errno != EINTR) return -1;
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

// Empty when bubblewrap works here, else why not.
std::string probe(const fs::path& scratch) {
  if (access(bwrap_path, X_OK) != 0)
    return std::string(bwrap_path) + " is not installed (Debian package bubblewrap)";
  const fs::path log = scratch / "sandbox-probe.log";
  const int status = run_quietly(bwrap_arguments(scratch), log);
  std::ifstream in(log);
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  std::error_code ignored;
  fs::remove(log, ignored);
  if (status == 0) return "";
  while (!text.empty() && (text.back() == '\n' || text.back() == '\r')) text.pop_back();
  return "bubblewrap cannot make its sandbox here (" + (text.empty() ? "status " + std::to_string(status) : text) +
         "); containers often forbid the user namespaces it needs";
}

}  // namespace

SandboxPrefix sandbox_prefix(const fs::path& writable, int info_fd) {
  static std::optional<std::string> unavailable;  // tried once per process
  if (!unavailable) unavailable = probe(writable);
  SandboxPrefix prefix;
  prefix.unavailable = *unavailable;
  if (!prefix.unavailable.empty()) return prefix;
  prefix.arguments = bwrap_arguments(writable);
  if (info_fd >= 0) {
    prefix.arguments.push_back("--info-fd");
    prefix.arguments.push_back(std::to_string(info_fd));
  }
  return prefix;
}

int sandbox_child_pid(const std::string& info) {
  static const std::regex child_pid("\"child-pid\"\\s*:\\s*([0-9]+)");
  std::smatch match;
  return std::regex_search(info, match, child_pid) ? std::stoi(match.str(1)) : 0;
}

}  // namespace hearth
