// bench_query — query latency on an existing index.
//
// Workload: a fixed query set (query_set.h; default 200 queries of 1-4 words,
// frequent and rare words, +required / -excluded words and 10% phrases, seed
// 7) run one after another on one thread through lode::Searcher, top 10:
//   bm25          BM25 k1=1.2 b=0.75, breakdown and snippets (the CLI default)
//   tfidf         TF-IDF cosine lnc.ltc, breakdown and snippets
//   bm25-rank     BM25, ranking only (no breakdown, no snippets)
//   tfidf-rank    lnc.ltc, ranking only
//   *-count-all   the two ranking-only runs without pruning (every match
//                 scored; the exhaustive baseline for lode/topk.h)
// Baselines beside them: lode::parse_query alone (syntax + analysis, no
// index), and varint-bm25-exhaustive (varint_baseline.h: an exhaustive
// one-field BM25 over plain varint blobs in memory, the naive reference).
// Each configuration runs the whole set once as warm-up (reported apart,
// excluded from the figures), then --repeat more times (fewer once --budget-s
// is spent; at least one); every query of every
// timed pass is one latency sample: mean, p50, p90, p99 (nearest rank), max,
// in ms, plus the mean thread CPU time per query (steadier than wall time on
// a busy machine). A table on stdout, then one JSON line (schema lode.bench_query/1).
//
//   bench_query --index FILE [--queries 200] [--repeat 5] [--seed 42]
//               [--query-seed 7] [--budget-s S] [--words-from-index] [--json-out FILE]
//               [--only CONFIG...]
#include <CLI/CLI.hpp>
#include <nlohmann/json.hpp>

#include <cstdio>
#include <fstream>
#include <algorithm>
#include <map>

#include "lode/query.h"
#include "lode/ranking.h"
#include "measure.h"
#include "query_set.h"
#include "varint_baseline.h"

using nlohmann::json;
using namespace lode;
using namespace lode::bench;

