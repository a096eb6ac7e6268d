// bench/measure.h — clocks, CPU time, memory high-water marks, percentiles
// and child processes for the benchmarks.
//
// Memory: VmHWM from /proc/self/status is the peak resident set of this
// process; ru_maxrss from getrusage is the same figure as the kernel's
// accounting keeps it (both KiB). Each measured phase runs in a fresh process
// (run_self) so one phase's peak never hides in another's.
//
// Thread safety: free functions; run_self forks and must not be called while
// other threads run.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace lode::bench {

double now_seconds();  // steady clock

struct CpuTimes {
  double user = 0, sys = 0;  // seconds
};
CpuTimes cpu_self();
// CPU time of the calling thread (CLOCK_THREAD_CPUTIME_ID, ns resolution):
// unlike wall time, it does not count time spent waiting for a busy core.
double thread_cpu_seconds();

struct Memory {
  std::int64_t rss_kib = 0;   // VmRSS: resident now
  std::int64_t hwm_kib = 0;   // VmHWM: peak resident
  std::int64_t maxrss_kib = 0;  // getrusage ru_maxrss
};
// Reads /proc/self/status (zeros where unavailable) and getrusage.
Memory memory_self();
// VmRSS alone, cheap enough to sample during a run (/proc/self/statm).
std::int64_t rss_kib_now();

// Latency summary. Percentiles use the nearest-rank method: the p-th
// percentile of n sorted values is value number ceil(p/100 * n).
struct Summary {
  std::size_t n = 0;
  double mean = 0, p50 = 0, p90 = 0, p99 = 0, max = 0;
};
Summary summarize(std::vector<double> values);

struct ChildResult {
  int exit_code = -1;       // -1: did not start or was killed by a signal
  std::string out;          // its standard output
  CpuTimes cpu;             // its CPU time (wait4 rusage)
  std::int64_t maxrss_kib = 0;
};
// Runs this program again (/proc/self/exe) with `args` (argv[1..]), standard
// error passed through, standard output captured. Waits for it.
ChildResult run_self(const std::vector<std::string>& args);

// Bytes of a file, 0 if it does not exist.
std::uint64_t file_bytes(const std::string& path);

}  // namespace lode::bench
