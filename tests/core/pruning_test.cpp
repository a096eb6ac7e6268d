// Pruned top-k retrieval (lode/topk.h) must return exactly what the
// exhaustive walk returns — same documents, same order, bit-identical scores —
// for every model and query form, while scoring fewer documents. The
// exhaustive walk (SearchOptions::count_all) is itself checked against a
// brute-force model in model_test.cpp.
#include <algorithm>
#include <random>

#include "lode/topk.h"
#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {

// A corpus with a skewed vocabulary (so common terms span many 128-posting
// blocks) and lengths from 3 to 300 words (so block bounds differ).
std::vector<std::pair<std::string, std::string>> skewed_corpus(std::mt19937& rng, int docs) {
  std::vector<double> weights;
  for (int i = 0; i < 300; ++i) weights.push_back(1.0 / (i + 1));
  std::discrete_distribution<int> pick(weights.begin(), weights.end());
  auto words = [&](std::size_t n) {
    std::string s;
    for (std::size_t i = 0; i < n; ++i) s += "w" + std::to_string(pick(rng)) + "x ";
    return s;
  };
  std::vector<std::pair<std::string, std::string>> out;
  for (int d = 0; d < docs; ++d) {
    std::size_t len = rng() % 4 == 0 ? 100 + rng() % 200 : 3 + rng() % 40;
    out.emplace_back(rng() % 3 ? words(1 + rng() % 6) : "", words(len));
  }
  return out;
}

std::string random_query(std::mt19937& rng) {
  std::vector<double> weights;
  for (int i = 0; i < 300; ++i) weights.push_back(1.0 / std::sqrt(i + 1.0));
  std::discrete_distribution<int> pick(weights.begin(), weights.end());
  auto word = [&] { return "w" + std::to_string(pick(rng)) + "x"; };
  std::string q;
  int n = 1 + static_cast<int>(rng() % 8);
  for (int i = 0; i < n; ++i) q += word() + " ";
  switch (rng() % 6) {  // now and then a clause that filters
    case 0: q += "+" + word(); break;
    case 1: q += "-" + word(); break;
    case 2: q += "\"" + word() + " " + word() + "\""; break;
    case 3: q += "title:" + word(); break;
    default: break;
  }
  return q;
}

}  // namespace

TEST_CASE("pruned retrieval returns exactly the exhaustive top k for every model") {
  std::mt19937 rng(4242);
  TempDir dir;
  const std::string path = dir.str("p.sqlite");
  // Commits of 300 documents that never refill: each common term's blocks
  // include a partial one every 300 documents, so block bounds are met on
  // blocks of every size.
  WriterOptions appending;
  appending.batch_documents = 300;
  appending.refill_max_terms = 0;
  build_index(path, skewed_corpus(rng, 4000), AnalyzerOptions{"none", false}, appending);
  // Twice: with the default impact tiers (too long for these lists: none),
  // and with tiers on every list of 64 postings or more, a quarter on top,
  // so that the walk's two passes and split terms are met on every model.
  ReaderOptions tiered;
  tiered.tier_min_postings = 64;
  tiered.tier_share = 4;
  for (const ReaderOptions& ro : {ReaderOptions{}, tiered}) {
    CAPTURE(ro.tier_min_postings);
    OpenIndex idx = open_index(path, ro);

    std::vector<SearchOptions> models(10);
    models[1].fields = FieldScoring::kSum;
    models[2].bm25 = {2.0, 1.0};  // b = 1: length norms reach 0 for empty titles
    models[3].model = Model::kTfIdf;  // lnc.ltc, the TF-IDF default
    models[4].model = Model::kTfIdf;
    models[4].smart = SmartWeighting::parse("nnn.ntc").value();
    models[5].model = Model::kTfIdf;
    models[5].smart = SmartWeighting::parse("rtn.ltc").value();
    models[6].model = Model::kTfIdf;  // lnc with natural logs: the tighter lnc bound must not apply
    models[6].smart.log_base = 2.718281828459045;
    models[7].model = Model::kTfIdf;  // lnc.ltc per field, summed (the TF-IDF default before joint fields)
    models[7].fields = FieldScoring::kSum;
    models[8].proximity.enabled = true;  // BM25TP over BM25F
    models[9].proximity.enabled = true;  // BM25TP over summed fields
    models[9].fields = FieldScoring::kSum;

    int pruned = 0, queries = 0;
    std::uint64_t scored_pruned = 0, scored_all = 0;
    for (int qi = 0; qi < 60; ++qi) {
      const std::string q = random_query(rng);
      for (std::size_t mi = 0; mi < models.size(); ++mi) {
        SearchOptions o = models[mi];
        o.snippets = false;
        o.top = std::size_t{1} + rng() % 20;
        o.offset = rng() % 3 == 0 ? rng() % 10 : 0;
        CAPTURE(q);
        CAPTURE(mi);
        CAPTURE(o.top);
        SearchOptions all = o;
        all.count_all = true;
        auto fast = idx.searcher->search(q, o);
        auto full = idx.searcher->search(q, all);
        REQUIRE(fast.ok());
        REQUIRE(full.ok());
        CHECK(full->matched_exact);
        REQUIRE(fast->hits.size() == full->hits.size());
        for (std::size_t i = 0; i < full->hits.size(); ++i) {
          CHECK(fast->hits[i].doc == full->hits[i].doc);
          CHECK(fast->hits[i].score == full->hits[i].score);  // the same arithmetic: bit-identical
          CHECK(fast->hits[i].breakdown.size() == full->hits[i].breakdown.size());
        }
        // The count is exact when it says so, and a lower bound otherwise.
        if (fast->matched_exact) CHECK(fast->matched == full->matched);
        CHECK(fast->matched <= full->matched);
        CHECK(fast->matched >= fast->hits.size());
        pruned += !fast->matched_exact;
        scored_pruned += fast->matched;
        scored_all += full->matched;
        ++queries;
      }
    }
    // Pruning must actually happen, or this test proves nothing about it. (The
    // joint TF-IDF models, four of the ten, bound a word only by its query
    // weight, so they prune fewer queries than BM25 does.)
    MESSAGE("pruned " << pruned << " of " << queries << " queries; scored " << scored_pruned << " of " << scored_all
                      << " matching documents");
    CHECK(pruned > queries / 3);
    CHECK(scored_pruned * 2 < scored_all);
  }
}

