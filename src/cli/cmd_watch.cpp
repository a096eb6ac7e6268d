// `lode watch PATH...`: index, then keep the index current until Ctrl-C.
#include <chrono>
#include <cstdio>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/index_args.h"
#include "lode/indexer.h"

namespace lode::cli {
namespace {

struct WatchArgs {
  IndexArgs index;
  int quiet_ms = 500;
};

int run_watch(const WatchArgs& a, const Setup& setup, CLI::App& app) {
  auto resolved = resolve_index_for_writing(setup);
  if (!resolved) return fail(resolved.status());
  const std::string path = *resolved;
  auto writer = IndexWriter::open(path, settings_from(a.index, app), writer_options_from(a.index));
  if (!writer) return fail(writer.status());
  IndexRunOptions opts = run_options_from(a.index);
  WatchOptions w;
  w.quiet_ms = a.quiet_ms;
  bool failed = false;
  auto status = watch_paths(**writer, a.index.paths, opts, w, [&](const WatchEvent& e) {
    if (e.type != WatchEvent::Type::kIndexed) {
      std::fprintf(stderr, "lode: watch: %s\n", e.message.c_str());
      return;
    }
    const IndexReport& r = *e.report;
    failed |= r.failed > 0;
    if (r.added + r.updated + r.renamed + r.removed + r.failed == 0) return;
    print_report(r, a.index.quiet, 0, path, (*writer)->stats());
  });
  if (!status.ok()) return fail(status);
  if (!a.index.quiet) std::fprintf(stderr, "lode: watch stopped; the index is committed\n");
  return failed ? kExitSomeFailed : kExitOk;
}

}  // namespace

Runner add_watch_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<WatchArgs>();
  add_index_options(app, a->index);
  app.add_option("--settle-ms", a->quiet_ms, "wait this long after the last change before indexing (default 500)")
      ->check(CLI::Range(10, 600000));
  return [a, &setup, &app] { return run_watch(*a, setup, app); };
}

}  // namespace lode::cli
