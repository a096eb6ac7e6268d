#include "indexer/extract_pool.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <filesystem>
#include <string_view>

namespace lode::indexer {

namespace {

bool contains(const std::vector<std::string>& v, const std::string& s) {
  return std::find(v.begin(), v.end(), s) != v.end();
}

// Text bytes an outcome holds (what dominates its memory).
std::size_t held_bytes(const ReadOutcome& o) {
  std::size_t n = 0;
  if (o.read && o.read->ok())
    for (const Document& d : (*o.read)->documents) n += d.body.size() + d.title.size() + d.external_id.size();
  return n;
}

// Whether reading `path` unpacks it: gzip or a zip container (DOCX, ODT,
// EPUB), by signature as read_file() decides, or by name when the file
// cannot be read here (read_file() then reports why). Non-blocking: the
// file may have been replaced by a pipe since the crawl.
bool unpacks(const std::string& path) {
  char head[4] = {};
  ssize_t got = -1;
  const int fd = ::open(path.c_str(), O_RDONLY | O_NONBLOCK | O_CLOEXEC);
  if (fd >= 0) {
    struct stat st {};
    if (::fstat(fd, &st) == 0 && S_ISREG(st.st_mode)) got = ::read(fd, head, sizeof head);
    ::close(fd);
  }
  if (got >= 2) {
    const std::string_view h(head, static_cast<std::size_t>(got));
    return h.substr(0, 2) == "\x1f\x8b" || h == std::string_view("PK\x03\x04", 4);
  }
  const std::string ext = std::filesystem::path(path).extension().string();
  return ext == ".gz" || ext == ".docx" || ext == ".odt" || ext == ".epub";
}

}  // namespace

ExtractPool::ExtractPool(std::vector<ReadJob> jobs, ReadOptions options, unsigned threads, std::size_t ahead,
                         std::size_t ahead_bytes)
    : jobs_(std::move(jobs)), options_(std::move(options)), ahead_(std::max<std::size_t>(ahead, 1)),
      ahead_bytes_(ahead_bytes) {
  const unsigned n = std::max(1u, std::min<unsigned>(threads, static_cast<unsigned>(std::max<std::size_t>(jobs_.size(), 1))));
  for (unsigned i = 0; i < n; ++i) workers_.emplace_back([this](std::stop_token st) { work(st); });
}

ExtractPool::~ExtractPool() {
  for (auto& w : workers_) w.request_stop();
  cv_.notify_all();
  workers_.clear();  // joins
}

void ExtractPool::work(std::stop_token stop) {
  for (;;) {
    std::size_t i = 0;
    {
      std::unique_lock lock(mu_);
      if (!cv_.wait(lock, stop, [&] {
            return next_ < jobs_.size() && next_ < taken_ + ahead_ && (next_ == taken_ || waiting_bytes_ <= ahead_bytes_);
          }))
        return;
      i = next_++;
    }
    const ReadJob& job = jobs_[i];
    ReadOutcome out;
    if (job.stream) {
      auto hash = hash_file(*job.path, options_);
      if (hash.ok() && contains(job.rename_hashes, *hash)) {
        out.renamed_hash = *hash;
      } else if (hash.ok()) {
        ReadResult hashed;
        hashed.content_hash = std::move(*hash);
        out.read = std::move(hashed);
      } else {
        out.read = hash.status();
      }
    } else {
      if (!job.rename_hashes.empty()) {
        auto hash = hash_file(*job.path, options_);
        if (hash.ok() && contains(job.rename_hashes, *hash)) out.renamed_hash = *hash;
      }
      if (out.renamed_hash.empty()) {
        std::unique_lock unpacking(unpack_mu_, std::defer_lock);
        if (unpacks(*job.path)) unpacking.lock();
        out.read = read_file(*job.path, options_);
      }
    }
    const std::size_t bytes = held_bytes(out);
    bool wanted = false;
    {
      std::lock_guard lock(mu_);
      done_.emplace(i, std::move(out));
      waiting_bytes_ += bytes;
      wanted = i == awaited_;  // the consumer waits for this one
    }
    if (wanted) cv_.notify_all();
  }
}

ReadOutcome ExtractPool::take(std::size_t i) {
  std::unique_lock lock(mu_);
  if (!done_.count(i)) {
    awaited_ = i;
    if (i >= next_) cv_.notify_all();  // not started yet: make sure a worker is awake to start it
    cv_.wait(lock, [&] { return done_.count(i) != 0; });
    awaited_ = kNone;
  }
  auto node = done_.extract(i);
  ReadOutcome out = std::move(node.mapped());
  waiting_bytes_ -= held_bytes(out);
  taken_ = i + 1;
  // Wake the workers only once the read-ahead is half used up: waking one
  // per taken file made them trade places file by file, a futex call each.
  const bool room = next_ - taken_ <= ahead_ / 2 && waiting_bytes_ <= ahead_bytes_ / 2;
  lock.unlock();
  if (room) cv_.notify_all();
  return out;
}

}  // namespace lode::indexer
