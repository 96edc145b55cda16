#pragma once
// A progress line on stderr while texture meshes and ray-tracing structures
// are built (which can take minutes for large tiles): shown only when stderr
// is a terminal and only once the build has taken more than a second; it
// counts the seconds against the estimate (src/trace/build_estimate.hpp)
// and is cleared when the build ends.
#include <condition_variable>
#include <mutex>
#include <string>
#include <thread>

namespace lumtrap::cli {

class BuildProgress {
 public:
  /// `label`, e.g. "lumtrap run: building the textures"; `estimated_seconds` from the estimate.
  BuildProgress(std::string label, double estimated_seconds);
  ~BuildProgress();
  BuildProgress(const BuildProgress&) = delete;
  BuildProgress& operator=(const BuildProgress&) = delete;

 private:
  void show();

  std::string label_;
  double estimate_ = 0;
  std::mutex mutex_;
  std::condition_variable wake_;
  bool done_ = false;
  std::thread thread_;
};

}  // namespace lumtrap::cli
