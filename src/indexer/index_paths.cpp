// index_paths(): crawl, decide per file (unchanged / read / rename / remove),
// extract in parallel, apply on this thread, commit.
#include <algorithm>
#include <chrono>
#include <filesystem>
#include <future>
#include <map>
#include <set>
#include <thread>
#include <unordered_map>

#include "indexer/extract_pool.h"
#include "indexer/id_clash.h"
#include "indexer/paths.h"
#include "lode/indexer.h"

namespace lode {
namespace {

namespace fs = std::filesystem;
using indexer::ReadJob;

std::int64_t now_ns() {
  return std::chrono::duration_cast<std::chrono::nanoseconds>(std::chrono::system_clock::now().time_since_epoch())
      .count();
}

// Every file the index holds under the roots, by path.
Result<std::map<std::string, FileRecord>> held_under(IndexWriter& writer, const std::vector<std::string>& roots) {
  std::map<std::string, FileRecord> held;
  for (auto& root : roots) {
    std::error_code ec;
    const bool is_dir = fs::is_directory(root, ec);
    auto files = writer.files_with_prefix(is_dir ? (root == "/" ? root : root + "/") : root);
    if (!files) return files.status();
    for (auto& f : *files)
      if (is_dir || f.path == root) held.emplace(f.path, std::move(f));
  }
  return held;
}

bool under_problem(const std::string& path, const std::vector<CrawlProblem>& problems) {
  for (auto& p : problems)
    if (path == p.path || indexer::is_under(path, p.path)) return true;
  return false;
}

std::vector<DocumentInput> inputs_of(std::vector<Document>& documents, const std::string& path,
                                     const std::string& rel) {
  std::vector<DocumentInput> docs;
  docs.reserve(documents.size());
  for (auto& d : documents) {
    DocumentInput in{indexer::document_id(d.external_id, path, rel, d.kind), std::move(d.title),
                     std::move(d.body), std::move(d.kind), std::move(d.author), d.date, d.pages,
                     std::move(d.page_starts)};
    docs.push_back(std::move(in));
  }
  return docs;
}

class Run {
 public:
  Run(IndexWriter& w, const IndexRunOptions& o, const std::function<void(const IndexProgress&)>& progress)
      : writer_(w), options_(o), progress_(progress) {}
  Result<IndexReport> go(const std::vector<std::string>& roots);

 private:
  Status apply(const FileInfo& info, indexer::ReadOutcome out, const std::optional<FileRecord>& old, bool stream);
  Status apply_stream(const FileInfo& info, const std::string& hash, const std::optional<FileRecord>& old);
  void count_file(const FileRecord& rec, std::size_t documents, bool had_old);
  Status fail(const std::string& path, const Status& why, bool had_old);
  Status store_problems(const std::string& path, std::vector<RecordedProblem> problems);
  // A file read with these warnings (none: read cleanly): reported and recorded.
  Status store_warnings(const std::string& path, const std::vector<std::string>& warnings);

