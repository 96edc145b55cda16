#include "cli/thread_limit.hpp"

#include <fmt/format.h>
#include <tbb/global_control.h>
#include <tbb/info.h>

#include <iostream>

namespace lumtrap::cli {

int available_cores() { return tbb::info::default_concurrency(); }

ThreadLimit::ThreadLimit(int requested, const std::string& what) {
  const int cores = available_cores();
  threads_ = requested > 0 ? requested : cores;
  if (threads_ > cores) {
    std::cerr << fmt::format("lumtrap: warning: {} {} is more than the {} cores of this machine; using {}\n", what,
                             requested, cores, cores);
    threads_ = cores;
  }
  control_ = std::make_shared<tbb::global_control>(tbb::global_control::max_allowed_parallelism,
                                                   std::size_t(threads_));
}

ThreadLimit::~ThreadLimit() = default;

}  // namespace lumtrap::cli