TEST_CASE("equal scores rank by the id users see, pruned or not, whatever order documents were indexed in") {
  // Identical documents score identically; both walks must keep every twin
  // tied with the last place so that the smallest external ids win, and an
  // index built in the reverse order must list the same hits.
  std::vector<std::pair<std::string, std::string>> docs;
  for (int i = 0; i < 600; ++i) docs.emplace_back("", i % 2 ? "amber falls amber" : "amber falls quietly here");
  // The winners: the odd documents (tf 2, shorter), ids d2 d4 ... d600, as strings.
  std::vector<std::string> winners;
  for (int i = 1; i < 600; i += 2) winners.push_back("d" + std::to_string(i + 1));
  std::sort(winners.begin(), winners.end());
  TempDir dir;
  const std::string forward = dir.str("t.sqlite"), backward = dir.str("r.sqlite");
  build_index(forward, docs, AnalyzerOptions{"none", false});
  {
    auto w = IndexWriter::open(backward, IndexSettings{AnalyzerOptions{"none", false}}, {});
    REQUIRE(w.ok());
    for (std::size_t i = docs.size(); i-- > 0;) {
      const std::string id = "d" + std::to_string(i + 1);
      FileRecord f{"/virtual/" + id, "/virtual", 1, 1, "h" + id, "text"};
      REQUIRE((*w)->put_file(f, {doc_input(id, docs[i].first, docs[i].second)}).ok());
    }
    REQUIRE((*w)->commit().ok());
  }
  for (const std::string& path : {forward, backward}) {
    CAPTURE(path);
    OpenIndex idx = open_index(path);
    for (std::size_t top : {1, 7, 40}) {
      for (std::size_t offset : {0, 3}) {
        SearchOptions o;
        o.top = top;
        o.offset = offset;
        o.snippets = false;
        auto fast = idx.searcher->search("amber falls", o);
        o.count_all = true;
        auto full = idx.searcher->search("amber falls", o);
        REQUIRE(fast.ok());
        REQUIRE(full.ok());
        REQUIRE(fast->hits.size() == top);
        REQUIRE(full->hits.size() == top);
        for (std::size_t i = 0; i < top; ++i) {
          CHECK(fast->hits[i].external_id == winners[offset + i]);
          CHECK(full->hits[i].external_id == winners[offset + i]);
          CHECK(fast->hits[i].score == full->hits[i].score);
        }
        CHECK(full->matched == 600);
        CHECK_FALSE(fast->matched_exact);
      }
    }
  }
}
