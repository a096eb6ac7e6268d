// crawl(): walks the roots depth-first with an explicit stack (no recursion,
// so deep trees cannot exhaust the call stack), listing each folder once in
// name order so the walk, and the problems it reports, are deterministic.
//
// Folders are identified by (device, inode). A folder that is already on the
// current path is a symlink loop; one already walked from this root through
// another path (two links to the same place) is walked once only, so a link
// farm cannot multiply the work.
#include <sys/stat.h>

#include <algorithm>
#include <cerrno>
#include <filesystem>
#include <set>
#include <system_error>
#include <utility>

#include "lode/ingest.h"

namespace lode {
namespace {

namespace fs = std::filesystem;
using FolderId = std::pair<dev_t, ino_t>;

std::string reason_for(int err) {
  switch (err) {
    case EACCES:
    case EPERM: return "permission denied";
    case ENOENT: return "vanished";
    case ELOOP: return "symlink loop";
    default: return std::generic_category().message(err);
  }
}

std::int64_t mtime_ns(const struct stat& st) {
  return static_cast<std::int64_t>(st.st_mtim.tv_sec) * 1'000'000'000 +
         static_cast<std::int64_t>(st.st_mtim.tv_nsec);
}

bool matches_any(const std::vector<std::string>& patterns, std::string_view rel) {
  return std::any_of(patterns.begin(), patterns.end(),
                     [&](const std::string& p) { return glob_match(p, rel); });
}

std::string join(const std::string& folder, const std::string& name) {
  return folder == "/" ? folder + name : folder + "/" + name;
}

class Walker {
 public:
  Walker(const CrawlOptions& options, CrawlResult& out) : options_(options), out_(out) {}

  void walk_folder(const std::string& root, const struct stat& st) {
    visited_.clear();
    stack_.clear();
    enter(root, "", FolderId{st.st_dev, st.st_ino});
    while (!stack_.empty()) {
      Frame& top = stack_.back();
      if (top.next == top.names.size()) {
        stack_.pop_back();
        continue;
      }
      const std::string name = top.names[top.next++];
      // Copies: visit() may push a frame and invalidate `top`.
      const std::string folder = top.path, rel = top.rel;
      visit(folder, rel, name);
    }
  }

  void add_file(const std::string& path, std::string_view rel, const struct stat& st) {
    if (matches_any(options_.exclude, rel)) return;
    if (!options_.include.empty() && !matches_any(options_.include, rel)) return;
    out_.files.push_back(FileInfo{path, static_cast<std::int64_t>(st.st_size), mtime_ns(st)});
  }

  void problem(std::string path, std::string reason) {
    out_.problems.push_back(CrawlProblem{std::move(path), std::move(reason)});
  }

 private:
  struct Frame {
    std::string path;  // absolute
    std::string rel;   // relative to the root ("" for the root itself)
    FolderId id;
    std::vector<std::string> names;  // entries, sorted
    std::size_t next = 0;
  };

  void visit(const std::string& folder, const std::string& folder_rel, const std::string& name) {
    if (!options_.hidden && name.front() == '.') return;
    const std::string path = join(folder, name);
    const std::string rel = folder_rel.empty() ? name : folder_rel + "/" + name;
    struct stat st {};
    if (::lstat(path.c_str(), &st) != 0) {
      const int err = errno;
      return problem(path, reason_for(err));
    }
    if (S_ISLNK(st.st_mode)) {
      if (!options_.follow_symlinks) return;
      if (::stat(path.c_str(), &st) != 0) {
        const int err = errno;
        return problem(path, err == ENOENT ? "broken symbolic link" : reason_for(err));
      }
    }
    if (S_ISREG(st.st_mode)) return add_file(path, rel, st);
    if (!S_ISDIR(st.st_mode)) return special_file(path, rel, st);
    // An excluded folder is pruned whole, so "build" or "**/node_modules"
    // in the exclude list skips the folder's contents too.
    if (matches_any(options_.exclude, rel)) return;
    const FolderId id{st.st_dev, st.st_ino};
    for (const Frame& f : stack_) {
      if (f.id == id) return problem(path, "symlink loop (back to " + f.path + ")");
    }
    if (visited_.count(id) != 0) return problem(path, "folder already crawled through another path");
    enter(path, rel, id);
  }

  // A pipe, socket or device is never read (opening a pipe would wait for a
  // writer; a device may never end), but a file the user chose is not
  // passed over in silence either: it is a problem, named.
  void special_file(const std::string& path, std::string_view rel, const struct stat& st) {
    if (matches_any(options_.exclude, rel)) return;
    if (!options_.include.empty() && !matches_any(options_.include, rel)) return;
    const char* what = S_ISFIFO(st.st_mode)  ? "a named pipe"
                       : S_ISSOCK(st.st_mode) ? "a socket"
                       : S_ISCHR(st.st_mode)  ? "a character device"
                       : S_ISBLK(st.st_mode)  ? "a block device"
                                              : "not a regular file";
    problem(path, std::string(what) + ", not read");
  }

  // Lists a folder and pushes its frame; a folder that cannot be listed is a problem.
  void enter(const std::string& path, const std::string& rel, FolderId id) {
    visited_.insert(id);
    std::error_code ec;
    fs::directory_iterator it(path, ec);
    if (ec) return problem(path, reason_for(ec.value()));
    Frame frame{path, rel, id, {}, 0};
    while (it != fs::directory_iterator()) {
      frame.names.push_back(it->path().filename().string());
      it.increment(ec);
      if (ec) {
        problem(path, "listing stopped: " + reason_for(ec.value()));
        break;
      }
    }
    std::sort(frame.names.begin(), frame.names.end());
    stack_.push_back(std::move(frame));
  }

  const CrawlOptions& options_;
  CrawlResult& out_;
  std::vector<Frame> stack_;
  std::set<FolderId> visited_;  // folders walked from the current root
};

// The absolute, lexically normal form of `root`, without a trailing '/'.
std::string normal_path(const std::string& root, std::error_code& ec) {
  fs::path p = fs::absolute(fs::path(root), ec).lexically_normal();
  std::string s = p.string();
  while (s.size() > 1 && s.back() == '/') s.pop_back();
  return s;
}

}  // namespace

Result<CrawlResult> crawl(const std::vector<std::string>& roots, const CrawlOptions& options) {
  CrawlResult out;
  Walker walker(options, out);
  for (const std::string& root : roots) {
    if (root.empty()) return Status::InvalidArgument("crawl root is an empty path");
    std::error_code ec;
    const std::string path = normal_path(root, ec);
    if (ec) return Status::IOError(root + ": " + ec.message());
    // A root is followed even when it is a link: the caller named it.
    struct stat st {};
    if (::stat(path.c_str(), &st) != 0) {
      const int err = errno;
      if (err == ENOENT || err == ENOTDIR) return Status::NotFound(root + ": no such file or folder");
      return Status::IOError(root + ": " + std::generic_category().message(err));
    }
    if (S_ISDIR(st.st_mode)) {
      walker.walk_folder(path, st);
    } else if (S_ISREG(st.st_mode)) {
      walker.add_file(path, fs::path(path).filename().string(), st);
    } else {
      walker.problem(path, "not a regular file or folder");
    }
  }
  std::sort(out.files.begin(), out.files.end(),
            [](const FileInfo& a, const FileInfo& b) { return a.path < b.path; });
  out.files.erase(std::unique(out.files.begin(), out.files.end(),
                              [](const FileInfo& a, const FileInfo& b) { return a.path == b.path; }),
                  out.files.end());
  return out;
}

}  // namespace lode
