// Test helpers for the ingest suite: a fresh temporary folder per test,
// removed again at the end, and a way to run code without root privileges.
#pragma once

#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <functional>
#include <optional>
#include <stdexcept>
#include <string>

namespace lode::testing {

class TempDir {
 public:
  TempDir() {
    std::string tmpl = (std::filesystem::temp_directory_path() / "lode-ingest-XXXXXX").string();
    if (::mkdtemp(tmpl.data()) == nullptr) throw std::runtime_error("mkdtemp failed");
    root_ = tmpl;
  }
  ~TempDir() {
    std::error_code ec;
    // Restore permissions a test may have taken away, then remove everything.
    for (auto it = std::filesystem::recursive_directory_iterator(
             root_, std::filesystem::directory_options::skip_permission_denied, ec);
         !ec && it != std::filesystem::recursive_directory_iterator(); it.increment(ec)) {
      if (it->is_directory(ec) && !it->is_symlink(ec)) ::chmod(it->path().c_str(), 0755);
    }
    std::filesystem::remove_all(root_, ec);
  }
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;

  const std::filesystem::path& root() const { return root_; }
  std::string path(const std::string& rel) const { return (root_ / rel).string(); }

  // Writes `bytes` to root/rel, creating folders as needed; returns the path.
  std::string write(const std::string& rel, const std::string& bytes) const {
    const std::filesystem::path p = root_ / rel;
    std::filesystem::create_directories(p.parent_path());
    std::ofstream out(p, std::ios::binary | std::ios::trunc);
    out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
    if (!out) throw std::runtime_error("cannot write " + p.string());
    return p.string();
  }

  std::string mkdir(const std::string& rel) const {
    std::filesystem::create_directories(root_ / rel);
    return path(rel);
  }

 private:
  std::filesystem::path root_;
};

// Runs `fn` in a child process that has dropped root privileges (uid/gid
// 65534, "nobody" on Debian), and returns the string it produced. Returns
// nullopt when privileges cannot be dropped (the suite is not root, or the
// system refuses). Used for permission tests, which root would pass through.
inline std::optional<std::string> run_unprivileged(const std::function<std::string()>& fn) {
  if (::geteuid() != 0) return std::nullopt;
  int fds[2];
  if (::pipe(fds) != 0) return std::nullopt;
  const pid_t pid = ::fork();
  if (pid < 0) return std::nullopt;
  if (pid == 0) {
    ::close(fds[0]);
    if (::setgid(65534) != 0 || ::setuid(65534) != 0) ::_exit(2);
    const std::string out = fn();
    std::size_t done = 0;
    while (done < out.size()) {
      const ssize_t n = ::write(fds[1], out.data() + done, out.size() - done);
      if (n <= 0) ::_exit(3);
      done += static_cast<std::size_t>(n);
    }
    ::_exit(0);
  }
  ::close(fds[1]);
  std::string out;
  char buf[4096];
  ssize_t n;
  while ((n = ::read(fds[0], buf, sizeof buf)) > 0) out.append(buf, static_cast<std::size_t>(n));
  ::close(fds[0]);
  int status = 0;
  ::waitpid(pid, &status, 0);
  if (WIFEXITED(status) && WEXITSTATUS(status) == 2) return std::nullopt;  // could not drop root
  if (!WIFEXITED(status) || WEXITSTATUS(status) != 0) return "<child process failed>";
  return out;
}

}  // namespace lode::testing
