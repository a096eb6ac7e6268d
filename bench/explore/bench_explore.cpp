// bench_explore — timings of the explore features (not a test; no assertions).
//
// Workloads:
//   nearest INDEX [N=200] : similar_to_document for N seeded random live documents
//                          (default options: 30 query terms, 500 candidates);
//                          prints p50/p90/p99/max latency. Naive baseline in the
//                          same run: exhaustive cosine against every live document
//                          for 3 of the sources.
//   matrix INDEX OUT     : export_matrix with default options (count x log10 N/df,
//                          l2, body) to OUT.{mtx,terms,docs}; prints the time.
//   twins DIR SIZES...   : for each size n, builds DIR/twins-n.sqlite from an
//                          invented corpus (n/10 of the documents are edited
//                          copies, 80-200 words from a 20,000-word vocabulary),
//                          then times find_twins (threshold 0.8, 32 x 4 bands).
//                          Naive baseline: all-pairs exact cosine at the smallest
//                          size.
// Output: one JSON object per measurement on stdout.
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <random>
#include <string>

#include "lode/index.h"
#include "lode/matrix.h"
#include "lode/similar.h"
#include "lode/twins.h"
#include "lode/vectors.h"

using namespace lode;
using Clock = std::chrono::steady_clock;

namespace {

double seconds_since(Clock::time_point t) { return std::chrono::duration<double>(Clock::now() - t).count(); }

double percentile(std::vector<double> v, double p) {
  std::sort(v.begin(), v.end());
  auto i = static_cast<std::size_t>(p * static_cast<double>(v.size() - 1) + 0.5);
  return v[std::min(i, v.size() - 1)];
}

int die(const Status& s) {
  std::fprintf(stderr, "bench_explore: %s\n", s.to_string().c_str());
  return 1;
}

int bench_nearest(const std::string& path, std::size_t n) {
  auto reader = IndexReader::open(path);
  if (!reader) return die(reader.status());
  std::vector<DocId> live;
  {
    auto scope = (*reader)->begin();
    live = live_documents(**reader);
  }
  std::mt19937_64 rng(42);
  std::vector<double> ms;
  std::size_t hits = 0;
  for (std::size_t i = 0; i < n; ++i) {
    DocId d = live[rng() % live.size()];
    auto t = Clock::now();
    auto r = similar_to_document(**reader, d, SimilarOptions{});
    if (!r) return die(r.status());
    ms.push_back(seconds_since(t) * 1000);
    hits += r->hits.size();
  }
  // Naive baseline: exact cosine with every live document.
  double naive = 0;
  {
    auto scope = (*reader)->begin();
    VectorSource src(**reader, VectorOptions{});
    for (int q = 0; q < 3; ++q) {
      auto t = Clock::now();
      auto a = src.document(live[rng() % live.size()]);
      double best = 0;
      for (DocId d : live) best = std::max(best, cosine(*a, src.document(d).value()));
      naive += seconds_since(t) * 1000 / 3;
    }
  }
  nlohmann::json out{{"bench", "nearest"}, {"index", path}, {"documents", live.size()},
                     {"bytes", std::filesystem::file_size(path)}, {"queries", n},
                     {"p50_ms", percentile(ms, 0.5)}, {"p90_ms", percentile(ms, 0.9)},
                     {"p99_ms", percentile(ms, 0.99)}, {"max_ms", percentile(ms, 1.0)},
                     {"mean_hits", static_cast<double>(hits) / static_cast<double>(n)},
                     {"naive_exhaustive_ms", naive}};
  std::printf("%s\n", out.dump().c_str());
  return 0;
}

int bench_matrix(const std::string& path, const std::string& prefix) {
  auto reader = IndexReader::open(path);
  if (!reader) return die(reader.status());
  MatrixFiles files{prefix + ".mtx", prefix + ".terms", prefix + ".docs"};
  auto t = Clock::now();
  auto r = export_matrix(**reader, MatrixOptions{}, files);
  if (!r) return die(r.status());
  nlohmann::json out{{"bench", "matrix"}, {"index", path}, {"bytes", std::filesystem::file_size(path)},
                     {"rows", r->rows}, {"columns", r->columns}, {"entries", r->entries},
                     {"seconds", seconds_since(t)}, {"mtx_bytes", std::filesystem::file_size(files.matrix)}};
  std::printf("%s\n", out.dump().c_str());
  return 0;
}

std::string word(std::size_t i) {
  std::string w = "w";
  for (;; i = i / 26 - 1) {
    w += static_cast<char>('a' + i % 26);
    if (i < 26) break;
  }
  return w;
}

Status build_twins_index(const std::string& path, std::size_t n) {
  std::filesystem::remove(path);
  auto w = IndexWriter::open(path, IndexSettings{AnalyzerOptions{"none", false}});
  if (!w) return w.status();
  std::mt19937_64 rng(n);
  // Zipf-like: index = floor(V^u) favours low indices.
  auto pick = [&] { return word(static_cast<std::size_t>(std::pow(20000.0, static_cast<double>(rng() % 100000) / 1e5))); };
  std::vector<std::string> texts;
  for (std::size_t i = 0; i < n; ++i) {
    std::string t;
    if (i % 10 == 9) {  // an edited copy of an earlier document
      std::string src = texts[rng() % texts.size()], cur;
      for (char c : src + " ") {
        if (c != ' ') { cur += c; continue; }
        t += (t.empty() ? "" : " ") + (rng() % 100 < 5 ? pick() : cur);
        cur.clear();
      }
    } else {
      std::size_t len = 80 + rng() % 120;
      for (std::size_t k = 0; k < len; ++k) t += (k ? " " : "") + pick();
    }
    texts.push_back(t);
    std::string id = "t" + std::to_string(i);
    LODE_RETURN_IF_ERROR((*w)->put_file(FileRecord{"/virtual/" + id, "/virtual", 1, 1, id, "text"},
                                        {DocumentInput{id, "", t, "text"}}));
  }
  return (*w)->commit();
}

int bench_twins(const std::string& dir, const std::vector<std::size_t>& sizes) {
  for (std::size_t i = 0; i < sizes.size(); ++i) {
    std::string path = dir + "/twins-" + std::to_string(sizes[i]) + ".sqlite";
    auto st = build_twins_index(path, sizes[i]);
    if (!st.ok()) return die(st);
    auto reader = IndexReader::open(path);
    if (!reader) return die(reader.status());
    TwinOptions o;
    o.threshold = 0.8;
    auto t = Clock::now();
    auto r = find_twins(**reader, o);
    if (!r) return die(r.status());
    double secs = seconds_since(t);
    nlohmann::json out{{"bench", "twins"}, {"documents", r->documents}, {"seconds", secs},
                       {"candidate_pairs", r->candidate_pairs}, {"verified_pairs", r->verified_pairs},
                       {"groups", r->groups.size()}};
    if (i == 0) {  // naive baseline: every pair's exact cosine
      auto scope = (*reader)->begin();
      VectorSource src(**reader, o.vectors);
      auto t2 = Clock::now();
      std::vector<SparseVector> v;
      for (DocId d : live_documents(**reader)) v.push_back(src.document(d).value());
      std::size_t above = 0;
      for (std::size_t a = 0; a < v.size(); ++a)
        for (std::size_t b = a + 1; b < v.size(); ++b) above += cosine(v[a], v[b]) >= o.threshold;
      out["naive_all_pairs_seconds"] = seconds_since(t2);
      out["naive_pairs_above"] = above;
    }
    std::printf("%s\n", out.dump().c_str());
    std::fflush(stdout);
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  std::vector<std::string> a(argv + 1, argv + argc);
  if (a.size() >= 2 && a[0] == "nearest") return bench_nearest(a[1], a.size() > 2 ? std::stoul(a[2]) : 200);
  if (a.size() == 3 && a[0] == "matrix") return bench_matrix(a[1], a[2]);
  if (a.size() >= 3 && a[0] == "twins") {
    std::vector<std::size_t> sizes;
    for (std::size_t i = 2; i < a.size(); ++i) sizes.push_back(std::stoul(a[i]));
    return bench_twins(a[1], sizes);
  }
  std::fprintf(stderr,
               "usage: bench_explore nearest INDEX [N] | matrix INDEX OUT_PREFIX | twins DIR SIZE...\n");
  return 2;
}
