#pragma once
// How many threads a command traces with: the number asked for (0 = every
// core), never more than the machine's cores (more would only slow the run;
// a warning says so). While a ThreadLimit lives, TBB uses that many threads.
// Results never depend on the number of threads.
#include <memory>
#include <string>

namespace lumtrap::cli {

class ThreadLimit {
 public:
  /// `requested` 0 = all cores; `what` names the option in the warning.
  ThreadLimit(int requested, const std::string& what);
  ~ThreadLimit();
  int threads() const { return threads_; }

 private:
  int threads_ = 1;
  std::shared_ptr<void> control_;
};

/// Cores available to this process.
int available_cores();

}  // namespace lumtrap::cli
