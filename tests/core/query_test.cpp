// Query syntax end to end: phrases, required and excluded clauses, fields, limits.
#include <set>

#include "lode/query.h"
#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {
std::set<std::string> ids(IndexReader& r, const std::string& q) {
  std::set<std::string> out;
  for (auto& [id, s] : scores_of(r, q, {})) out.insert(id);
  return out;
}
}  // namespace

TEST_CASE("query operators select the documents they promise") {
  TempDir dir;
  std::string index = dir.str("q.sqlite");
  build_index(index, {
                         {"Fog horn", "the fog horn sounded all night over the quay"},        // d1
                         {"Horn repairs", "new reed for the horn; fog cleared by noon"},      // d2
                         {"Storm of the century", "the storm flooded the generator house"},   // d3
                         {"Draft letter", "draft: the storm and the fog horn"},               // d4
                         {"Flow of air", "the flow of air through the lamp room vents"},      // d5
                     });
  auto r = IndexReader::open(index);
  REQUIRE(r.ok());
  CHECK(ids(**r, "fog horn") == std::set<std::string>{"d1", "d2", "d4"});
  CHECK(ids(**r, "\"fog horn\"") == std::set<std::string>{"d1", "d4"});           // adjacent, in order
  CHECK(ids(**r, "\"horn fog\"") == std::set<std::string>{"d2"});  // "horn; fog": punctuation is no gap
  CHECK(ids(**r, "+storm fog") == std::set<std::string>{"d3", "d4"});
  CHECK(ids(**r, "fog -draft") == std::set<std::string>{"d1", "d2"});
  CHECK(ids(**r, "fog -\"fog horn\"") == std::set<std::string>{"d2"});
  CHECK(ids(**r, "title:horn") == std::set<std::string>{"d1", "d2"});
  CHECK(ids(**r, "body:horn") == std::set<std::string>{"d1", "d2", "d4"});
  CHECK(ids(**r, "+title:storm") == std::set<std::string>{"d3"});
  CHECK(ids(**r, "\"flow of air\"") == std::set<std::string>{"d5"});  // stopword gap kept
  CHECK(ids(**r, "\"flow air\"").empty());
  CHECK(ids(**r, "\"unclosed fog") .empty());
  CHECK(ids(**r, "nosuchword").empty());

  auto searcher = Searcher::create(**r);
  REQUIRE(searcher.ok());
  auto res = (*searcher)->search("the fog", {});
  REQUIRE(res.ok());
  CHECK(res->warnings.size() == 1);  // "the" is a stopword
  CHECK(res->matched == 3);
}

TEST_CASE("plain reading ranks every word of the text and applies no syntax") {
  TempDir dir;
  std::string index = dir.str("p.sqlite");
  build_index(index, {
                         {"Fog horn", "the fog horn sounded all night over the quay"},       // d1
                         {"Horn repairs", "new reed for the horn; fog cleared by noon"},     // d2
                         {"Draft letter", "draft: the storm and the fog horn"},              // d3
                         {"Tide table", "high water at the quay, a draft of three metres"},  // d4
                     });
  auto r = IndexReader::open(index);
  REQUIRE(r.ok());
  SearchOptions plain;
  plain.reading = QueryReading::kPlain;
  auto scores = [&](const std::string& q, const SearchOptions& o) { return scores_of(**r, q, o); };
  // An unbalanced quote: as syntax the rest is one phrase that every match
  // must contain ("horn quay" occurs nowhere, so nothing matches); as plain
  // text the words rank on their own, exactly as if the quote were not there.
  CHECK(scores("fog \"horn quay", {}).empty());
  CHECK(scores("fog \"horn quay", plain) == scores("fog horn quay", plain));
  CHECK(scores("fog \"horn quay", plain).size() == 4);
  // A leading dash excludes as syntax, is a word as plain text.
  CHECK(scores("quay -draft", {}) == std::map<std::string, double>{{"d1", scores("quay", {}).at("d1")}});
  CHECK(scores("quay -draft", plain) == scores("quay draft", {}));
  // + and field:/filter prefixes are no syntax either: the same ranking as the bare words.
  CHECK(scores("+storm title:fog", plain) == scores("storm title fog", {}));
  CHECK(scores("@kind:pdf fog", plain) == scores("kind pdf fog", {}));
  auto q = Analyzer::create({});
  REQUIRE(q.ok());
  auto parsed = parse_query("+a \"fog horn -draft", **q, {}, QueryReading::kPlain);
  REQUIRE(parsed.ok());
  for (const Clause& c : parsed->clauses) {
    CHECK(c.occur == Occur::kShould);
    CHECK(!c.phrase);
    CHECK(!c.field);
  }
  CHECK(parsed->clauses.size() == 3);  // fog horn draft ("a" is a stopword)
  CHECK(query_reading_name(QueryReading::kPlain) == "plain");
}

TEST_CASE("query limits and bad input give clear errors") {
  TempDir dir;
  std::string index = dir.str("q.sqlite");
  build_index(index, {{"t", "some words"}});
  auto r = IndexReader::open(index);
  REQUIRE(r.ok());
  auto searcher = Searcher::create(**r);
  REQUIRE(searcher.ok());
  std::string huge;
  for (int i = 0; i < 10000; ++i) huge += "word" + std::to_string(i) + " ";
  SearchOptions o;
  o.limits.max_bytes = 1 << 20;
  auto res = (*searcher)->search(huge, o);
  REQUIRE_FALSE(res.ok());
  CHECK(res.status().code() == Code::kLimit);
  CHECK(res.status().message().find("1024") != std::string::npos);
  auto long_q = (*searcher)->search(std::string(20000, 'a'), {});
  CHECK(long_q.status().code() == Code::kLimit);
  auto bad = (*searcher)->search("kelp \xff", {});
  CHECK(bad.status().code() == Code::kInvalidArgument);
  SearchOptions neg;
  neg.bm25.k1 = -1;
  CHECK((*searcher)->search("words", neg).status().code() == Code::kInvalidArgument);
  CHECK(SmartWeighting::parse("lnx.ltc").status().message().find("'x'") != std::string::npos);
  CHECK(SmartWeighting::parse("lnc").status().code() == Code::kInvalidArgument);
  CHECK(SmartWeighting::parse("nnc.ntc")->notation() == "nnc.ntc");
}