namespace {

struct Args {
  std::string index, label, json_out, dump_queries, queries_from;
  std::vector<std::string> only;  // configurations to run (empty: all)
  std::size_t queries = 200, vocab = 50'000;
  int repeat = 5;
  double budget_s = 0;
  std::uint64_t seed = 42, query_seed = 7;
  bool words_from_index = false;
};

int fail(const Status& s) {
  std::fprintf(stderr, "bench_query: %s\n", s.to_string().c_str());
  return 1;
}

json summary_json(const Summary& s) {
  return {{"n", s.n}, {"mean_ms", s.mean}, {"p50_ms", s.p50}, {"p90_ms", s.p90}, {"p99_ms", s.p99}, {"max_ms", s.max}};
}

// Times `run(query)` over the set: one warm-up pass, then `repeat` passes,
// fewer if the passes so far took over `budget_s` seconds (0 = no budget;
// one timed pass always runs).
template <typename Run>
json measure(const std::vector<BenchQuery>& set, int repeat, double budget_s, Run&& run) {
  std::vector<double> all, warm, cpu;
  std::map<std::string, std::vector<double>> by_kind;
  double matched = 0;
  std::size_t errors = 0;
  const double start = now_seconds();
  int passes = 0;
  for (int pass = 0; pass <= repeat; ++pass) {
    if (pass > 1 && budget_s > 0 && now_seconds() - start > budget_s) break;
    passes = pass;
    for (const BenchQuery& q : set) {
      const double t0 = now_seconds(), c0 = thread_cpu_seconds();
      const long long m = run(q.text);  // < 0: error
      const double ms = (now_seconds() - t0) * 1e3, cpu_ms = (thread_cpu_seconds() - c0) * 1e3;
      if (pass == 0) {
        warm.push_back(ms);
        if (m < 0) ++errors;
        else matched += static_cast<double>(m);
        continue;
      }
      all.push_back(ms);
      cpu.push_back(cpu_ms);
      by_kind[q.kind].push_back(ms);
    }
  }
  json kinds = json::object();
  for (auto& [k, v] : by_kind) kinds[k] = summary_json(summarize(v));
  return {{"all", summary_json(summarize(all))},
          {"cpu", summary_json(summarize(cpu))},
          {"warmup_pass", summary_json(summarize(warm))},
          {"by_kind", kinds},
          {"mean_matched", set.empty() ? 0 : matched / static_cast<double>(set.size())},
          {"timed_passes", passes},
          {"errors", errors}};
}

// A query set as --dump-queries writes it: kind TAB query, one a line.
Result<std::vector<BenchQuery>> read_query_set(const std::string& path) {
  std::ifstream in(path);
  if (!in) return Status::NotFound(path + ": cannot open the query set");
  std::vector<BenchQuery> set;
  std::string line;
  for (std::size_t n = 1; std::getline(in, line); ++n) {
    const auto tab = line.find('\t');
    if (tab == std::string::npos)
      return Status::InvalidArgument(path + ":" + std::to_string(n) + ": expected kind TAB query");
    set.push_back(BenchQuery{line.substr(tab + 1), line.substr(0, tab)});
  }
  if (set.empty()) return Status::InvalidArgument(path + ": no queries");
  return set;
}

int run(const Args& a) {
  auto reader = IndexReader::open(a.index);
  if (!reader) return fail(reader.status());
  auto analyzer = Analyzer::create((*reader)->settings().analyzer);
  if (!analyzer) return fail(analyzer.status());
  VocabularyOptions vo;
  vo.seed = a.seed;
  vo.surface_words = a.vocab;
  const Vocabulary vocab(vo);
  QuerySetOptions qo;
  qo.count = a.queries;
  qo.seed = a.query_seed;
  qo.vocabulary = a.words_from_index ? nullptr : &vocab;
  auto set = a.queries_from.empty() ? make_query_set(**reader, **analyzer, qo) : read_query_set(a.queries_from);
  if (!set) return fail(set.status());
  if (!a.dump_queries.empty()) {
    std::ofstream out(a.dump_queries);
    for (auto& q : *set) out << q.kind << '\t' << q.text << '\n';
  }
  auto searcher = Searcher::create(**reader);
  if (!searcher) return fail(searcher.status());
  CollectionStats stats;
  {
    auto scope = (*reader)->begin();
    if (!scope) return fail(scope.status());
    stats = (*reader)->stats();
  }

  json configs = json::array();
  auto wanted = [&](const char* name) {
    return a.only.empty() || std::find(a.only.begin(), a.only.end(), name) != a.only.end();
  };
  auto add = [&](const char* name, const json& m) {
    configs.push_back({{"config", name}, {"latency", m}});
    std::fprintf(stderr, "bench_query: %s: %zu samples, mean %.4f ms\n", name, m["all"]["n"].get<std::size_t>(),
                 m["all"]["mean_ms"].get<double>());
  };
  if (wanted("parse-only")) add("parse-only", measure(*set, a.repeat, a.budget_s, [&](const std::string& q) -> long long {
        auto parsed = parse_query(q, **analyzer);
        return parsed ? static_cast<long long>(parsed->clauses.size()) : -1;
      }));
  if (wanted("varint-bm25-exhaustive")) {
    auto scope = (*reader)->begin();
    if (!scope) return fail(scope.status());
    std::vector<std::string> texts;
    for (auto& q : *set) texts.push_back(q.text);
    auto baseline = VarintBaseline::build(**reader, **analyzer, texts);
    if (!baseline) return fail(baseline.status());
    std::fprintf(stderr, "bench_query: varint baseline holds %.1f MB\n", static_cast<double>(baseline->bytes()) / 1e6);
    add("varint-bm25-exhaustive", measure(*set, a.repeat, a.budget_s, [&](const std::string& q) -> long long {
          return baseline->run(q, 10);
        }));
  }
  struct Config {
    const char* name;
    Model model;
    bool full;
    bool count_all = false;  // exhaustive: pruning off, every match scored
  };
  const Result<SmartWeighting> lnc_ltc = SmartWeighting::parse("lnc.ltc");
  if (!lnc_ltc) return fail(lnc_ltc.status());
  for (const Config& c : {Config{"bm25", Model::kBm25, true}, Config{"tfidf-lnc.ltc", Model::kTfIdf, true},
                          Config{"bm25-rank", Model::kBm25, false}, Config{"tfidf-lnc.ltc-rank", Model::kTfIdf, false},
                          Config{"bm25-rank-count-all", Model::kBm25, false, true},
                          Config{"tfidf-lnc.ltc-rank-count-all", Model::kTfIdf, false, true}}) {
    if (!wanted(c.name)) continue;
    SearchOptions o;
    o.model = c.model;
    o.smart = lnc_ltc.value();
    o.breakdown = o.snippets = c.full;
    o.count_all = c.count_all;
    add(c.name, measure(*set, a.repeat, a.budget_s, [&](const std::string& q) -> long long {
          auto r = (*searcher)->search(q, o);
          return r ? static_cast<long long>(r->matched) : -1;
        }));
  }

  std::printf("\nlode bench_query%s%s — %s: %llu documents, %llu terms; %zu queries x up to %d timed passes\n",
              a.label.empty() ? "" : " ", a.label.c_str(), a.index.c_str(),
              static_cast<unsigned long long>(stats.documents), static_cast<unsigned long long>(stats.terms),
              set->size(), a.repeat);
  std::printf("  %-20s %9s %9s %9s %9s %9s %10s %10s %12s %7s\n", "config", "mean ms", "p50 ms", "p90 ms", "p99 ms",
              "max ms", "CPU ms", "warm-up ms", "avg matched", "errors");
  for (auto& c : configs) {
    const json& l = c["latency"];
    const json& s = l["all"];
    std::printf("  %-20s %9.4f %9.4f %9.4f %9.4f %9.4f %10.4f %10.4f %12.1f %7zu\n", c["config"].get<std::string>().c_str(),
                s["mean_ms"].get<double>(), s["p50_ms"].get<double>(), s["p90_ms"].get<double>(),
                s["p99_ms"].get<double>(), s["max_ms"].get<double>(), l["cpu"]["mean_ms"].get<double>(),
                l["warmup_pass"]["mean_ms"].get<double>(),
                l["mean_matched"].get<double>(), l["errors"].get<std::size_t>());
  }
  std::printf("  p50 / p99 ms by kind:\n");
  for (auto& c : configs) {
    std::printf("    %-18s", c["config"].get<std::string>().c_str());
    for (auto& [kind, s] : c["latency"]["by_kind"].items())
      std::printf("  %s %.4f/%.4f", kind.c_str(), s["p50_ms"].get<double>(), s["p99_ms"].get<double>());
    std::printf("\n");
  }
  json out = {{"schema", "lode.bench_query/1"}, {"label", a.label}, {"index", a.index},
              {"documents", stats.documents},  {"terms", stats.terms}, {"queries", set->size()},
              {"repeat", a.repeat},            {"configs", configs}};
  std::printf("%s\n", out.dump().c_str());
  if (!a.json_out.empty()) std::ofstream(a.json_out) << out.dump(2) << "\n";
  for (auto& c : configs)
    if (c["latency"]["errors"].get<std::size_t>() > 0) return 1;
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  Args a;
  CLI::App app{"Measures lode query latency (BM25 and TF-IDF) on an existing index."};
  app.add_option("--index", a.index, "index file to query")->required();
  app.add_option("--queries", a.queries, "queries in the set (default 200)")->check(CLI::Range(1, 1000000));
  app.add_option("--repeat", a.repeat, "timed passes over the set after the warm-up (default 5)")->check(CLI::Range(1, 1000));
  app.add_option("--seed", a.seed, "vocabulary seed: the corpus's gen_corpus --seed (default 42)");
  app.add_option("--vocab", a.vocab, "vocabulary size: the corpus's gen_corpus --vocab (default 50000)");
  app.add_option("--budget-s", a.budget_s, "stop adding timed passes to a configuration after this many seconds (default 0: none)");
  app.add_option("--query-seed", a.query_seed, "query set seed (default 7)");
  app.add_flag("--words-from-index", a.words_from_index, "draw words from stored documents, not the synthetic vocabulary");
  app.add_option("--dump-queries", a.dump_queries, "write the query set here (kind TAB query per line)");
  app.add_option("--queries-from", a.queries_from, "run this query set (as --dump-queries writes it) instead of a generated one");
  app.add_option("--label", a.label, "name for this run in the output");
  app.add_option("--only", a.only, "run only these configurations (e.g. bm25-rank varint-bm25-exhaustive)");
  app.add_option("--json-out", a.json_out, "also write the JSON result here");
  CLI11_PARSE(app, argc, argv);
  return run(a);
}
