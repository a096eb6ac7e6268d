// The single-writer lock: an flock(2) on "<index>.lock" held for the writer's
// lifetime. The kernel drops it when the process dies, so a crash never leaves
// a stale lock; the file itself stays and holds the last holder's pid.
#pragma once

#include <string>

#include "lode/status.h"

namespace lode {

class WriterLock {
 public:
  // Busy naming the holder's pid when another process holds it.
  static Result<WriterLock> acquire(const std::string& index_path);
  WriterLock(WriterLock&& o) noexcept : fd_(o.fd_) { o.fd_ = -1; }
  WriterLock(const WriterLock&) = delete;
  ~WriterLock();

 private:
  explicit WriterLock(int fd) : fd_(fd) {}
  int fd_ = -1;
};

}  // namespace lode
