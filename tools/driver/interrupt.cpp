// SIGINT / SIGTERM set a flag; the driver stops between stages and keeps what is whole.
#include <csignal>

#include "tools/driver/errors.hpp"

namespace hearth {

namespace {
volatile std::sig_atomic_t received_signal = 0;
extern "C" void on_signal(int signal) { received_signal = signal; }
}  // namespace

void install_interrupt_handlers() {
  std::signal(SIGINT, on_signal);
  std::signal(SIGTERM, on_signal);
}

bool interrupt_requested() { return received_signal != 0; }

void check_interrupt(const std::string& where) {
  if (received_signal == SIGINT) throw Interrupted("interrupted (SIGINT) " + where, exit_interrupted);
  if (received_signal == SIGTERM) throw Interrupted("terminated (SIGTERM) " + where, exit_terminated);
}

}  // namespace hearth
