// Progress: one line per stage on stderr, with the elapsed time; silent with --quiet.
#pragma once

#include <chrono>
#include <string>

namespace hearth {

class Progress {
 public:
  explicit Progress(bool quiet) : quiet_(quiet), start_(std::chrono::steady_clock::now()) {}
  void say(const std::string& line) const;   // "[  1.2 s] line"
  void always(const std::string& line) const;  // printed even when quiet (warnings)
  double elapsed() const;
  bool quiet() const { return quiet_; }

 private:
  bool quiet_;
  std::chrono::steady_clock::time_point start_;
};

}  // namespace hearth
