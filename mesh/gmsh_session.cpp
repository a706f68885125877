// GmshSession: the one owner of Gmsh's global state and its messages.
#include "mesh/gmsh_session.hpp"

#include <gmsh.h>

#include <unistd.h>

#include <cctype>
#include <cstdlib>
#include <csignal>
#include <iostream>
#include <stdexcept>

#include "mesh/mesh_error.hpp"

namespace hearth {
namespace {

std::mutex& gmsh_mutex() {
  static std::mutex mutex;
  return mutex;
}

thread_local bool session_in_this_thread = false;

bool starts_with(const std::string& text, const std::string& prefix) { return text.compare(0, prefix.size(), prefix) == 0; }

// Restores the handlers of the signals the driver relies on (SIGINT, SIGTERM) in case
// Gmsh installs its own.
class SignalHandlersKept {
 public:
  SignalHandlersKept() {
    sigaction(SIGINT, nullptr, &interrupt_);
    sigaction(SIGTERM, nullptr, &terminate_);
  }
  ~SignalHandlersKept() {
    sigaction(SIGINT, &interrupt_, nullptr);
    sigaction(SIGTERM, &terminate_, nullptr);
  }
  SignalHandlersKept(const SignalHandlersKept&) = delete;
  SignalHandlersKept& operator=(const SignalHandlersKept&) = delete;

 private:
  struct sigaction interrupt_ {};
  struct sigaction terminate_ {};
};

}  // namespace

GmshSession::GmshSession(Progress progress) : progress_(std::move(progress)) {
  if (session_in_this_thread) throw std::logic_error("GmshSession: a Gmsh session is already open in this thread");
  lock_ = std::unique_lock<std::mutex>(gmsh_mutex());
  session_in_this_thread = true;
  try {
    SignalHandlersKept keep_handlers;
    gmsh::initialize(0, nullptr, /*readConfigFiles=*/false);
    gmsh::option::setNumber("General.Terminal", 0);
    // Gmsh 4.8 appends to its message log without a lock, also from its meshing
    // threads: keep the log to warnings and errors, which are rare, so that threads
    // do not write it at once.
    gmsh::option::setNumber("General.Verbosity", 2);
    gmsh::logger::start();
  } catch (...) {
    session_in_this_thread = false;
    throw std::runtime_error("Gmsh could not be initialised");
  }
}

GmshSession::~GmshSession() {
  try {
    gmsh::logger::stop();
    SignalHandlersKept keep_handlers;
    gmsh::finalize();
  } catch (...) {
    // Finalisation errors leave nothing the caller could act on.
  }
  session_in_this_thread = false;
}

std::vector<std::string> GmshSession::log() const {
  std::vector<std::string> lines;
  gmsh::logger::get(lines);
  return lines;
}

void GmshSession::forward_messages() {
  const std::vector<std::string> lines = log();
  for (; forwarded_ < lines.size(); ++forwarded_) {
    const std::string& line = lines[forwarded_];
    if (starts_with(line, "Warning: ")) report("gmsh warning: " + line.substr(9));
    else if (starts_with(line, "Error: ")) report("gmsh error: " + line.substr(7));
  }
}

std::vector<std::string> GmshSession::errors() const {
  std::vector<std::string> found;
  for (const std::string& line : log())
    if (starts_with(line, "Error: ")) found.push_back(line.substr(7));
  return found;
}

void GmshSession::guarded(const std::string& context, const std::function<void()>& action) {
  bool failed = false;
  std::string failure;
  try {
    action();
  } catch (const std::string& message) {
    failed = true;
    failure = message;
  } catch (const MeshError&) {
    forward_messages();
    throw;
  } catch (const std::exception& error) {
    failed = true;
    failure = error.what();
  }
  forward_messages();
  if (!failed) return;
  if (failure.empty()) {
    const std::vector<std::string> logged = errors();
    failure = logged.empty() ? "Gmsh reported an unspecified error" : logged.back();
  }
  throw MeshError(context + ": " + failure);
}

void GmshSession::report(const std::string& line) const {
  if (progress_) progress_(line);
}

namespace {
// An anonymous scratch file in $TMPDIR (else /tmp): std::tmpfile() always uses /tmp,
// which is read-only inside the meshing sandbox.
std::FILE* scratch_file() {
  const char* folder = std::getenv("TMPDIR");
  std::string pattern = std::string(folder && *folder ? folder : "/tmp") + "/hearth-capture-XXXXXX";
  const int fd = mkstemp(pattern.data());
  if (fd < 0) return nullptr;
  unlink(pattern.c_str());
  return fdopen(fd, "w+");
}
}  // namespace

TerminalCapture::TerminalCapture() {
  file_ = scratch_file();
  if (file_ == nullptr) return;  // nothing captured; output stays on the terminal
  std::cout.flush();
  std::cerr.flush();
  std::fflush(stdout);
  std::fflush(stderr);
  saved_stdout_ = dup(STDOUT_FILENO);
  saved_stderr_ = dup(STDERR_FILENO);
  dup2(fileno(file_), STDOUT_FILENO);
  dup2(fileno(file_), STDERR_FILENO);
}

TerminalCapture::~TerminalCapture() {
  restore();
  if (file_ != nullptr) std::fclose(file_);
}

void TerminalCapture::restore() {
  if (saved_stdout_ < 0) return;
  std::cout.flush();
  std::cerr.flush();
  std::fflush(stdout);
  std::fflush(stderr);
  dup2(saved_stdout_, STDOUT_FILENO);
  dup2(saved_stderr_, STDERR_FILENO);
  close(saved_stdout_);
  close(saved_stderr_);
  saved_stdout_ = saved_stderr_ = -1;
}

std::vector<std::string> TerminalCapture::finish() {
  restore();
  std::vector<std::string> lines;
  if (file_ == nullptr) return lines;
  std::rewind(file_);
  std::string line;
  auto keep = [&] {
    const auto first = line.find_first_not_of(" \t*");
    const auto last = line.find_last_not_of(" \t*\r");
    if (first != std::string::npos) lines.push_back(line.substr(first, last - first + 1));
    line.clear();
  };
  bool in_escape = false;
  for (int c = std::fgetc(file_); c != EOF; c = std::fgetc(file_)) {
    if (in_escape) {
      in_escape = !std::isalpha(c);  // an escape sequence ends with a letter
    } else if (c == 0x1b) {
      in_escape = true;
    } else if (c == '\n') {
      keep();
    } else {
      line += static_cast<char>(c);
    }
  }
  keep();
  return lines;
}

}  // namespace hearth
