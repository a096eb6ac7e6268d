// The baseline and indexing phases of bench_index (see index_phases.h).
#include "index_phases.h"

#include <sqlite3.h>

#include <algorithm>
#include <array>
#include <filesystem>

#include "lode/analysis.h"
#include "lode/index.h"
#include "lode/indexer.h"
#include "lode/ingest.h"
#include "measure.h"

namespace lode::bench {
namespace {

using nlohmann::json;

json error(const std::string& step, const Status& s) { return {{"error", step + ": " + s.to_string()}}; }

json memory_json() {
  const Memory m = memory_self();
  return {{"vm_hwm_kib", m.hwm_kib}, {"ru_maxrss_kib", m.maxrss_kib}};
}

// Page bytes per table and index, from SQLite's dbstat virtual table (built
// into Debian's libsqlite3). Empty when dbstat is missing.
json table_bytes(const std::string& path) {
  json out = json::object();
  sqlite3* db = nullptr;
  if (sqlite3_open_v2(path.c_str(), &db, SQLITE_OPEN_READONLY, nullptr) == SQLITE_OK) {
    sqlite3_stmt* st = nullptr;
    if (sqlite3_prepare_v2(db, "SELECT name, SUM(pgsize) FROM dbstat GROUP BY name ORDER BY 2 DESC", -1, &st,
                           nullptr) == SQLITE_OK) {
      while (sqlite3_step(st) == SQLITE_ROW)
        out[reinterpret_cast<const char*>(sqlite3_column_text(st, 0))] = sqlite3_column_int64(st, 1);
    }
    sqlite3_finalize(st);
  }
  sqlite3_close(db);
  return out;
}

}  // namespace

json baseline_phase(const std::string& corpus, int repeat) {
  auto crawled = crawl({corpus}, CrawlOptions{});
  if (!crawled) return error("crawl " + corpus, crawled.status());
  auto analyzer = Analyzer::create(AnalyzerOptions{});  // the index default: english, stopwords
  if (!analyzer) return error("analyzer", analyzer.status());
  const ReadOptions ropt;

  std::uint64_t bytes = 0, documents = 0, tokens = 0, words = 0;
  std::size_t failed = 0;
  // One pass over every file; analyze = false measures reading alone.
  auto pass = [&](bool analyze) {
    bytes = documents = tokens = words = 0;
    failed = 0;
    for (const FileInfo& f : crawled->files) {
      auto read = read_file(f.path, ropt);
      if (!read) {
        ++failed;
        continue;
      }
      bytes += static_cast<std::uint64_t>(f.size);
      documents += read->documents.size();
      if (!analyze) continue;
      for (const Document& d : read->documents)
        for (const std::string* text : {&d.title, &d.body}) {
          Analyzer::Analyzed a = (*analyzer)->analyze(*text);
          tokens += a.tokens.size();
          words += a.word_count;
        }
    }
  };
  auto timed = [&](bool analyze) {
    json best;
    for (int r = 0; r < std::max(1, repeat); ++r) {
      const double t0 = now_seconds();
      const CpuTimes c0 = cpu_self();
      pass(analyze);
      const double wall = now_seconds() - t0;
      const CpuTimes c1 = cpu_self();
      if (best.is_null() || wall < best["wall_s"].get<double>())
        best = {{"wall_s", wall}, {"cpu_user_s", c1.user - c0.user}, {"cpu_sys_s", c1.sys - c0.sys}};
    }
    return best;
  };
  pass(false);  // warm-up: brings the corpus into the page cache
  json read = timed(false);
  json analyzed = timed(true);
  return {{"phase", "baseline"},
          {"files", crawled->files.size()},
          {"failed", failed},
          {"bytes", bytes},
          {"documents", documents},
          {"tokens", tokens},
          {"words", words},
          {"read", read},
          {"read_analyze", analyzed},
          {"memory", memory_json()}};
}

json index_phase(const std::string& corpus, const std::string& index_path, double batch_mib) {
  for (const char* suffix : {"", "-wal", "-shm", ".lock"}) {
    std::error_code ec;
    std::filesystem::remove(index_path + suffix, ec);
  }
  WriterOptions wopt;
  wopt.batch_bytes = static_cast<std::size_t>(batch_mib * 1024 * 1024);
  IndexSettings settings;  // english, stopwords removed: the CLI's default

  // RSS sampled every few files; the peak within each tenth of the corpus
  // (by bytes) shows whether memory grows with the corpus or stays flat.
  std::array<std::int64_t, 10> rss_by_tenth{};
  // A file whose handling takes over 0.1 s of CPU is, in practice, the one
  // that filled the batch: the gap holds the flush and commit. CPU time, not
  // wall time, so a busy machine does not turn slow files into "flushes".
  double last_wall = 0, last_cpu = 0, longest_pause = 0, flush_cpu = 0, flush_wall = 0;
  std::size_t flushes = 0, calls = 0;
  auto progress = [&](const IndexProgress& p) {
    const double t = now_seconds(), c = thread_cpu_seconds();
    if (last_wall > 0) {
      longest_pause = std::max(longest_pause, t - last_wall);
      if (c - last_cpu > 0.1) {
        ++flushes;
        flush_cpu += c - last_cpu;
        flush_wall += t - last_wall;
      }
    }
    last_wall = t;
    last_cpu = c;
    if (p.bytes_total == 0) return;
    auto tenth = std::min<std::size_t>(9, static_cast<std::size_t>(p.bytes_done * 10 / p.bytes_total));
    if (calls++ % 16 != 0 && rss_by_tenth[tenth] != 0) return;  // every 16th file, and each tenth's first
    rss_by_tenth[tenth] = std::max(rss_by_tenth[tenth], rss_kib_now());
  };

  const double t0 = now_seconds();
  const CpuTimes c0 = cpu_self();
  auto writer = IndexWriter::open(index_path, settings, wopt);
  if (!writer) return error("open " + index_path, writer.status());
  auto report = index_paths(**writer, {corpus}, IndexRunOptions{}, progress);
  if (!report) return error("index " + corpus, report.status());
  const double t_indexed = now_seconds();
  const double last_commit_cpu = thread_cpu_seconds() - last_cpu;  // last file, then the final flush
  const CollectionStats stats = (*writer)->stats();
  writer.value().reset();  // closes SQLite: the last connection checkpoints the WAL
  const double t1 = now_seconds();
  const CpuTimes c1 = cpu_self();

  json tenths = json::array();
  for (auto v : rss_by_tenth) tenths.push_back(v);
  return {{"phase", "index"},
          {"batch_mib", batch_mib},
          {"wall_s", t1 - t0},
          {"index_paths_s", t_indexed - t0},
          {"close_s", t1 - t_indexed},
          {"cpu_user_s", c1.user - c0.user},
          {"cpu_sys_s", c1.sys - c0.sys},
          {"files", report->added},
          {"failed", report->failed},
          {"bytes", report->bytes_read},
          {"documents", report->documents},
          {"longest_pause_s", longest_pause},
          {"flushes_seen", flushes},
          {"flush_cpu_s", flush_cpu},
          {"flush_wall_s", flush_wall},
          {"final_commit_cpu_s", last_commit_cpu},
          {"final_commit_wall_s", t_indexed - last_wall},
          {"rss_peak_by_tenth_kib", tenths},
          {"stats",
           {{"documents", stats.documents},
            {"terms", stats.terms},
            {"postings", stats.postings},
            {"total_length_body", stats.total_length[1]},
            {"bytes_on_disk_before_close", stats.bytes_on_disk}}},
          {"index_bytes", file_bytes(index_path)},
          {"wal_bytes_after_close", file_bytes(index_path + "-wal")},
          {"table_bytes", table_bytes(index_path)},
          {"memory", memory_json()}};
}

}  // namespace lode::bench
