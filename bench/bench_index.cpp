// bench_index — indexing throughput, index size and peak memory.
//
// Workload: every file under --corpus (e.g. bench/run.sh's generated 1.1 GB of
// 4-16 KiB English-like .txt files, or sample_corpus/), english analyzer with
// stopwords removed (the CLI default), one thread, page cache warm.
// Measured, each phase in its own fresh process (so peak RSS is its own):
//   baseline  read every file with lode::read_file, then read + run
//             lode::Analyzer::analyze over title and body (no index);
//   index     lode::index_paths into a fresh SQLite index, once per --batch-mb
//             value: crawl, read, analyze, invert, flush, commit, close.
// Reported: wall and CPU time, MB/s (MB = 10^6 bytes of file), docs/s, the
// index/baseline throughput ratio, index size / raw bytes, bytes per posting
// (whole file, and postings+positions tables only), peak RSS (VmHWM and
// ru_maxrss, MiB) overall and per tenth of the corpus. A table on stdout, then
// one JSON line (schema lode.bench_index/1) as the last line and in --json-out.
//
//   bench_index --corpus DIR [--work DIR] [--batch-mb 64,256] [--keep-index PATH]
//               [--baseline-repeat N] [--index-repeat N] [--label NAME] [--json-out FILE]
#include <CLI/CLI.hpp>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <unistd.h>

#include "index_phases.h"
#include "measure.h"

namespace fs = std::filesystem;
using nlohmann::json;
using namespace lode::bench;