  IndexWriter& writer_;
  const IndexRunOptions& options_;
  const std::function<void(const IndexProgress&)>& progress_;
  std::vector<std::string> roots_;
  IndexReport report_;
  IndexProgress prog_;
  std::set<std::string> problem_paths_;  // paths with problems recorded before this run
  std::set<std::string> recorded_;       // of those, the ones whose problems this run rewrote
  // Vanished files by size, for rename detection; erased when claimed.
  std::multimap<std::int64_t, FileRecord> missing_;
};

Status Run::store_problems(const std::string& path, std::vector<RecordedProblem> problems) {
  if (problem_paths_.count(path)) recorded_.insert(path);  // only these are looked up
  if (problems.empty() && !problem_paths_.count(path)) return Status();
  return writer_.record_problems(path, problems);
}

Status Run::store_warnings(const std::string& path, const std::vector<std::string>& warnings) {
  std::vector<RecordedProblem> problems;
  for (auto& w : warnings) {
    report_.warnings.push_back({path, w});
    problems.push_back(RecordedProblem{path, false, w, now_ns()});
  }
  return store_problems(path, std::move(problems));
}

Status Run::fail(const std::string& path, const Status& why, bool had_old) {
  ++report_.failed;
  auto& kind = report_.by_kind[indexer::kind_of_name(path)];
  ++kind.failed;
  // Reader errors start with the path; the report names it apart.
  std::string reason = why.message();
  if (reason.compare(0, path.size() + 2, path + ": ") == 0) reason.erase(0, path.size() + 2);
  report_.problems.push_back({path, reason});
  LODE_RETURN_IF_ERROR(store_problems(path, {RecordedProblem{path, true, reason, now_ns()}}));
  if (why.code() == Code::kNotFound && had_old) {  // vanished mid-run
    LODE_RETURN_IF_ERROR(writer_.remove_file(path));
    ++report_.removed;
  }
  return Status();
}

void Run::count_file(const FileRecord& rec, std::size_t documents, bool had_old) {
  auto& kind = report_.by_kind[rec.kind];
  ++kind.files;
  kind.documents += documents;
  kind.bytes += static_cast<std::uint64_t>(rec.size);
  report_.documents += documents;
  ++(had_old ? report_.updated : report_.added);
}

// A large JSON Lines file, read in parts on this thread while the next part
// is read on another, committed by the writer's batches as they fill.
Status Run::apply_stream(const FileInfo& info, const std::string& hash, const std::optional<FileRecord>& old) {
  const std::string root = indexer::root_of(info.path, roots_);
  FileRecord rec{info.path, root, info.size, info.mtime_ns, hash, "jsonl"};
  if (old && old->hash == hash) {
    LODE_RETURN_IF_ERROR(writer_.touch_file(rec));
    ++report_.unchanged;
    return Status();
  }
  auto stream = JsonlStream::open(info.path, options_.read);
  if (!stream) return fail(info.path, stream.status(), old.has_value());
  // Unfinished until finish_file(): no size or hash matches it, so a run
  // stopped mid-file reads the file again next time.
  rec.hash.clear();
  rec.size = -1;
  LODE_RETURN_IF_ERROR(writer_.begin_file(rec));
  const std::string rel = indexer::relative_id(info.path, root);
  JsonlStream& reader = **stream;
  auto read_part = [&reader, bytes = options_.stream_part_bytes] { return reader.next(bytes); };
  auto ahead = std::async(std::launch::async, read_part);
  std::size_t documents = 0;
  const std::uint64_t bytes_before = prog_.bytes_done;
  Status failed;
  for (;;) {
    auto part = ahead.get();
    if (!part) {
      failed = part.status();
      break;
    }
    if (part->empty()) break;
    if (options_.cancelled && options_.cancelled()) {  // the file stays unfinished: read again next run
      report_.cancelled = true;
      return Status();
    }
    const std::int64_t read_so_far = reader.bytes_read();  // before the next part starts
    ahead = std::async(std::launch::async, read_part);
    auto docs = inputs_of(*part, info.path, rel);
    documents += docs.size();
    LODE_RETURN_IF_ERROR(writer_.add_documents(docs));
    prog_.bytes_done = bytes_before + static_cast<std::uint64_t>(read_so_far);
    if (progress_) progress_(prog_);
  }
  prog_.bytes_done = bytes_before;  // go() adds the whole file
  if (!failed.ok()) {
    LODE_RETURN_IF_ERROR(writer_.remove_file(info.path));  // no half-read file stays
    return fail(info.path, failed, false);
  }
  ReadResult done = reader.finish();
  report_.bytes_read += static_cast<std::uint64_t>(done.size);
  LODE_RETURN_IF_ERROR(store_warnings(info.path, done.warnings));
  rec.hash = done.content_hash;
  rec.size = done.size;
  rec.mtime_ns = done.mtime_ns;
  LODE_RETURN_IF_ERROR(writer_.finish_file(rec));
  count_file(rec, documents, old.has_value());
  return Status();
}

Status Run::apply(const FileInfo& info, indexer::ReadOutcome out, const std::optional<FileRecord>& old,
                  bool stream) {
  const std::string root = indexer::root_of(info.path, roots_);
  if (!out.renamed_hash.empty()) {
    for (auto it = missing_.lower_bound(info.size); it != missing_.end() && it->first == info.size; ++it) {
      if (it->second.hash != out.renamed_hash ||
          indexer::reading_suffix(it->second.path) != indexer::reading_suffix(info.path))
        continue;
      const FileRecord was = it->second;
      missing_.erase(it);
      FileRecord now = was;
      now.path = info.path;
      now.root = root;
      now.mtime_ns = info.mtime_ns;
      LODE_RETURN_IF_ERROR(writer_.rename_file(was.path, now, indexer::relative_id(was.path, was.root),
                                               indexer::relative_id(info.path, root)));
      if (problem_paths_.count(was.path)) LODE_RETURN_IF_ERROR(writer_.record_problems(was.path, {}));
      ++report_.renamed;
      return Status();
    }
    // Claimed by an earlier file with the same content: read this one.
    if (stream) {
      ReadResult hashed;
      hashed.content_hash = out.renamed_hash;
      out.read = std::move(hashed);
    } else {
      out.read = read_file(info.path, options_.read);
    }
  }
  Result<ReadResult>& read = *out.read;
  if (!read) return fail(info.path, read.status(), old.has_value());
  // Read ahead by a worker, then deleted before its turn: the index must not
  // hold a file that is gone when its batch commits.
  std::error_code ec;
  if (!fs::exists(info.path, ec) && !ec)
    return fail(info.path, Status::NotFound("vanished while being indexed"), old.has_value());
  if (stream) return apply_stream(info, read->content_hash, old);
  if (!read->skipped.empty()) {  // binary or media: recorded without documents, not a failure
    ++report_.skipped;
    LODE_RETURN_IF_ERROR(store_problems(info.path, {}));
    return writer_.put_file(FileRecord{info.path, root, read->size, read->mtime_ns, read->content_hash, kSkippedKind},
                            {});
  }
  report_.bytes_read += static_cast<std::uint64_t>(read->size);
  LODE_RETURN_IF_ERROR(store_warnings(info.path, read->warnings));
  FileRecord rec{info.path, root, read->size, read->mtime_ns, read->content_hash,
                 read->documents.empty() ? indexer::kind_of_name(info.path) : read->documents.front().kind};
  if (old && old->hash == read->content_hash) {
    LODE_RETURN_IF_ERROR(writer_.touch_file(rec));
    ++report_.unchanged;
    return Status();
  }
  const auto docs = inputs_of(read->documents, info.path, indexer::relative_id(info.path, root));
  LODE_RETURN_IF_ERROR(writer_.put_file(rec, docs));
  count_file(rec, docs.size(), old.has_value());
  return Status();
}

Result<IndexReport> Run::go(const std::vector<std::string>& roots) {
  for (auto& r : roots) roots_.push_back(indexer::absolute_root(r));
  auto crawled = crawl(roots_, options_.crawl);
  if (!crawled) return crawled.status();
  for (auto& p : crawled->problems) {
    report_.problems.push_back({p.path, p.reason});
    ++report_.by_kind["?"].failed;
  }
  auto held = held_under(writer_, roots_);
  if (!held) return held.status();
  {
    auto everything = writer_.files_with_prefix("");
    if (!everything) return everything.status();
    for (auto& clash : indexer::id_clashes(crawled->files, roots_, *everything))
      report_.warnings.push_back(std::move(clash));
  }
  auto recorded = writer_.problems();
  if (!recorded) return recorded.status();
  for (auto& p : *recorded) problem_paths_.insert(p.path);
  for (auto& p : crawled->problems)
    LODE_RETURN_IF_ERROR(store_problems(p.path, {RecordedProblem{p.path, true, p.reason, now_ns()}}));

  // Files held but not crawled: gone (or renamed) unless a crawl problem hides them.
  // The crawl is sorted by path: membership by binary search, not a copy of every path.
  const auto crawled_has = [&files = crawled->files](const std::string& path) {
    auto it = std::lower_bound(files.begin(), files.end(), path,
                               [](const FileInfo& f, const std::string& p) { return f.path < p; });
    return it != files.end() && it->path == path;
  };
  std::vector<std::string> gone;
  if (options_.remove_missing)
    for (auto& [path, rec] : *held)
      if (!crawled_has(path) && !under_problem(path, crawled->problems)) {
        gone.push_back(path);
        missing_.emplace(rec.size, rec);
      }

  // Decide which files need reading.
  // Pointers, as a crawl can list a million files.
  struct Todo {
    const FileInfo* info;
    const FileRecord* old;  // its record in `held`, or null
    bool stream;            // a JSON Lines file read in parts
  };
  std::vector<Todo> todo;
  std::vector<ReadJob> jobs;
  for (const FileInfo& info : crawled->files) {
    prog_.bytes_total += static_cast<std::uint64_t>(info.size);
    auto it = held->find(info.path);
    const FileRecord* old = it != held->end() ? &it->second : nullptr;
    if (old && old->size == info.size && old->mtime_ns == info.mtime_ns && old->root == indexer::root_of(info.path, roots_)) {
      ++(old->kind == kSkippedKind ? report_.skipped : report_.unchanged);
      prog_.bytes_done += static_cast<std::uint64_t>(info.size);
      continue;
    }
    ReadJob job{&info.path, {}, streams_as_jsonl(info.path, info.size, options_.read)};
    if (!old)
      for (auto m = missing_.lower_bound(info.size); m != missing_.end() && m->first == info.size; ++m)
        if (indexer::reading_suffix(m->second.path) == indexer::reading_suffix(info.path))
          job.rename_hashes.push_back(m->second.hash);
    todo.push_back(Todo{&info, old, job.stream});
    jobs.push_back(std::move(job));
  }
  prog_.files_total = crawled->files.size();
  prog_.files_done = crawled->files.size() - todo.size();

  {
    const unsigned threads = options_.jobs != 0 ? options_.jobs : std::max(1u, std::thread::hardware_concurrency());
    indexer::ExtractPool pool(std::move(jobs), options_.read, threads, options_.read_ahead,
                               options_.read_ahead_bytes);
    for (std::size_t i = 0; i < todo.size(); ++i) {
      if (options_.cancelled && options_.cancelled()) {
        report_.cancelled = true;
        break;
      }
      const FileInfo& info = *todo[i].info;
      prog_.current = info.path;
      if (progress_) progress_(prog_);
      const std::optional<FileRecord> old =
          todo[i].old != nullptr ? std::optional<FileRecord>(*todo[i].old) : std::nullopt;
      LODE_RETURN_IF_ERROR(apply(info, pool.take(i), old, todo[i].stream));
      ++prog_.files_done;
      prog_.bytes_done += static_cast<std::uint64_t>(info.size);
    }
  }
  if (progress_) {
    prog_.current = {};
    progress_(prog_);
  }

  if (!report_.cancelled) {
    for (auto& path : gone) {
      bool still_missing = false;  // not claimed by a rename
      for (auto& [size, rec] : missing_) still_missing |= rec.path == path;
      if (!still_missing) continue;
      LODE_RETURN_IF_ERROR(writer_.remove_file(path));
      ++report_.removed;
    }
    // Problems of paths under the roots that are gone or now read cleanly.
    for (auto& path : problem_paths_)
      if (!recorded_.count(path) && !crawled_has(path) && indexer::root_of(path, roots_).size() > 0)
        LODE_RETURN_IF_ERROR(writer_.record_problems(path, {}));
  }
  LODE_RETURN_IF_ERROR(writer_.commit());
  return std::move(report_);
}

}  // namespace

Result<IndexReport> index_paths(IndexWriter& writer, const std::vector<std::string>& roots,
                                const IndexRunOptions& options,
                                const std::function<void(const IndexProgress&)>& progress) {
  Run run(writer, options, progress);
  return run.go(roots);
}

}  // namespace lode
