// gen_corpus — writes a deterministic synthetic English-like plain-text corpus.
//
// Workload produced (defaults): 1100 MB (10^6 bytes) of .txt files of 4-16 KiB
// (uniform), 1000 files per subfolder (0000/, 0001/, ...), text from a
// 50,000-surface-word Zipf vocabulary (vocab.h) in sentences and paragraphs
// (text_gen.h). Same seed and options => byte-identical corpus on any platform.
// A hidden stamp file (.lode-bench-corpus.json, skipped by lode's crawler)
// records the options and totals, so bench/run.sh can reuse a corpus.
//
//   gen_corpus --out DIR [--mb 1100] [--seed 42] [--min-kb 4] [--max-kb 16]
//              [--files-per-dir 1000] [--vocab 50000] [--zipf 1.0] [--zipf-q 1.0] [--ascii]
#include <CLI/CLI.hpp>
#include <nlohmann/json.hpp>

#include <chrono>
#include <cstdio>
#include <filesystem>
#include <string>

#include "rng.h"
#include "text_gen.h"
#include "vocab.h"

namespace fs = std::filesystem;
using lode::bench::Rng;

namespace {

struct Args {
  std::string out;
  double mb = 1100;
  std::uint64_t seed = 42;
  double min_kb = 4, max_kb = 16;
  std::size_t files_per_dir = 1000;
  std::size_t vocab = 50'000;
  double zipf = 1.0, zipf_q = 1.0;
  bool ascii = false;
};

bool write_file(const fs::path& path, const std::string& data) {
  std::FILE* f = std::fopen(path.c_str(), "wb");
  if (!f) return false;
  bool ok = std::fwrite(data.data(), 1, data.size(), f) == data.size();
  ok = std::fclose(f) == 0 && ok;
  return ok;
}

nlohmann::json options_json(const Args& a) {
  return {{"generator", "lode-bench gen_corpus/1"}, {"mb", a.mb}, {"seed", a.seed},
          {"min_kb", a.min_kb}, {"max_kb", a.max_kb}, {"files_per_dir", a.files_per_dir},
          {"vocab", a.vocab}, {"zipf", a.zipf}, {"zipf_q", a.zipf_q}, {"ascii", a.ascii}};
}

int run(const Args& a) {
  std::error_code ec;
  if (fs::exists(a.out, ec) && !fs::is_empty(a.out, ec)) {
    std::fprintf(stderr, "gen_corpus: %s exists and is not empty; remove it or pick another --out\n",
                 a.out.c_str());
    return 2;
  }
  if (!fs::create_directories(a.out, ec) && ec) {
    std::fprintf(stderr, "gen_corpus: cannot create %s: %s\n", a.out.c_str(), ec.message().c_str());
    return 1;
  }
  const auto start = std::chrono::steady_clock::now();
  lode::bench::VocabularyOptions vo;
  vo.seed = a.seed;
  vo.surface_words = a.vocab;
  vo.zipf_s = a.zipf;
  vo.zipf_q = a.zipf_q;
  lode::bench::TextOptions to;
  if (a.ascii) vo.accented_share = to.accented_share = to.dash_rate = 0;
  const lode::bench::Vocabulary vocab(vo);
  const lode::bench::TextGenerator gen(vocab, to);

  // One stream for the text, seeded apart from the vocabulary's.
  Rng rng(a.seed ^ 0x5EED0F7E47ULL);
  const auto target = static_cast<std::uint64_t>(a.mb * 1e6);
  const auto min_bytes = static_cast<std::size_t>(a.min_kb * 1024), max_bytes = static_cast<std::size_t>(a.max_kb * 1024);
  std::uint64_t total = 0;
  std::size_t files = 0;
  std::string text;
  char name[64];
  while (total < target) {
    const std::size_t dir = files / a.files_per_dir;
    std::snprintf(name, sizeof name, "%04zu", dir);
    const fs::path folder = fs::path(a.out) / name;
    if (files % a.files_per_dir == 0 && !fs::create_directories(folder, ec) && ec) {
      std::fprintf(stderr, "gen_corpus: cannot create %s: %s\n", folder.c_str(), ec.message().c_str());
      return 1;
    }
    text.clear();
    gen.document(rng.between(min_bytes, max_bytes), rng, text);
    std::snprintf(name, sizeof name, "%06zu.txt", files);
    const fs::path file = folder / name;
    if (!write_file(file, text)) {
      std::fprintf(stderr, "gen_corpus: cannot write %s\n", file.c_str());
      return 1;
    }
    total += text.size();
    ++files;
  }
  const double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();

  nlohmann::json stamp = options_json(a);
  stamp["files"] = files;
  stamp["bytes"] = total;
  stamp["lemmas"] = vocab.lemma_count();
  stamp["surface_words"] = vocab.surface_count();
  if (!write_file(fs::path(a.out) / ".lode-bench-corpus.json", stamp.dump() + "\n")) {
    std::fprintf(stderr, "gen_corpus: cannot write the stamp file in %s\n", a.out.c_str());
    return 1;
  }
  std::fprintf(stderr, "gen_corpus: %zu files, %.1f MB in %zu folders, %zu lemmas / %zu surface words, %.1fs\n",
               files, static_cast<double>(total) / 1e6, (files + a.files_per_dir - 1) / a.files_per_dir,
               vocab.lemma_count(), vocab.surface_count(), secs);
  std::printf("%s\n", stamp.dump().c_str());
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  Args a;
  CLI::App app{"Writes a deterministic synthetic English-like plain-text corpus for bench/."};
  app.add_option("--out", a.out, "folder to create (must be absent or empty)")->required();
  app.add_option("--mb", a.mb, "total size in MB (10^6 bytes), default 1100")->check(CLI::Range(0.001, 1e7));
  app.add_option("--seed", a.seed, "random seed, default 42");
  app.add_option("--min-kb", a.min_kb, "smallest file in KiB, default 4")->check(CLI::Range(0.1, 1e6));
  app.add_option("--max-kb", a.max_kb, "largest file in KiB, default 16")->check(CLI::Range(0.1, 1e6));
  app.add_option("--files-per-dir", a.files_per_dir, "files per subfolder, default 1000")->check(CLI::Range(1, 1000000));
  app.add_option("--vocab", a.vocab, "distinct surface words, default 50000")->check(CLI::Range(400, 10000000));
  app.add_option("--zipf", a.zipf, "Zipf exponent over lemma ranks, default 1.0")->check(CLI::Range(0.5, 2.0));
  app.add_option("--zipf-q", a.zipf_q, "Zipf-Mandelbrot rank offset, default 1.0")->check(CLI::Range(0.0, 100.0));
  app.add_flag("--ascii", a.ascii, "pure ASCII: no em dashes, no accented words");
  CLI11_PARSE(app, argc, argv);
  if (a.min_kb > a.max_kb) {
    std::fprintf(stderr, "gen_corpus: --min-kb (%g) is above --max-kb (%g)\n", a.min_kb, a.max_kb);
    return 2;
  }
  return run(a);
}
