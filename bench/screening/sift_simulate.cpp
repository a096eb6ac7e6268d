// sift_simulate: plays a reviewer with a collection's judgments
// (docs/screening.md, "Measured").
//
//   sift_simulate DATASETS NAME... [--queries N] [--json FILE]
//
// For each collection DATASETS/NAME (docs.jsonl or docs.jsonl.gz, queries.tsv,
// qrels.txt) it builds a scratch index with default settings, then for every
// query with a relevant judgment: (1) runs a sift started from the query
// text, judging each proposed document from the qrels, until every relevant
// document is found, asking the knee rule after each batch; (2) reads the plain
// BM25 ranking (defaults) in order, then the unretrieved rest in index order.
// It prints one Markdown row per collection: mean documents judged to reach
// 80 / 95 / 100 % recall for each, WSS@95 (Cohen et al. 2006: the share of
// the collection left unread at 95 % recall, minus 0.05, the saving of
// random sampling), and how often the knee rule said stop before full recall
// and before 95 % recall, with the mean documents and recall where it did.
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <map>
#include <nlohmann/json.hpp>

#include "lode/eval.h"
#include "lode/indexer.h"
#include "lode/screening.h"

using namespace lode;
namespace fs = std::filesystem;

namespace {

struct Row {
  std::string name;
  std::size_t docs = 0, queries = 0;
  double cal[3] = {0, 0, 0}, bm25[3] = {0, 0, 0};  // mean documents read to 80/95/100 %
  double wss_cal = 0, wss_bm25 = 0;
  std::size_t stopped = 0, stopped_early = 0;       // knee stops; of those, before 95 %
  double stop_docs = 0, stop_recall = 0;            // means over queries where it stopped
};

constexpr double kLevels[3] = {0.8, 0.95, 1.0};

// Query text without lode's query syntax characters (the collections' queries are prose).
std::string plain(std::string q) {
  for (char& c : q)
    if (c == '+' || c == '-' || c == '"' || c == '@' || c == ':') c = ' ';
  return q;
}

void print_header() {
  std::printf("| collection | docs | queries | sift: judged to 80 / 95 / 100 %% | BM25 order: read to 80 / 95 / 100 %% "
              "| WSS@95 sift | WSS@95 BM25 | knee said stop before 100 %% | before 95 %% | mean docs / recall at that stop |\n");
  std::printf("|---|---:|---:|---|---|---:|---:|---:|---:|---|\n");
  std::fflush(stdout);
}

void print_row(const Row& r) {
  std::printf("| %s | %zu | %zu | %.1f / %.1f / %.1f | %.1f / %.1f / %.1f | %.3f | %.3f | %zu | %zu (%.1f %%) | %.0f / %.3f |\n",
              r.name.c_str(), r.docs, r.queries, r.cal[0], r.cal[1], r.cal[2], r.bm25[0], r.bm25[1], r.bm25[2],
              r.wss_cal, r.wss_bm25, r.stopped, r.stopped_early,
              100.0 * static_cast<double>(r.stopped_early) / static_cast<double>(std::max<std::size_t>(r.queries, 1)),
              r.stop_docs, r.stop_recall);
  std::fflush(stdout);
}

int fail(const Status& s) {
  std::fprintf(stderr, "sift_simulate: %s\n", s.to_string().c_str());
  return 1;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 3) {
    std::fprintf(stderr, "usage: sift_simulate DATASETS NAME... [--queries N] [--json FILE]\n");
    return 2;
  }
  std::string root = argv[1], json_out;
  std::vector<std::string> names;
  std::size_t max_queries = 0;
  for (int i = 2; i < argc; ++i) {
    std::string a = argv[i];
    if (a == "--queries" && i + 1 < argc) max_queries = std::stoul(argv[++i]);
    else if (a == "--json" && i + 1 < argc) json_out = argv[++i];
    else names.push_back(a);
  }
  print_header();
  nlohmann::json per_query = nlohmann::json::object();
  fs::path scratch = fs::temp_directory_path() / ("lode-sift-sim-" + std::to_string(::getpid()));
  fs::create_directories(scratch);
  for (const std::string& name : names) {
    std::string folder = root + "/" + name, index = (scratch / (name + ".sqlite")).string();
    {
      auto w = IndexWriter::open(index, IndexSettings{});
      if (!w) return fail(w.status());
      IndexRunOptions opts;
      opts.crawl.include = {"docs.jsonl", "docs.jsonl.gz"};
      opts.jobs = 1;
      auto rep = index_paths(**w, {folder}, opts);
      if (!rep) return fail(rep.status());
    }
    auto queries = read_queries(folder + "/queries.tsv");
    if (!queries) return fail(queries.status());
    auto qrels = read_qrels(folder + "/qrels.txt");
    if (!qrels) return fail(qrels.status());
    auto reader = IndexReader::open(index);
    if (!reader) return fail(reader.status());
    auto searcher = Searcher::create(**reader);
    if (!searcher) return fail(searcher.status());
    Row row;
    row.name = name;
    for (const QueryLine& q : *queries) {
      auto judged = qrels->find(q.id);
      if (judged == qrels->end()) continue;
      std::vector<DocId> relevant;
      std::map<DocId, bool> is_rel;
      {
        auto scope = (*reader)->begin();
        if (!scope) return fail(scope.status());
        row.docs = (*reader)->stats().documents;
        for (auto& [doc, grade] : judged->second) {
          if (grade <= 0) continue;
          auto id = (*reader)->find_external(doc);
          if (id) relevant.push_back(*id), is_rel[*id] = true;
        }
      }
      if (relevant.empty()) continue;
      if (max_queries && row.queries == max_queries) break;
      ++row.queries;
      // BM25 read in order, then the rest in index order.
      SearchOptions so;
      so.top = row.docs;
      so.snippets = so.breakdown = false;
      so.count_all = true;
      auto res = (*searcher)->search(plain(q.text), so);
      if (!res) return fail(res.status());
      std::vector<bool> bm25;
      std::map<DocId, bool> seen;
      for (auto& h : res->hits) bm25.push_back(is_rel.count(h.doc) > 0), seen[h.doc] = true;
      std::vector<DocId> all;
      {
        auto scope = (*reader)->begin();
        if (!scope) return fail(scope.status());
        all = live_documents(**reader);
        auto sim = simulate_sift(**reader, plain(q.text), relevant, SiftOptions{});
        if (!sim) return fail(sim.status());
        for (DocId d : all)
          if (!seen.count(d)) bm25.push_back(is_rel.count(d) > 0);
        nlohmann::json pq = {{"relevant", sim->relevant}};
        for (int l = 0; l < 3; ++l) {
          std::size_t c = sim->to_recall(kLevels[l]), b = read_to_recall(bm25, sim->relevant, kLevels[l]);
          row.cal[l] += static_cast<double>(c);
          row.bm25[l] += static_cast<double>(b);
          pq["cal"].push_back(c);
          pq["bm25"].push_back(b);
        }
        double n = static_cast<double>(row.docs);
        row.wss_cal += (n - static_cast<double>(sim->to_recall(0.95))) / n - 0.05;
        row.wss_bm25 += (n - static_cast<double>(read_to_recall(bm25, sim->relevant, 0.95))) / n - 0.05;
        pq["knee_stop"] = sim->knee_stop;
        if (sim->knee_stop) {
          std::size_t found = 0;
          for (std::size_t i = 0; i < sim->knee_stop; ++i) found += sim->order[i] ? 1 : 0;
          double recall = static_cast<double>(found) / static_cast<double>(sim->relevant);
          ++row.stopped;
          row.stopped_early += recall < 0.95 ? 1 : 0;
          row.stop_docs += static_cast<double>(sim->knee_stop);
          row.stop_recall += recall;
          pq["stop_recall"] = recall;
        }
        per_query[name][q.id] = pq;
      }
    }
    double nq = static_cast<double>(std::max<std::size_t>(row.queries, 1));
    for (int l = 0; l < 3; ++l) row.cal[l] /= nq, row.bm25[l] /= nq;
    row.wss_cal /= nq;
    row.wss_bm25 /= nq;
    if (row.stopped) row.stop_docs /= static_cast<double>(row.stopped), row.stop_recall /= static_cast<double>(row.stopped);
    print_row(row);
  }
  if (!json_out.empty()) std::ofstream(json_out) << per_query.dump(1) << "\n";
  fs::remove_all(scratch);
  return 0;
}
