// Why-not and what-moved (lode/inspect.h) against plain searches of the same
// index: every rank and score they report is the one search gives.
#include <cmath>

#include "lode/inspect.h"
#include "screening/corpus.h"

using namespace lode;
using namespace lode::test;

namespace {

DocId id_of(IndexReader& r, const std::string& ext) {
  auto scope = r.begin();
  REQUIRE(scope.ok());
  auto id = r.find_external(ext);
  REQUIRE(id.ok());
  return *id;
}

std::vector<Hit> all_hits(Searcher& s, const std::string& q, SearchOptions o = {}) {
  o.top = 1000;
  o.snippets = false;
  auto r = s.search(q, o);
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  return r->hits;
}

double sum(const Hit& h) {
  double s = 0;
  for (auto& c : h.breakdown) s += c.contribution;
  return s;
}

}  // namespace

TEST_CASE("whynot: rank, score and the k-th hit agree with search") {
  TempDir dir;
  std::string path = dir.str("i.sqlite");
  build_index(path, keeper_notes());
  OpenIndex ix = open_index(path);
  auto hits = all_hits(*ix.searcher, "fog signal keeper");
  REQUIRE(hits.size() > 12);
  const Hit& target = hits[11];  // rank 12
  auto w = why_not(*ix.searcher, *ix.reader, "fog signal keeper", target.doc, SearchOptions{}, {5, 10000});
  REQUIRE_MESSAGE(w.ok(), w.status().to_string());
  CHECK(w->matches);
  REQUIRE(w->rank.has_value());
  CHECK(*w->rank == 12);
  CHECK(w->doc.score == doctest::Approx(target.score));
  REQUIRE(w->kth.has_value());
  CHECK(w->kth->doc == hits[4].doc);
  CHECK(w->kth->score == doctest::Approx(hits[4].score));
  CHECK(sum(w->doc) == doctest::Approx(w->doc.score));
  CHECK(sum(*w->kth) == doctest::Approx(w->kth->score));
  auto j = why_not_json("fog signal keeper", *w, SearchOptions{}, {5, 10000});
  CHECK(j["schema"] == kWhyNotSchema);
  CHECK(j["rank"] == 12);
}

TEST_CASE("whynot: names the lacking word and the clause that removes a document") {
  TempDir dir;
  std::string path = dir.str("i.sqlite");
  build_index(path, {{"", "fog horn sounded at night"},
                     {"", "horn fog at the quay"},
                     {"", "tide gauge readings"},
                     {"", "fog horn draft notes"}});
  OpenIndex ix = open_index(path);
  SearchOptions o;
  // d3 lacks both words: not retrieved, both words lacking.
  auto w3 = why_not(*ix.searcher, *ix.reader, "fog horn", id_of(*ix.reader, "d3"), o);
  REQUIRE(w3.ok());
  CHECK_FALSE(w3->matches);
  CHECK_FALSE(w3->rank.has_value());
  REQUIRE(w3->words.size() == 2);
  CHECK_FALSE(w3->words[0].in_body);
  CHECK(w3->doc.breakdown.empty());
  // d2 has both words but not as a phrase.
  auto w2 = why_not(*ix.searcher, *ix.reader, "\"fog horn\"", id_of(*ix.reader, "d2"), o);
  REQUIRE(w2.ok());
  CHECK_FALSE(w2->matches);
  REQUIRE(w2->clauses.size() == 1);
  CHECK(w2->clauses[0].kind == "phrase");
  CHECK_FALSE(w2->clauses[0].holds);
  CHECK(w2->words[0].in_body);
  // d4 is excluded by -draft; d1 is not.
  auto w4 = why_not(*ix.searcher, *ix.reader, "fog -draft", id_of(*ix.reader, "d4"), o);
  REQUIRE(w4.ok());
  CHECK_FALSE(w4->matches);
  REQUIRE(w4->clauses.size() == 1);
  CHECK(w4->clauses[0].kind == "excluded");
  CHECK_FALSE(w4->clauses[0].holds);
  auto w1 = why_not(*ix.searcher, *ix.reader, "fog -draft +sounded", id_of(*ix.reader, "d1"), o);
  REQUIRE(w1.ok());
  CHECK(w1->matches);
  CHECK(w1->rank == std::optional<std::size_t>(1));
  for (auto& c : w1->clauses) CHECK(c.holds);
  // A filter: d1's id does not start with d2.
  auto wf = why_not(*ix.searcher, *ix.reader, "fog @in:d2", id_of(*ix.reader, "d1"), o);
  REQUIRE(wf.ok());
  CHECK_FALSE(wf->matches);
  REQUIRE(wf->clauses.size() == 1);
  CHECK(wf->clauses[0].kind == "filter");
  CHECK_FALSE(wf->clauses[0].holds);
  // A required word d3 lacks.
  auto wr = why_not(*ix.searcher, *ix.reader, "tide +fog", id_of(*ix.reader, "d3"), o);
  REQUIRE(wr.ok());
  CHECK_FALSE(wr->matches);
  CHECK(wr->clauses[0].kind == "required");
  CHECK_FALSE(wr->clauses[0].holds);
}

TEST_CASE("moved: ranks and scores equal two separate searches, shifts are the changed contributions") {
  TempDir dir;
  std::string path = dir.str("i.sqlite");
  build_index(path, keeper_notes());
  OpenIndex ix = open_index(path);
  SearchOptions a, b;
  b.bm25 = {2.0, 0.2};
  b.field_weight = {0.0, 1.0};
  const std::string q = "fog signal keeper night";
  auto ha = all_hits(*ix.searcher, q, a), hb = all_hits(*ix.searcher, q, b);
  MovedOptions mo;
  mo.depth = 10;
  auto m = what_moved(*ix.searcher, q, a, b, mo);
  REQUIRE_MESSAGE(m.ok(), m.status().to_string());
  std::size_t entered = 0, left = 0;
  for (auto& d : m->docs) {
    auto rank_in = [&](const std::vector<Hit>& hs) -> std::optional<std::size_t> {
      for (std::size_t i = 0; i < hs.size() && i < mo.depth; ++i)
        if (hs[i].doc == d.after.doc) return i + 1;
      return std::nullopt;
    };
    CHECK(d.rank_before == rank_in(ha));
    CHECK(d.rank_after == rank_in(hb));
    entered += d.change == "entered";
    left += d.change == "left";
    double delta = 0;
    for (auto& s : d.shifts) delta += s.after - s.before;
    CHECK(delta == doctest::Approx(d.after.score - d.before.score).epsilon(1e-9));
  }
  CHECK(entered == m->entered);
  CHECK(left == m->left);
  CHECK(m->entered == m->left);  // both lists hold `depth` documents
  CHECK(m->docs.size() == mo.depth + m->left);
  auto j = moved_json(q, *m, a, b, mo);
  CHECK(j["after"]["k1"] == 2.0);
}
