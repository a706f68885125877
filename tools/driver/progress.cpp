// Progress lines on stderr.
#include "tools/driver/progress.hpp"

#include <cstdio>

namespace hearth {

double Progress::elapsed() const {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
}

void Progress::say(const std::string& line) const {
  if (quiet_) return;
  std::fprintf(stderr, "[%7.2f s] %s\n", elapsed(), line.c_str());
}

void Progress::always(const std::string& line) const { std::fprintf(stderr, "%s\n", line.c_str()); }

}  // namespace hearth
