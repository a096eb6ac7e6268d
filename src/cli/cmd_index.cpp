// `lode index PATH...`: crawl, read and commit, with progress on a terminal.
#include <atomic>
#include <chrono>
#include <csignal>
#include <cstdio>

#include "cli/commands.h"
#include "cli/common.h"
#include "lode/indexer.h"

namespace lode::cli {
namespace {

// Set by SIGINT/SIGTERM; the indexer polls it between files, then commits.
std::atomic<bool> g_stop{false};  // signal handlers can reach nothing else
extern "C" void on_signal(int) { g_stop.store(true); }

struct IndexArgs {
  std::vector<std::string> paths;
  std::string language = "english";
  bool no_stopwords = false;
  std::vector<std::string> include, exclude;
  std::string id_field = "id", title_field = "title", text_field = "text";
  double batch_mb = 256;
  double max_file_mb = 1024;
  bool hidden = false, follow = false, keep_missing = false, quiet = false;
};

class Progress {
 public:
  explicit Progress(bool enabled) : enabled_(enabled), start_(std::chrono::steady_clock::now()) {}
  void update(const IndexProgress& p) {
    if (!enabled_) return;
    auto now = std::chrono::steady_clock::now();
    if (now - last_ < std::chrono::milliseconds(200) && p.files_done + 1 < p.files_total) return;
    last_ = now;
    double secs = std::chrono::duration<double>(now - start_).count();
    double mb = static_cast<double>(p.bytes_done) / 1e6, total = static_cast<double>(p.bytes_total) / 1e6;
    double rate = secs > 0 ? mb / secs : 0;
    double left = rate > 0 ? (total - mb) / rate : 0;
    std::fprintf(stderr, "\r\033[K%zu/%zu files  %.1f/%.1f MB  %.1f MB/s  %.0fs left", p.files_done,
                 p.files_total, mb, total, rate, left);
  }
  void finish() {
    if (enabled_) std::fprintf(stderr, "\r\033[K");
  }

 private:
  bool enabled_;
  std::chrono::steady_clock::time_point start_, last_{};
};

int run_index(const IndexArgs& a, const std::string& index_flag, CLI::App& app) {
  std::string path = resolve_index(index_flag);
  std::optional<IndexSettings> settings;
  // Analyzer settings count only when given: an existing index keeps its own.
  if (app.count("--language") || a.no_stopwords) {
    settings = IndexSettings{};
    settings->analyzer.language = a.language;
    settings->analyzer.stopwords = !a.no_stopwords;
  }
  WriterOptions wopts;
  wopts.batch_bytes = static_cast<std::size_t>(a.batch_mb * 1024 * 1024);
  auto writer = IndexWriter::open(path, settings, wopts);
  if (!writer) return fail(writer.status());

  IndexRunOptions opts;
  opts.crawl.include = a.include;
  opts.crawl.exclude = a.exclude;
  opts.crawl.hidden = a.hidden;
  opts.crawl.follow_symlinks = a.follow;
  opts.read.id_field = a.id_field;
  opts.read.title_field = a.title_field;
  opts.read.text_field = a.text_field;
  opts.read.max_file_bytes = static_cast<std::int64_t>(a.max_file_mb * 1024 * 1024);
  opts.remove_missing = !a.keep_missing;
  opts.cancelled = [] { return g_stop.load(); };
  std::signal(SIGINT, on_signal);
  std::signal(SIGTERM, on_signal);

  Progress progress(!a.quiet && stderr_is_tty());
  auto start = std::chrono::steady_clock::now();
  auto report = index_paths(**writer, a.paths, opts, [&](const IndexProgress& p) { progress.update(p); });
  progress.finish();
  if (!report) return fail(report.status());
  double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  for (auto& w : report->warnings) std::fprintf(stderr, "lode: warning: %s: %s\n", w.path.c_str(), w.message.c_str());
  for (auto& p : report->problems) std::fprintf(stderr, "lode: skipped %s: %s\n", p.path.c_str(), p.message.c_str());
  auto st = (*writer)->stats();
  if (!a.quiet)
    std::fprintf(stderr,
                 "%s%zu added, %zu updated, %zu unchanged, %zu removed, %zu failed; %zu documents read "
                 "(%.1f MB in %.2fs). Index %s: %llu documents, %llu terms.\n",
                 report->cancelled ? "Stopped early (committed what was done): " : "", report->added,
                 report->updated, report->unchanged, report->removed, report->failed, report->documents,
                 static_cast<double>(report->bytes_read) / 1e6, secs, path.c_str(),
                 static_cast<unsigned long long>(st.documents), static_cast<unsigned long long>(st.terms));
  if (report->cancelled) return kExitError;
  return report->failed > 0 ? kExitSomeFailed : kExitOk;
}

}  // namespace

Runner add_index_command(CLI::App& app, const std::string& index_flag) {
  auto a = std::make_shared<IndexArgs>();
  app.add_option("paths", a->paths, "folders or files to index")->required()->type_name("PATH");
  app.add_option("--language", a->language,
                 "Snowball stemmer for a new index, or 'none' (default english; fixed at creation)");
  app.add_flag("--no-stopwords", a->no_stopwords, "keep stopwords in a new index (fixed at creation)");
  app.add_option("--include", a->include, "only files matching this glob (repeatable; ** spans folders)")
      ->type_name("GLOB");
  app.add_option("--exclude", a->exclude, "skip files matching this glob (repeatable)")->type_name("GLOB");
  app.add_option("--id-field", a->id_field, "JSON Lines field holding the document id (default id)");
  app.add_option("--title-field", a->title_field, "JSON Lines field holding the title (default title)");
  app.add_option("--text-field", a->text_field, "JSON Lines field holding the text (default text)");
  app.add_option("--batch-mb", a->batch_mb, "memory for the in-memory batch before a commit (default 256)")
      ->check(CLI::Range(1.0, 65536.0));
  app.add_option("--max-file-mb", a->max_file_mb, "refuse files larger than this (default 1024)")
      ->check(CLI::Range(0.001, 1048576.0));
  app.add_flag("--hidden", a->hidden, "also index hidden files and folders");
  app.add_flag("--follow-links", a->follow, "follow symbolic links to folders");
  app.add_flag("--keep-missing", a->keep_missing, "keep indexed files that are gone from disk");
  app.add_flag("-q,--quiet", a->quiet, "no progress and no summary");
  return [a, &index_flag, &app] { return run_index(*a, index_flag, app); };
}

}  // namespace lode::cli
