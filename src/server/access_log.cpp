#include "server/access_log.h"

#include <cerrno>
#include <cstring>
#include <ctime>

namespace lode::server {
namespace {

void append_escaped(std::string& out, std::string_view s) {
  if (s.empty()) {
    out += '-';
    return;
  }
  static constexpr char kHex[] = "0123456789ABCDEF";
  for (char ch : s) {
    auto u = static_cast<unsigned char>(ch);
    if (u > 0x20 && u < 0x7f && ch != '%') {
      out += ch;
    } else {
      out += '%';
      out += kHex[u >> 4];
      out += kHex[u & 15];
    }
  }
}

}  // namespace

std::string access_line(const AccessEntry& e, std::chrono::system_clock::time_point when) {
  using namespace std::chrono;
  const auto ms = duration_cast<milliseconds>(when.time_since_epoch()).count();
  const std::time_t secs = static_cast<std::time_t>(ms / 1000);
  std::tm tm{};
  gmtime_r(&secs, &tm);
  char stamp[64];
  std::snprintf(stamp, sizeof stamp, "%04d-%02d-%02dT%02d:%02d:%02d.%03dZ", tm.tm_year + 1900, tm.tm_mon + 1,
                tm.tm_mday, tm.tm_hour, tm.tm_min, tm.tm_sec, static_cast<int>(ms % 1000));
  std::string line = stamp;
  line += ' ';
  append_escaped(line, e.remote);
  line += ' ';
  append_escaped(line, e.method);
  line += ' ';
  append_escaped(line, e.method.empty() ? std::string_view{} : e.path);
  char tail[64];
  std::snprintf(tail, sizeof tail, " %d %zu %.2f", e.status, e.bytes, static_cast<double>(e.elapsed.count()) / 1000.0);
  return line + tail;
}

Result<std::unique_ptr<AccessLog>> AccessLog::open(const std::string& target) {
  if (target.empty()) return std::unique_ptr<AccessLog>(new AccessLog(nullptr, false));
  if (target == "-") return std::unique_ptr<AccessLog>(new AccessLog(stderr, false));
  std::FILE* f = std::fopen(target.c_str(), "a");
  if (!f) return Status::IOError("cannot open access log '" + target + "' for appending: " + std::strerror(errno));
  return std::unique_ptr<AccessLog>(new AccessLog(f, true));
}

AccessLog::~AccessLog() {
  if (owned_) std::fclose(file_);
}

void AccessLog::write(const AccessEntry& e) {
  if (!file_) return;
  std::string line = access_line(e, std::chrono::system_clock::now());
  line += '\n';
  std::lock_guard lock(mu_);
  // One write per line, flushed: a crash or kill loses no line, and a reader
  // of the file (tail -f, a test) sees each request as it ends.
  std::fwrite(line.data(), 1, line.size(), file_);
  std::fflush(file_);
}

}  // namespace lode::server
