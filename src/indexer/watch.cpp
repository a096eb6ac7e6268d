// watch_paths(): inotify on every folder under the roots; a burst of events
// becomes one index_paths() run over the roots that are present.
#include <poll.h>
#include <sys/inotify.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cstring>
#include <filesystem>
#include <map>

#include "indexer/paths.h"
#include "lode/indexer.h"

namespace lode {
namespace {

namespace fs = std::filesystem;
using Clock = std::chrono::steady_clock;

constexpr std::uint32_t kFolderEvents = IN_CREATE | IN_DELETE | IN_CLOSE_WRITE | IN_MOVED_FROM | IN_MOVED_TO |
                                        IN_ATTRIB | IN_DELETE_SELF | IN_MOVE_SELF | IN_MODIFY;

struct RootState {
  std::string path;
  dev_t device = 0;     // the file system it lives on: an unmount changes it
  bool present = true;
  int wd = -1;          // watch on the root itself
};

class Watcher {
 public:
  Watcher(int fd, const IndexRunOptions& o, const std::function<void(const WatchEvent&)>& cb)
      : fd_(fd), options_(o), on_event_(cb) {}
  ~Watcher() { ::close(fd_); }

  // Watches `folder` and every folder below it; returns the folder's watch.
  int add_tree(const std::string& folder) {
    int top = add_one(folder);
    std::error_code ec;
    if (!fs::is_directory(folder, ec)) return top;
    for (auto it = fs::recursive_directory_iterator(folder, fs::directory_options::skip_permission_denied, ec);
         !ec && it != fs::recursive_directory_iterator(); it.increment(ec)) {
      const bool hidden = it->path().filename().string().starts_with(".");
      if (!it->is_directory(ec) || it->is_symlink(ec)) continue;
      if (hidden && !options_.crawl.hidden) {
        it.disable_recursion_pending();
        continue;
      }
      add_one(it->path().string());
    }
    return top;
  }

  // Reads pending events; true when any concerns the indexed tree.
  bool drain(std::vector<RootState>& roots) {
    alignas(inotify_event) char buf[65536];
    bool changed = false;
    for (;;) {
      const ssize_t n = ::read(fd_, buf, sizeof buf);
      if (n <= 0) break;
      for (char* p = buf; p < buf + n;) {
        auto* ev = reinterpret_cast<inotify_event*>(p);
        p += sizeof(inotify_event) + ev->len;
        changed = true;
        if (ev->mask & IN_Q_OVERFLOW) continue;
        for (auto& r : roots)
          if (r.present && ev->wd == r.wd && (ev->mask & (IN_DELETE_SELF | IN_MOVE_SELF | IN_UNMOUNT))) {
            r.present = false;
            on_event_({WatchEvent::Type::kRootGone,
                       r.path + " was moved, deleted or unmounted; its files stay indexed until it is back", nullptr});
          }
        auto dir = folders_.find(ev->wd);
        if (dir != folders_.end() && ev->len > 0 && (ev->mask & IN_ISDIR) && (ev->mask & (IN_CREATE | IN_MOVED_TO)))
          add_tree(dir->second + "/" + ev->name);
        if (ev->mask & IN_IGNORED) folders_.erase(ev->wd);
      }
    }
    return changed;
  }

  int fd() const { return fd_; }

 private:
  int add_one(const std::string& path) {
    const int wd = inotify_add_watch(fd_, path.c_str(), kFolderEvents | IN_DONT_FOLLOW);
    if (wd < 0) {
      if (!limit_reported_ && errno == ENOSPC) {
        limit_reported_ = true;
        on_event_({WatchEvent::Type::kWatchProblem,
                   "cannot watch " + path + ": the inotify watch limit is reached (raise fs.inotify.max_user_watches)",
                   nullptr});
      }
      return -1;
    }
    folders_[wd] = path;
    return wd;
  }

  int fd_;
  const IndexRunOptions& options_;
  const std::function<void(const WatchEvent&)>& on_event_;
  std::map<int, std::string> folders_;  // watch descriptor -> folder
  bool limit_reported_ = false;
};

bool root_present(const RootState& r) {
  struct stat st {};
  return ::stat(r.path.c_str(), &st) == 0 && st.st_dev == r.device;
}

}  // namespace

Status watch_paths(IndexWriter& writer, const std::vector<std::string>& roots, const IndexRunOptions& options,
                   const WatchOptions& watch, const std::function<void(const WatchEvent&)>& on_event) {
  const int fd = inotify_init1(IN_NONBLOCK | IN_CLOEXEC);
  if (fd < 0) return Status::IOError(std::string("inotify is not available: ") + std::strerror(errno));
  Watcher watcher(fd, options, on_event);
  std::vector<RootState> states;
  for (auto& r : roots) {
    RootState s;
    s.path = indexer::absolute_root(r);
    struct stat st {};
    if (::stat(s.path.c_str(), &st) != 0) return Status::NotFound(s.path + ": no such file or folder");
    s.device = st.st_dev;
    s.wd = watcher.add_tree(s.path);
    states.push_back(std::move(s));
  }
  auto run = [&]() -> Status {
    std::vector<std::string> present;
    for (auto& s : states)
      if (s.present) present.push_back(s.path);
    if (present.empty()) return Status();
    auto report = index_paths(writer, present, options);
    if (!report) {
      if (report.status().code() == Code::kNotFound) return Status();  // a root left mid-run: next check says
      return report.status();
    }
    on_event({WatchEvent::Type::kIndexed, "", &*report});
    return Status();
  };
  LODE_RETURN_IF_ERROR(run());

  bool dirty = false;
  Clock::time_point last_event{}, last_check = Clock::now();
  while (!(options.cancelled && options.cancelled())) {
    pollfd p{watcher.fd(), POLLIN, 0};
    ::poll(&p, 1, 200);
    if (watcher.drain(states)) {
      dirty = true;
      last_event = Clock::now();
    }
    const auto now = Clock::now();
    if (now - last_check >= std::chrono::milliseconds(watch.recheck_ms)) {
      last_check = now;
      for (auto& s : states) {
        const bool here = root_present(s);
        if (s.present && !here) {
          s.present = false;
          on_event({WatchEvent::Type::kRootGone,
                    s.path + " was moved, deleted or unmounted; its files stay indexed until it is back", nullptr});
        } else if (!s.present && here) {
          s.present = true;
          s.wd = watcher.add_tree(s.path);
          on_event({WatchEvent::Type::kRootBack, s.path + " is back; bringing it up to date", nullptr});
          dirty = true;
          last_event = Clock::time_point{};
        }
      }
    }
    if (dirty && now - last_event >= std::chrono::milliseconds(watch.quiet_ms)) {
      dirty = false;
      for (auto& s : states)
        if (s.present && !root_present(s)) s.present = false;  // checked right before removing anything
      LODE_RETURN_IF_ERROR(run());
    }
  }
  return writer.commit();
}

}  // namespace lode
