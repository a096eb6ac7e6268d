#include "index/lock.h"

#include <fcntl.h>
#include <sys/file.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

namespace lode {

Result<WriterLock> WriterLock::acquire(const std::string& index_path) {
  std::string path = index_path + ".lock";
  int fd = ::open(path.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0644);
  if (fd < 0) return Status::IOError(path + ": cannot open lock file: " + std::strerror(errno));
  if (::flock(fd, LOCK_EX | LOCK_NB) != 0) {
    int err = errno;
    char buf[32] = {};
    ssize_t n = ::pread(fd, buf, sizeof buf - 1, 0);
    ::close(fd);
    if (err == EWOULDBLOCK) {
      std::string pid = n > 0 ? std::string(buf, static_cast<std::size_t>(n)) : "unknown";
      while (!pid.empty() && (pid.back() == '\n' || pid.back() == ' ')) pid.pop_back();
      return Status::Busy("index " + index_path + " is being written by another lode process (pid " +
                          pid + "); wait for it to finish");
    }
    return Status::IOError(path + ": cannot lock: " + std::strerror(err));
  }
  std::string pid = std::to_string(::getpid()) + "\n";
  if (::ftruncate(fd, 0) == 0) {
    [[maybe_unused]] ssize_t w = ::pwrite(fd, pid.data(), pid.size(), 0);
  }
  return WriterLock(fd);
}

WriterLock::~WriterLock() {
  if (fd_ >= 0) {
    ::flock(fd_, LOCK_UN);
    ::close(fd_);
  }
}

}  // namespace lode
