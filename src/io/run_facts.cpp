#include "io/run_facts.hpp"

#include <sys/resource.h>
#include <unistd.h>

#include <algorithm>

namespace lumtrap {

std::string host_name() {
  char buf[256] = {};
  if (::gethostname(buf, sizeof buf - 1) != 0) return "?";
  return buf;
}

double peak_memory_MB() {
  rusage ru{};
  ::getrusage(RUSAGE_SELF, &ru);
  return double(ru.ru_maxrss) / 1024.0;  // ru_maxrss is in KiB on Linux
}

void apply_run_facts(Summary& s, const RunFacts& f) {
  s.threads = f.threads;
  s.host = f.host;
  s.setup_seconds = f.setup_seconds;
  s.trace_seconds = f.trace_seconds;
  s.peak_memory_MB = f.peak_memory_MB;
  s.resumed_from_checkpoint = f.resumed_from_checkpoint;
  s.photons_per_second = f.trace_seconds > 0 ? double(s.photons) / f.trace_seconds : 0.0;
  s.interactions_per_second = f.trace_seconds > 0 ? double(s.interactions) / f.trace_seconds : 0.0;
}

RunFacts combine_run_facts(const RunFacts& a, const RunFacts& b) {
  RunFacts c = a;
  c.setup_seconds += b.setup_seconds;
  c.trace_seconds += b.trace_seconds;
  c.peak_memory_MB = std::max(a.peak_memory_MB, b.peak_memory_MB);
  c.resumed_from_checkpoint = a.resumed_from_checkpoint || b.resumed_from_checkpoint;
  return c;
}

nlohmann::json run_facts_json(const RunFacts& f) {
  return {{"threads", f.threads},
          {"host", f.host},
          {"setup_seconds", f.setup_seconds},
          {"trace_seconds", f.trace_seconds},
          {"peak_memory_MB", f.peak_memory_MB},
          {"resumed_from_checkpoint", f.resumed_from_checkpoint}};
}

RunFacts run_facts_from_json(const nlohmann::json& j) {
  RunFacts f;
  f.threads = j.value("threads", 0);
  f.host = j.value("host", std::string());
  f.setup_seconds = j.value("setup_seconds", 0.0);
  f.trace_seconds = j.value("trace_seconds", 0.0);
  f.peak_memory_MB = j.value("peak_memory_MB", 0.0);
  f.resumed_from_checkpoint = j.value("resumed_from_checkpoint", false);
  return f;
}

}  // namespace lumtrap
