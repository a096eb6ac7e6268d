// The access log: one line per request, in lode's own format (docs/api.md):
//
//   2026-12-03T15:07:45.123Z 127.0.0.1 GET /api/v1/search 200 1534 2.41
//
// UTC time the response was ready (ms), client address, method, path,
// status, response bytes (head and body), milliseconds from the whole
// request to the whole response. The query string is never written: it
// holds the user's words, and the log must not copy the archive's secrets.
// Bytes outside printable ASCII, spaces and '%' in the method or path are
// written as %XX, so a line always has exactly seven fields; a request the
// server could not read shows "-" for both.
//
// Thread safety: write() may be called from any thread; lines never mix.
#pragma once

#include <chrono>
#include <cstdio>
#include <memory>
#include <mutex>
#include <string>
#include <string_view>

#include "lode/status.h"

namespace lode::server {

struct AccessEntry {
  std::string_view remote;
  std::string_view method;  // "" = unreadable request
  std::string_view path;
  int status = 0;
  std::size_t bytes = 0;
  std::chrono::microseconds elapsed{0};
};

// The line for `e` at `when`, without the newline.
std::string access_line(const AccessEntry& e, std::chrono::system_clock::time_point when);

class AccessLog {
 public:
  // "-" = standard error, "" = no log (write() does nothing), else the file
  // at `target`, created or appended to (IOError naming it otherwise).
  static Result<std::unique_ptr<AccessLog>> open(const std::string& target);
  ~AccessLog();
  AccessLog(const AccessLog&) = delete;
  AccessLog& operator=(const AccessLog&) = delete;

  bool enabled() const { return file_ != nullptr; }
  void write(const AccessEntry& e);

 private:
  AccessLog(std::FILE* file, bool owned) : file_(file), owned_(owned) {}
  std::FILE* file_;
  bool owned_;
  std::mutex mu_;
};

}  // namespace lode::server
