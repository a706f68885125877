// X display check with Xlib, Xvfb started with fork/exec and -displayfd (the server
// picks a free display number and writes it to the pipe when it is ready).
#include "tools/driver/virtual_display.hpp"

#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <sys/prctl.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <sstream>
#include <thread>
#include <vector>

#include "tools/driver/errors.hpp"

// Last: Xlib defines macros (Status, None, Bool) that would clash with names above.
#include <X11/Xlib.h>

namespace hearth {

namespace {

bool display_opens(const std::string& name) {
  if (name.empty()) return false;
  Display* display = XOpenDisplay(name.c_str());
  if (!display) return false;
  XCloseDisplay(display);
  return true;
}

std::string find_on_path(const std::string& program) {
  const char* path = std::getenv("PATH");
  std::stringstream folders(path ? path : "/usr/bin:/bin");
  std::string folder;
  while (std::getline(folders, folder, ':')) {
    if (folder.empty()) continue;
    const std::string candidate = folder + "/" + program;
    if (::access(candidate.c_str(), X_OK) == 0) return candidate;
  }
  return "";
}

std::string current_display() {
  const char* d = std::getenv("DISPLAY");
  return d ? d : "";
}

const char* const kInstallHint =
    "install Debian's xvfb package (apt-get install xvfb; tools/setup-deps.sh does it) or run hearth where an X "
    "display is set in DISPLAY";

std::string tail_of(const std::string& file) {
  std::ifstream in(file);
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  if (text.size() > 600) text = "..." + text.substr(text.size() - 600);
  while (!text.empty() && (text.back() == '\n' || text.back() == ' ')) text.pop_back();
  return text;
}

}  // namespace

bool display_possible(std::string& why_not) {
  const std::string display = current_display();
  if (display_opens(display) || !find_on_path("Xvfb").empty()) return true;
  why_not = (display.empty() ? std::string("no X display is set (DISPLAY is empty)")
                             : "the X display DISPLAY=" + display + " does not open") +
            " and Xvfb is not installed, so the report's pictures cannot be rendered; " + kInstallHint;
  return false;
}

VirtualDisplay::VirtualDisplay(const std::string& purpose) {
  const std::string display = current_display();
  had_previous_ = std::getenv("DISPLAY") != nullptr;
  previous_ = display;
  if (display_opens(display)) {
    name_ = display;
    hold_ = XOpenDisplay(name_.c_str());  // a client for as long as we render: no server reset meanwhile
    return;
  }
  const std::string xvfb = find_on_path("Xvfb");
  if (xvfb.empty())
    throw ReportUnavailable((display.empty() ? std::string("no X display is set (DISPLAY is empty)")
                                             : "the X display DISPLAY=" + display + " does not open") +
                            " and Xvfb is not installed, so " + purpose + " cannot be rendered; " + kInstallHint);

  char log_name[] = "/tmp/hearth-xvfb-XXXXXX";
  const int log = ::mkstemp(log_name);
  int ready[2];
  if (log < 0 || ::pipe(ready) != 0) throw ReportUnavailable(std::string("cannot start Xvfb: ") + std::strerror(errno));
  ::fcntl(ready[0], F_SETFD, FD_CLOEXEC);
  const std::string fd_text = std::to_string(ready[1]);
  // -noreset: by default Xvfb resets when its last client leaves, and a connection made
  // during the reset fails (VTK then aborts the program).
  std::vector<std::string> args = {xvfb,     "-displayfd", fd_text, "-screen", "0",
                                   "1920x1200x24", "-nolisten", "tcp",    "-noreset"};
  std::vector<char*> argv;
  for (auto& a : args) argv.push_back(a.data());
  argv.push_back(nullptr);

  const pid_t child = ::fork();
  if (child == 0) {  // only async-signal-safe calls until exec
    ::prctl(PR_SET_PDEATHSIG, SIGTERM);  // never outlive hearth
    ::close(ready[0]);
    ::dup2(log, 1);
    ::dup2(log, 2);
    ::execv(argv[0], argv.data());
    ::_exit(127);
  }
  ::close(ready[1]);
  ::close(log);
  if (child < 0) {
    ::close(ready[0]);
    ::unlink(log_name);
    throw ReportUnavailable(std::string("cannot start Xvfb: ") + std::strerror(errno));
  }
  server_ = child;

  // Xvfb writes the display number and a newline once it accepts connections.
  std::string number;
  const auto deadline = std::chrono::steady_clock::now() + std::chrono::seconds(20);
  while (std::chrono::steady_clock::now() < deadline) {
    pollfd p{ready[0], POLLIN, 0};
    if (::poll(&p, 1, 200) <= 0) continue;
    char c = 0;
    const ssize_t got = ::read(ready[0], &c, 1);
    if (got <= 0 || c == '\n') break;
    number += c;
  }
  ::close(ready[0]);
  name_ = ":" + number;
  if (number.empty() || !(::setenv("DISPLAY", name_.c_str(), 1) == 0 && display_opens(name_))) {
    const std::string log_text = tail_of(log_name);
    ::unlink(log_name);
    ::kill(server_, SIGTERM);
    ::waitpid(server_, nullptr, 0);
    server_ = -1;
    if (had_previous_) ::setenv("DISPLAY", previous_.c_str(), 1);
    else ::unsetenv("DISPLAY");
    throw ReportUnavailable("Xvfb (" + xvfb + ") did not start a display, so " + purpose + " cannot be rendered" +
                            (log_text.empty() ? std::string() : "; it said: " + log_text));
  }
  ::unlink(log_name);
  hold_ = XOpenDisplay(name_.c_str());
}

VirtualDisplay::~VirtualDisplay() {
  if (hold_) XCloseDisplay(static_cast<Display*>(hold_));
  if (server_ > 0) {
    ::kill(server_, SIGTERM);
    ::waitpid(server_, nullptr, 0);
    if (had_previous_) ::setenv("DISPLAY", previous_.c_str(), 1);
    else ::unsetenv("DISPLAY");
  }
}

}  // namespace hearth