namespace {

struct Args {
  std::string corpus, work = "/tmp/lode-bench/work", keep_index, label, json_out, phase, index;
  std::vector<double> batch_mb = {256};
  int baseline_repeat = 1, index_repeat = 1;
};

// Runs one phase in a child process; its last stdout line is its JSON.
json child(const std::vector<std::string>& args) {
  ChildResult r = run_self(args);
  auto end = r.out.find_last_not_of('\n');
  auto start = end == std::string::npos ? 0 : r.out.rfind('\n', end);
  json j = json::parse(r.out.substr(start == std::string::npos ? 0 : start), nullptr, false);
  if (r.exit_code != 0 || j.is_discarded() || !j.is_object())
    return {{"error", "phase exited with " + std::to_string(r.exit_code) + ": " + r.out}};
  j["child_ru_maxrss_kib"] = r.maxrss_kib;
  return j;
}

// Removes an index and its SQLite companions (-wal, -shm) and writer lock.
void remove_index(const std::string& path) {
  std::error_code ec;
  for (const char* suffix : {"", "-wal", "-shm", ".lock"}) fs::remove(path + suffix, ec);
}

double mb(double bytes) { return bytes / 1e6; }
double num(const json& j, const char* key) { return j.contains(key) ? j[key].get<double>() : 0.0; }
double peak_mib(const json& j) {
  return std::max(num(j["memory"], "vm_hwm_kib"), num(j, "child_ru_maxrss_kib")) / 1024.0;
}

json summarize_index(const json& r, double baseline_mb_s) {
  const double bytes = num(r, "bytes"), wall = num(r, "wall_s");
  const double cpu = num(r, "cpu_user_s") + num(r, "cpu_sys_s");
  const double postings = num(r["stats"], "postings"), index_bytes = num(r, "index_bytes");
  const json& tb = r["table_bytes"];
  const double pp = num(tb, "postings") + num(tb, "positions");
  json s = {{"batch_mib", r["batch_mib"]},         {"wall_s", wall},
            {"mb_s", mb(bytes) / wall},            {"mb_per_cpu_s", cpu > 0 ? mb(bytes) / cpu : 0},
            {"docs_s", num(r, "documents") / wall}, {"ratio_to_baseline", baseline_mb_s > 0 ? mb(bytes) / wall / baseline_mb_s : 0},
            {"peak_rss_mib", peak_mib(r)},          {"index_bytes", index_bytes},
            {"index_to_raw", bytes > 0 ? index_bytes / bytes : 0},
            {"bytes_per_posting", postings > 0 ? index_bytes / postings : 0},
            {"postings_positions_bytes_per_posting", postings > 0 && pp > 0 ? pp / postings : 0},
            {"raw", r}};
  return s;
}

void print_table(const Args& a, const json& base, const json& runs) {
  const double bytes = num(base, "bytes");
  std::printf("\nlode bench_index%s%s — %s\n", a.label.empty() ? "" : " ", a.label.c_str(), a.corpus.c_str());
  std::printf("  %.0f files, %.1f MB, %.0f documents, %.0f words, %.0f index terms after stopwords\n",
              num(base, "files"), mb(bytes), num(base, "documents"), num(base, "words"), num(base, "tokens"));
  std::printf("  %-28s %9s %9s %9s %10s %10s %10s\n", "phase", "wall s", "CPU s", "MB/s", "MB/CPU-s", "docs/s",
              "peak MiB");
  auto row = [&](const char* name, const json& p, const char* peak) {
    const double w = num(p, "wall_s"), c = num(p, "cpu_user_s") + num(p, "cpu_sys_s");
    std::printf("  %-28s %9.2f %9.2f %9.1f %10.1f %10.0f %10s\n", name, w, c, mb(bytes) / w,
                c > 0 ? mb(bytes) / c : 0, num(base, "documents") / w, peak);
  };
  char peak[32];
  std::snprintf(peak, sizeof peak, "%.1f", peak_mib(base));
  row("baseline: read", base["read"], "(same)");
  row("baseline: read + analyze", base["read_analyze"], peak);
  for (auto& s : runs) {
    char name[64];
    std::snprintf(name, sizeof name, "index, batch %g MiB", num(s, "batch_mib"));
    const json& r = s["raw"];
    const double w = num(r, "wall_s"), c = num(r, "cpu_user_s") + num(r, "cpu_sys_s");
    std::printf("  %-28s %9.2f %9.2f %9.1f %10.1f %10.0f %10.1f\n", name, w, c, num(s, "mb_s"),
                num(s, "mb_per_cpu_s"), num(s, "docs_s"), num(s, "peak_rss_mib"));
  }
  for (auto& s : runs) {
    const json& r = s["raw"];
    std::printf("  batch %g MiB: %.2fx baseline throughput; index %.1f MB = %.2fx raw; %.0f postings, %.1f B/posting"
                " (postings+positions tables: %.1f B); %.0f terms; %.0f mid-run flushes took %.1f CPU s (%.1f s wall), the final one %.1f CPU s; longest pause %.2f s\n",
                num(s, "batch_mib"), num(s, "ratio_to_baseline"), mb(num(s, "index_bytes")), num(s, "index_to_raw"),
                num(r["stats"], "postings"), num(s, "bytes_per_posting"),
                num(s, "postings_positions_bytes_per_posting"), num(r["stats"], "terms"), num(r, "flushes_seen"),
                num(r, "flush_cpu_s"), num(r, "flush_wall_s"), num(r, "final_commit_cpu_s"), num(r, "longest_pause_s"));
    std::printf("    peak RSS MiB by tenth of the corpus:");
    for (auto& v : r["rss_peak_by_tenth_kib"]) std::printf(" %.0f", v.get<double>() / 1024.0);
    std::printf("\n");
  }
}

int orchestrate(const Args& a) {
  std::error_code ec;
  fs::create_directories(a.work, ec);
  const std::string corpus = fs::absolute(a.corpus).lexically_normal().string();
  json base = child({"--phase", "baseline", "--corpus", corpus, "--baseline-repeat", std::to_string(a.baseline_repeat)});
  if (base.contains("error")) {
    std::fprintf(stderr, "bench_index: baseline failed: %s\n", base["error"].get<std::string>().c_str());
    return 1;
  }
  const double base_mb_s = mb(num(base, "bytes")) / num(base["read_analyze"], "wall_s");
  json runs = json::array();
  std::string last_index;
  for (double b : a.batch_mb) {
    char name[64];
    std::snprintf(name, sizeof name, "index-b%g.sqlite", b);
    const std::string path = (fs::path(a.work) / name).string();
    std::vector<json> reps;
    for (int r = 0; r < std::max(1, a.index_repeat); ++r) {
      json j = child({"--phase", "index", "--corpus", corpus, "--index", path, "--batch-mb", std::to_string(b)});
      if (j.contains("error")) {
        std::fprintf(stderr, "bench_index: indexing failed: %s\n", j["error"].get<std::string>().c_str());
        return 1;
      }
      reps.push_back(j);
    }
    std::sort(reps.begin(), reps.end(), [](const json& x, const json& y) { return num(x, "wall_s") < num(y, "wall_s"); });
    json s = summarize_index(reps[reps.size() / 2], base_mb_s);  // the median run by wall time
    s["repeats_wall_s"] = json::array();
    for (auto& r : reps) s["repeats_wall_s"].push_back(r["wall_s"]);
    runs.push_back(s);
    if (!last_index.empty()) remove_index(last_index);
    last_index = path;
  }
  if (!a.keep_index.empty() && !last_index.empty()) {
    remove_index(a.keep_index);
    fs::rename(last_index, a.keep_index, ec);
    if (ec) std::fprintf(stderr, "bench_index: cannot move %s to %s: %s\n", last_index.c_str(), a.keep_index.c_str(), ec.message().c_str());
    remove_index(last_index);  // its lock and shared-memory files
  } else if (!last_index.empty()) {
    remove_index(last_index);
  }
  print_table(a, base, runs);
  json out = {{"schema", "lode.bench_index/1"},
              {"label", a.label},
              {"corpus", corpus},
              {"cores_online", std::max(1L, sysconf(_SC_NPROCESSORS_ONLN))},
              {"baseline",
               {{"read_mb_s", mb(num(base, "bytes")) / num(base["read"], "wall_s")},
                {"read_analyze_mb_s", base_mb_s},
                {"peak_rss_mib", peak_mib(base)},
                {"raw", base}}},
              {"index", runs}};
  std::printf("%s\n", out.dump().c_str());
  if (!a.json_out.empty()) std::ofstream(a.json_out) << out.dump(2) << "\n";
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  Args a;
  CLI::App app{"Measures lode indexing throughput, index size and peak RSS against a read+analyze baseline."};
  app.add_option("--corpus", a.corpus, "folder to index")->required();
  app.add_option("--work", a.work, "scratch folder for the index files (default /tmp/lode-bench/work)");
  app.add_option("--batch-mb", a.batch_mb, "writer batch sizes in MiB, comma-separated (default 256)")->delimiter(',');
  app.add_option("--keep-index", a.keep_index, "keep the last batch size's index at this path");
  app.add_option("--baseline-repeat", a.baseline_repeat, "baseline passes; the fastest counts (default 1)");
  app.add_option("--index-repeat", a.index_repeat, "indexing runs per batch size; the median counts (default 1)");
  app.add_option("--label", a.label, "name for this run in the output");
  app.add_option("--json-out", a.json_out, "also write the JSON result here");
  app.add_option("--phase", a.phase, "internal: run one phase in this process")->check(CLI::IsMember({"baseline", "index"}));
  app.add_option("--index", a.index, "internal: index path for --phase index");
  CLI11_PARSE(app, argc, argv);

  if (a.phase == "baseline") {
    json j = baseline_phase(a.corpus, a.baseline_repeat);
    std::printf("%s\n", j.dump().c_str());
    return j.contains("error") ? 1 : 0;
  }
  if (a.phase == "index") {
    json j = index_phase(a.corpus, a.index, a.batch_mb.empty() ? 256 : a.batch_mb.front());
    std::printf("%s\n", j.dump().c_str());
    return j.contains("error") ? 1 : 0;
  }
  return orchestrate(a);
}
