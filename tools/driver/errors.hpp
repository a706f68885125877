// Outcomes the command line maps to exit statuses (see docs/user-guide.md).
#pragma once

#include <stdexcept>
#include <string>

namespace hearth {

enum ExitStatus { exit_done = 0, exit_bad_input = 1, exit_solve_failed = 2, exit_internal = 3,
                  exit_interrupted = 130, exit_terminated = 143 };

// The solve did not converge; results marked unconverged were written.
class SolveFailed : public std::runtime_error {
 public:
  explicit SolveFailed(const std::string& message) : std::runtime_error(message) {}
};

// The report cannot be made here (no X display and no Xvfb to start one); the
// message says what to install. Exit status 1, like other problems of set-up or usage.
class ReportUnavailable : public std::runtime_error {
 public:
  explicit ReportUnavailable(const std::string& message) : std::runtime_error(message) {}
};

// SIGINT or SIGTERM arrived; what was complete is kept.
class Interrupted : public std::runtime_error {
 public:
  Interrupted(const std::string& message, int status) : std::runtime_error(message), status_(status) {}
  int status() const { return status_; }

 private:
  int status_;
};

// Installs handlers that only set a flag; stages call check_interrupt() between steps.
void install_interrupt_handlers();
void check_interrupt(const std::string& where);
bool interrupt_requested();

}  // namespace hearth
