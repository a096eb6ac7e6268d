#include "cli/index_args.h"

#include <atomic>
#include <csignal>
#include <cstdio>

#include "cli/common.h"

namespace lode::cli {
namespace {

// Set by SIGINT/SIGTERM; the indexer polls it between files, then commits.
std::atomic<bool> g_stop{false};  // signal handlers can reach nothing else
extern "C" void on_signal(int) { g_stop.store(true); }

std::int64_t mib(double mb) { return static_cast<std::int64_t>(mb * 1024 * 1024); }

}  // namespace

void add_index_options(CLI::App& app, IndexArgs& a) {
  app.add_option("paths", a.paths, "folders or files to index")->required()->type_name("PATH");
  app.add_option("--language", a.language,
                 "Snowball stemmer for a new index, or 'none' (default english; fixed at creation)");
  app.add_flag("--no-stopwords", a.no_stopwords, "keep stopwords in a new index (fixed at creation)");
  app.add_option("--include", a.include, "only files matching this glob (repeatable; ** spans folders)")
      ->type_name("GLOB");
  app.add_option("--exclude", a.exclude, "skip files matching this glob (repeatable)")->type_name("GLOB");
  app.add_option("--id-field", a.id_field, "JSON Lines field holding the document id (default id)");
  app.add_option("--title-field", a.title_field, "JSON Lines field holding the title (default title)");
  app.add_option("--text-field", a.text_field, "JSON Lines field holding the text (default text)");
  app.add_option("--batch-mb", a.batch_mb, "memory for the in-memory batch before a commit (default 256)")
      ->check(CLI::Range(1.0, 65536.0));
  app.add_option("--max-file-mb", a.max_file_mb, "refuse files larger than this (default 1024)")
      ->check(CLI::Range(0.001, 1048576.0));
  app.add_option("--max-text-mb", a.max_text_mb, "keep at most this much extracted text per file (default 64)")
      ->check(CLI::Range(0.001, 1048576.0));
  app.add_option("--max-unpacked-mb", a.max_unpacked_mb,
                 "refuse gzip files and DOCX/ODT/EPUB containers that expand past this (default 512)")
      ->check(CLI::Range(0.001, 1048576.0));
  app.add_option("--max-html-depth", a.max_html_depth, "refuse HTML nested deeper than this (default 512)")
      ->check(CLI::Range(8u, 1000000u));
  app.add_option("-j,--jobs", a.jobs, "extraction threads (default: one per core)")->check(CLI::Range(1u, 1024u));
  app.add_flag("--hidden", a.hidden, "also index hidden files and folders");
  app.add_flag("--follow-links", a.follow, "follow symbolic links to folders");
  app.add_flag("--keep-missing", a.keep_missing, "keep indexed files that are gone from disk");
  app.add_flag("-q,--quiet", a.quiet, "no progress and no summary");
}

std::optional<IndexSettings> settings_from(const IndexArgs& a, CLI::App& app) {
  // Analyzer settings count only when given: an existing index keeps its own.
  if (!app.count("--language") && !a.no_stopwords) return std::nullopt;
  IndexSettings s;
  s.analyzer.language = a.language;
  s.analyzer.stopwords = !a.no_stopwords;
  return s;
}

WriterOptions writer_options_from(const IndexArgs& a) {
  WriterOptions w;
  w.batch_bytes = static_cast<std::size_t>(mib(a.batch_mb));
  return w;
}

IndexRunOptions run_options_from(const IndexArgs& a) {
  IndexRunOptions o;
  o.crawl.include = a.include;
  o.crawl.exclude = a.exclude;
  o.crawl.hidden = a.hidden;
  o.crawl.follow_symlinks = a.follow;
  o.read.id_field = a.id_field;
  o.read.title_field = a.title_field;
  o.read.text_field = a.text_field;
  o.read.max_file_bytes = mib(a.max_file_mb);
  o.read.max_text_bytes = mib(a.max_text_mb);
  o.read.max_unpacked_bytes = mib(a.max_unpacked_mb);
  o.read.max_html_depth = a.max_html_depth;
  o.jobs = a.jobs;
  o.remove_missing = !a.keep_missing;
  o.cancelled = [] { return g_stop.load(); };
  std::signal(SIGINT, on_signal);
  std::signal(SIGTERM, on_signal);
  return o;
}

void print_report(const IndexReport& r, bool quiet, double seconds, const std::string& index_path,
                  const CollectionStats& st) {
  for (auto& w : r.warnings)
    std::fprintf(stderr, "lode: warning: %s: %s\n", shown(w.path, stderr).c_str(), shown(w.message, stderr).c_str());
  for (auto& p : r.problems)
    std::fprintf(stderr, "lode: skipped %s: %s\n", shown(p.path, stderr).c_str(), shown(p.message, stderr).c_str());
  if (quiet) return;
  for (auto& [kind, k] : r.by_kind)
    std::fprintf(stderr, "  %-9s %6zu read  %7zu documents  %9.1f MB  %5zu failed\n", kind.c_str(), k.files,
                 k.documents, static_cast<double>(k.bytes) / 1e6, k.failed);
  std::fprintf(stderr,
               "%s%zu added, %zu updated, %zu renamed, %zu unchanged, %zu removed, %zu failed, %zu binary or "
               "media skipped; %zu documents read (%.1f MB in %.2fs). Index %s: %llu documents, %llu terms.\n",
               r.cancelled ? "Stopped early (committed what was done): " : "", r.added, r.updated, r.renamed,
               r.unchanged, r.removed, r.failed, r.skipped, r.documents, static_cast<double>(r.bytes_read) / 1e6, seconds,
               index_path.c_str(), static_cast<unsigned long long>(st.documents),
               static_cast<unsigned long long>(st.terms));
}

}  // namespace lode::cli
