// Clocks, memory, percentiles and child processes (see measure.h).
#include "measure.h"

#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <ctime>
#include <fstream>
#include <numeric>

namespace lode::bench {

double now_seconds() {
  return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count();
}

namespace {
double seconds(const timeval& tv) { return static_cast<double>(tv.tv_sec) + static_cast<double>(tv.tv_usec) / 1e6; }
}  // namespace

CpuTimes cpu_self() {
  rusage ru{};
  getrusage(RUSAGE_SELF, &ru);
  return {seconds(ru.ru_utime), seconds(ru.ru_stime)};
}

double thread_cpu_seconds() {
  timespec ts{};
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) + static_cast<double>(ts.tv_nsec) / 1e9;
}

Memory memory_self() {
  Memory m;
  std::ifstream in("/proc/self/status");
  std::string line;
  while (std::getline(in, line)) {
    if (line.rfind("VmRSS:", 0) == 0) m.rss_kib = std::atoll(line.c_str() + 6);
    if (line.rfind("VmHWM:", 0) == 0) m.hwm_kib = std::atoll(line.c_str() + 6);
  }
  rusage ru{};
  getrusage(RUSAGE_SELF, &ru);
  m.maxrss_kib = ru.ru_maxrss;
  return m;
}

std::int64_t rss_kib_now() {
  std::FILE* f = std::fopen("/proc/self/statm", "r");
  if (!f) return 0;
  long long size = 0, resident = 0;
  const int got = std::fscanf(f, "%lld %lld", &size, &resident);
  std::fclose(f);
  return got == 2 ? resident * (sysconf(_SC_PAGESIZE) / 1024) : 0;
}

Summary summarize(std::vector<double> v) {
  Summary s;
  s.n = v.size();
  if (v.empty()) return s;
  std::sort(v.begin(), v.end());
  auto rank = [&](double p) {
    auto k = static_cast<std::size_t>(std::ceil(p / 100.0 * static_cast<double>(v.size())));
    return v[std::clamp<std::size_t>(k, 1, v.size()) - 1];
  };
  s.mean = std::accumulate(v.begin(), v.end(), 0.0) / static_cast<double>(v.size());
  s.p50 = rank(50);
  s.p90 = rank(90);
  s.p99 = rank(99);
  s.max = v.back();
  return s;
}

ChildResult run_self(const std::vector<std::string>& args) {
  ChildResult r;
  int fds[2];
  if (pipe(fds) != 0) return r;
  std::fflush(nullptr);
  const pid_t pid = fork();
  if (pid < 0) {
    close(fds[0]);
    close(fds[1]);
    return r;
  }
  if (pid == 0) {
    dup2(fds[1], STDOUT_FILENO);
    close(fds[0]);
    close(fds[1]);
    std::vector<char*> argv;
    static char self[] = "/proc/self/exe";
    argv.push_back(self);
    for (auto& a : args) argv.push_back(const_cast<char*>(a.c_str()));
    argv.push_back(nullptr);
    execv(self, argv.data());
    std::fprintf(stderr, "bench: cannot re-run /proc/self/exe: %s\n", std::strerror(errno));
    _exit(127);
  }
  close(fds[1]);
  char buf[4096];
  ssize_t got;
  while ((got = read(fds[0], buf, sizeof buf)) > 0 || (got < 0 && errno == EINTR))
    if (got > 0) r.out.append(buf, static_cast<std::size_t>(got));
  close(fds[0]);
  int status = 0;
  rusage ru{};
  while (wait4(pid, &status, 0, &ru) < 0 && errno == EINTR) {
  }
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.cpu = {seconds(ru.ru_utime), seconds(ru.ru_stime)};
  r.maxrss_kib = ru.ru_maxrss;
  return r;
}

std::uint64_t file_bytes(const std::string& path) {
  struct stat st {};
  if (stat(path.c_str(), &st) != 0) return 0;
  return static_cast<std::uint64_t>(st.st_size);
}

}  // namespace lode::bench
