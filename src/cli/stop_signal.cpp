#include "cli/stop_signal.hpp"

#include <csignal>

namespace lumtrap::cli {

namespace {
std::atomic<bool> g_stop{false};
extern "C" void on_stop_signal(int) { g_stop.store(true); }
}  // namespace

StopOnSignal::StopOnSignal() {
  g_stop.store(false);
  std::signal(SIGINT, on_stop_signal);
  std::signal(SIGTERM, on_stop_signal);
}

StopOnSignal::~StopOnSignal() {
  std::signal(SIGINT, SIG_DFL);
  std::signal(SIGTERM, SIG_DFL);
}

const std::atomic<bool>* StopOnSignal::flag() const { return &g_stop; }

bool StopOnSignal::requested() const { return g_stop.load(); }

}  // namespace lumtrap::cli
