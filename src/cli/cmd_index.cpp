// `lode index PATH...`: crawl, read and commit, with progress on a terminal.
#include <chrono>
#include <cstdio>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/index_args.h"
#include "lode/indexer.h"

namespace lode::cli {
namespace {

// One status line on stderr: files and MB done of total, rate, time left.
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
    double files_rate = secs > 0 ? static_cast<double>(p.files_done) / secs : 0;
    double left = rate > 0 ? (total - mb) / rate : 0;
    std::fprintf(stderr, "\r\033[K%zu/%zu files  %.1f/%.1f MB  %.1f MB/s  %.0f files/s  %.0fs left", p.files_done,
                 p.files_total, mb, total, rate, files_rate, left);
  }
  void finish() {
    if (enabled_) std::fprintf(stderr, "\r\033[K");
  }

 private:
  bool enabled_;
  std::chrono::steady_clock::time_point start_, last_{};
};

int run_index(const IndexArgs& a, const Setup& setup, CLI::App& app) {
  auto resolved = resolve_index_for_writing(setup);
  if (!resolved) return fail(resolved.status());
  const std::string path = *resolved;
  auto writer = IndexWriter::open(path, settings_from(a, app), writer_options_from(a));
  if (!writer) return fail(writer.status());
  IndexRunOptions opts = run_options_from(a);
  Progress progress(!a.quiet && stderr_is_tty());
  auto start = std::chrono::steady_clock::now();
  auto report = index_paths(**writer, a.paths, opts, [&](const IndexProgress& p) { progress.update(p); });
  progress.finish();
  if (!report) return fail(report.status());
  double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  print_report(*report, a.quiet, secs, path, (*writer)->stats());
  if (report->cancelled) return kExitError;
  return report->failed > 0 ? kExitSomeFailed : kExitOk;
}

}  // namespace

Runner add_index_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<IndexArgs>();
  add_index_options(app, *a);
  return [a, &setup, &app] { return run_index(*a, setup, app); };
}

}  // namespace lode::cli
