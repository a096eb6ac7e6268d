#include <filesystem>
#include <set>

#include "lode/indexer.h"

namespace lode {
namespace {

namespace fs = std::filesystem;

std::string absolute_root(const std::string& root) {
  std::error_code ec;
  fs::path p = fs::absolute(fs::path(root), ec).lexically_normal();
  std::string s = p.generic_string();
  while (s.size() > 1 && s.back() == '/') s.pop_back();
  return s;
}

// The root a file was found under: the longest root that is a prefix folder.
std::string root_of(const std::string& path, const std::vector<std::string>& roots) {
  std::string best;
  for (auto& r : roots)
    if ((path == r || (path.size() > r.size() && path.compare(0, r.size(), r) == 0 &&
                       (r == "/" || path[r.size()] == '/'))) &&
        r.size() > best.size())
      best = r;
  return best;
}

// Users see ids relative to the root they indexed, so runs and judgments
// survive moving the archive.
std::string relative_id(const std::string& path, const std::string& root) {
  if (path == root) return fs::path(path).filename().generic_string();
  return path.substr(root == "/" ? 1 : root.size() + 1);
}

}  // namespace

Result<IndexReport> index_paths(IndexWriter& writer, const std::vector<std::string>& roots,
                                const IndexRunOptions& options,
                                const std::function<void(const IndexProgress&)>& progress) {
  std::vector<std::string> abs_roots;
  for (auto& r : roots) abs_roots.push_back(absolute_root(r));
  auto crawled = crawl(abs_roots, options.crawl);
  if (!crawled) return crawled.status();
  IndexReport report;
  for (auto& p : crawled->problems) report.problems.push_back({p.path, p.reason});

  IndexProgress prog;
  prog.files_total = crawled->files.size();
  for (auto& f : crawled->files) prog.bytes_total += static_cast<std::uint64_t>(f.size);

  std::set<std::string> seen;
  for (const FileInfo& info : crawled->files) {
    if (options.cancelled && options.cancelled()) {
      report.cancelled = true;
      break;
    }
    seen.insert(info.path);
    prog.current = info.path;
    if (progress) progress(prog);
    ++prog.files_done;
    prog.bytes_done += static_cast<std::uint64_t>(info.size);

    std::string root = root_of(info.path, abs_roots);
    auto recorded = writer.file(info.path);
    if (!recorded) return recorded.status();
    const std::optional<FileRecord>& old = *recorded;
    if (old && old->size == info.size && old->mtime_ns == info.mtime_ns && old->root == root) {
      ++report.unchanged;
      continue;
    }
    auto read = read_file(info.path, options.read);
    if (!read) {
      ++report.failed;
      report.problems.push_back({info.path, read.status().message()});
      if (read.status().code() == Code::kNotFound && old) {  // vanished mid-run
        LODE_RETURN_IF_ERROR(writer.remove_file(info.path));
        ++report.removed;
      }
      continue;
    }
    report.bytes_read += static_cast<std::uint64_t>(info.size);
    for (auto& w : read->warnings) report.warnings.push_back({info.path, w});
    FileRecord rec{info.path, root, info.size, info.mtime_ns, read->content_hash,
                   read->documents.empty() ? "text" : read->documents.front().kind};
    if (old && old->hash == read->content_hash) {
      LODE_RETURN_IF_ERROR(writer.touch_file(rec));
      ++report.unchanged;
      continue;
    }
    std::string rel = relative_id(info.path, root);
    std::vector<DocumentInput> docs;
    docs.reserve(read->documents.size());
    for (auto& d : read->documents) {
      std::string id = d.external_id;
      if (d.kind != "jsonl" || id.empty()) id = rel;
      else if (id.compare(0, info.path.size() + 1, info.path + "#") == 0) id = rel + id.substr(info.path.size());
      docs.push_back(DocumentInput{std::move(id), std::move(d.title), std::move(d.body), std::move(d.kind)});
    }
    LODE_RETURN_IF_ERROR(writer.put_file(rec, docs));
    report.documents += docs.size();
    ++(old ? report.updated : report.added);
  }

  if (options.remove_missing && !report.cancelled) {
    for (auto& root : abs_roots) {
      std::error_code ec;
      bool is_dir = fs::is_directory(root, ec);
      auto held = writer.files_with_prefix(is_dir ? (root == "/" ? root : root + "/") : root);
      if (!held) return held.status();
      for (auto& f : *held) {
        if (!is_dir && f.path != root) continue;
        if (seen.count(f.path)) continue;
        bool unreachable = false;  // under a folder the crawl could not read: keep it
        for (auto& p : crawled->problems)
          if (f.path == p.path || f.path.compare(0, p.path.size() + 1, p.path + "/") == 0) unreachable = true;
        if (unreachable) continue;
        // Excluded by the glob options now, or gone: either way not under this root's crawl.
        LODE_RETURN_IF_ERROR(writer.remove_file(f.path));
        ++report.removed;
      }
    }
  }
  LODE_RETURN_IF_ERROR(writer.commit());
  return report;
}

}  // namespace lode
