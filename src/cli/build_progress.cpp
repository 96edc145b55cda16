#include "cli/build_progress.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <chrono>
#include <iostream>

#include "trace/build_estimate.hpp"

namespace lumtrap::cli {

BuildProgress::BuildProgress(std::string label, double estimated_seconds)
    : label_(std::move(label)), estimate_(estimated_seconds) {
  if (::isatty(2) == 1) thread_ = std::thread([this] { show(); });
}

BuildProgress::~BuildProgress() {
  if (!thread_.joinable()) return;
  {
    std::lock_guard<std::mutex> lock(mutex_);
    done_ = true;
  }
  wake_.notify_all();
  thread_.join();
}

void BuildProgress::show() {
  using clock = std::chrono::steady_clock;
  const auto start = clock::now();
  std::unique_lock<std::mutex> lock(mutex_);
  if (wake_.wait_for(lock, std::chrono::seconds(1), [this] { return done_; })) return;  // quick: nothing shown
  while (!done_) {
    const double elapsed = std::chrono::duration<double>(clock::now() - start).count();
    std::cerr << fmt::format("\r\x1b[K{}: {} (estimate: about {})", label_, format_seconds(elapsed),
                             format_seconds(estimate_))
              << std::flush;
    wake_.wait_for(lock, std::chrono::milliseconds(500), [this] { return done_; });
  }
  const double elapsed = std::chrono::duration<double>(clock::now() - start).count();
  std::cerr << fmt::format("\r\x1b[K{}: done in {}\n", label_, format_seconds(elapsed)) << std::flush;
}

}  // namespace lumtrap::cli
