#pragma once
// How a run went, apart from its physics: threads, host, setup and trace
// time, peak memory. Measured where the run happens and put into the
// summary in one place (the rates photons/s and interactions/s follow).
#include <string>

#include <nlohmann/json.hpp>

#include "io/summary.hpp"

namespace lumtrap {

struct RunFacts {
  int threads = 0;
  std::string host;
  double setup_seconds = 0;
  double trace_seconds = 0;
  double peak_memory_MB = 0;
  bool resumed_from_checkpoint = false;
};

/// This process's host name and peak resident memory so far.
std::string host_name();
double peak_memory_MB();

/// Copies the facts into the summary and derives photons/s and
/// interactions/s from the summary's photons and interactions.
void apply_run_facts(Summary& s, const RunFacts& f);

/// Facts of parts of a run (split over jobs) as one: times added, peak
/// memory the largest, threads and host of the first part.
RunFacts combine_run_facts(const RunFacts& a, const RunFacts& b);

nlohmann::json run_facts_json(const RunFacts& f);
RunFacts run_facts_from_json(const nlohmann::json& j);

}  // namespace lumtrap
