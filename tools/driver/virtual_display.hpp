// An X display for VTK's off-screen rendering: the one in DISPLAY when it opens, else a
// private Xvfb started for the purpose and stopped when this object goes away.
#pragma once

#include <string>
#include <sys/types.h>

namespace hearth {

class VirtualDisplay {
 public:
  // Uses $DISPLAY if an X connection to it opens. Otherwise starts Xvfb (found on PATH)
  // on a display number it picks itself (-displayfd), points DISPLAY at it for this
  // process and waits until it accepts connections. Throws ReportUnavailable when there
  // is no usable display and Xvfb is not installed or does not start.
  explicit VirtualDisplay(const std::string& purpose);
  ~VirtualDisplay();  // stops the Xvfb it started and restores DISPLAY
  VirtualDisplay(const VirtualDisplay&) = delete;
  VirtualDisplay& operator=(const VirtualDisplay&) = delete;

  const std::string& name() const { return name_; }  // e.g. ":0" or ":17"
  bool started_xvfb() const { return server_ > 0; }

 private:
  std::string name_;
  std::string previous_;       // DISPLAY before, "" if unset
  bool had_previous_ = false;
  pid_t server_ = -1;
  void* hold_ = nullptr;       // an open X connection (Display*) kept while in use
};

// True when a display is usable or Xvfb can be found: a quick check made before a run
// with output.report, so that a missing Xvfb is reported before hours of solving.
bool display_possible(std::string& why_not);

}  // namespace hearth
