// A small process pool: posix_spawn of /proc/self/exe with stderr to a log file per
// level, polled with waitpid so that interrupts can be passed on.
#include "tools/driver/level_runner.hpp"

#include <fcntl.h>
#include <signal.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <optional>
#include <sstream>
#include <stdexcept>

#include "io/input_error.hpp"
#include "tools/driver/errors.hpp"

extern char** environ;

namespace hearth {

namespace fs = std::filesystem;

namespace {

using Clock = std::chrono::steady_clock;

struct Running {
  std::size_t index;
  pid_t pid;
  double memory;
  Clock::time_point start;
  fs::path log;
};

struct Failure {
  std::size_t index;
  int status;  // wait status; -1 when there was none
  fs::path log;
};

// A private folder for the levels' messages, removed with everything in it.
class LogFolder {
 public:
  LogFolder() {
    char pattern[] = "/tmp/hearth-study-XXXXXX";
    if (!mkdtemp(pattern)) throw std::runtime_error("cannot create a temporary folder for the study's levels");
    path_ = pattern;
  }
  ~LogFolder() {
    std::error_code ignored;
    fs::remove_all(path_, ignored);
  }
  LogFolder(const LogFolder&) = delete;
  LogFolder& operator=(const LogFolder&) = delete;
  const fs::path& path() const { return path_; }

 private:
  fs::path path_;
};

std::string gigabytes(double bytes) {
  char text[32];
  std::snprintf(text, sizeof text, "%.1f GB", bytes / 1e9);
  return text;
}

pid_t start_level(const std::string& exe, const LevelRun& level, const fs::path& log) {
  std::vector<std::string> args = {exe};
  args.insert(args.end(), level.arguments.begin(), level.arguments.end());
  std::vector<char*> argv;
  for (auto& a : args) argv.push_back(a.data());
  argv.push_back(nullptr);
  posix_spawn_file_actions_t actions;
  posix_spawn_file_actions_init(&actions);
  // stderr (progress, warnings, the error) into the log; stdout there too.
  posix_spawn_file_actions_addopen(&actions, 2, log.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  posix_spawn_file_actions_adddup2(&actions, 2, 1);
  pid_t pid = 0;
  const int failed = posix_spawn(&pid, exe.c_str(), &actions, nullptr, argv.data(), environ);
  posix_spawn_file_actions_destroy(&actions);
  if (failed != 0) throw std::runtime_error("cannot start " + exe + " for " + level.label);
  return pid;
}

// The level's own words: its stderr, without the "error: " each message starts with.
std::string messages_of(const fs::path& log) {
  std::ifstream in(log);
  std::string line, text;
  while (std::getline(in, line)) {
    if (line.rfind("error: ", 0) == 0) line = line.substr(7);
    if (!line.empty()) text += (text.empty() ? "" : "\n") + line;
  }
  return text;
}

[[noreturn]] void report_failure(const LevelRun& level, const Failure& failure) {
  const std::string text = messages_of(failure.log);
  const std::string said = text.empty() ? std::string() : ": " + text;
  if (failure.status == -1) throw std::runtime_error("lost track of the process of " + level.label + said);
  if (WIFEXITED(failure.status)) {
    const int status = WEXITSTATUS(failure.status);
    if (status == exit_bad_input) throw InputError(level.label + said);
    if (status == exit_solve_failed) throw SolveFailed(level.label + said);
    if (status == exit_interrupted || status == exit_terminated)
      throw Interrupted(level.label + " was stopped" + said + "; the finished levels are kept", status);
    throw std::runtime_error(level.label + " failed (exit status " + std::to_string(status) + ")" + said);
  }
  const int signal = WIFSIGNALED(failure.status) ? WTERMSIG(failure.status) : 0;
  throw std::runtime_error(level.label + " died on signal " + std::to_string(signal) + " (" + strsignal(signal) + ")" +
                           said);
}

}  // namespace

double available_memory() {
  std::ifstream in("/proc/meminfo");
  std::string key, unit;
  double kb = 0;
  while (in >> key >> kb >> unit)
    if (key == "MemAvailable:") return kb * 1024.0;
  return 0.0;
}

void run_levels(const std::vector<LevelRun>& levels, const LevelScheduling& scheduling) {
  if (levels.empty()) return;
  const std::string exe = fs::read_symlink("/proc/self/exe").string();
  const LogFolder logs;
  const double budget = 0.9 * available_memory();  // 0: unknown, no limit
  const std::size_t jobs = static_cast<std::size_t>(std::max(1, scheduling.jobs));
  std::vector<Running> running;
  std::optional<Failure> failure;
  std::optional<std::string> refusal;
  std::size_t next = 0;
  bool forwarded = false;

  for (;;) {
    while (!failure && !refusal && !interrupt_requested() && next < levels.size() && running.size() < jobs) {
      MemoryNeed need = scheduling.memory_needed ? scheduling.memory_needed(next) : MemoryNeed{};
      if (std::isnan(need.bytes)) {
        if (!running.empty()) break;  // an earlier level will tell
        need.bytes = 0.0;
      }
      double in_use = 0.0;
      for (const Running& r : running) in_use += r.memory;
      if (budget > 0 && need.bytes > budget) {
        refusal = levels[next].label + " needs about " + gigabytes(need.bytes) +
                  (need.basis.empty() ? "" : " for " + need.basis) + ", but " + gigabytes(budget / 0.9) +
                  " are available; use fewer --levels, a smaller --ratio or a larger mesh.size";
        break;
      }
      if (budget > 0 && in_use + need.bytes > budget) break;  // waits for memory
      const fs::path log = logs.path() / ("level_" + std::to_string(next) + ".log");
      running.push_back({next, start_level(exe, levels[next], log), need.bytes, Clock::now(), log});
      ++next;
    }
    if (running.empty()) break;

    if (interrupt_requested() && !forwarded) {
      for (const Running& r : running) kill(r.pid, SIGTERM);
      forwarded = true;
    }
    bool any_done = false;
    for (std::size_t i = 0; i < running.size();) {
      int status = 0;
      const pid_t done = waitpid(running[i].pid, &status, WNOHANG);
      if (done == 0 || (done < 0 && errno == EINTR)) {
        ++i;
        continue;
      }
      const Running r = running[i];
      running.erase(running.begin() + static_cast<std::ptrdiff_t>(i));
      any_done = true;
      if (done < 0) status = -1;  // the process is gone without a status (should not happen)
      const bool ok = status != -1 && WIFEXITED(status) && WEXITSTATUS(status) == 0;
      if (ok) {
        if (scheduling.finished)
          scheduling.finished(r.index, std::chrono::duration<double>(Clock::now() - r.start).count());
      } else if (!failure && !interrupt_requested()) {
        failure = Failure{r.index, status, r.log};
      }
    }
    if (!any_done) usleep(20000);
  }
  check_interrupt("between levels; the finished levels are kept");
  if (failure) report_failure(levels[failure->index], *failure);
  if (refusal) throw InputError(*refusal);
}

}  // namespace hearth
