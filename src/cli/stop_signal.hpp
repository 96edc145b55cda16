#pragma once
// Ctrl-C and SIGTERM as a stop request: while a StopOnSignal lives, the two
// signals set a flag that long-running work polls (finished photons are
// kept, the command ends with exit code 130); afterwards the default
// handlers are back.
#include <atomic>

namespace lumtrap::cli {

class StopOnSignal {
 public:
  StopOnSignal();
  ~StopOnSignal();
  StopOnSignal(const StopOnSignal&) = delete;
  StopOnSignal& operator=(const StopOnSignal&) = delete;

  /// Set by SIGINT or SIGTERM.
  const std::atomic<bool>* flag() const;
  bool requested() const;
};

}  // namespace lumtrap::cli
