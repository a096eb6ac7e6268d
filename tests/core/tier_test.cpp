// Impact tiers (lode/postings.h ImpactTier, src/index/tier.h): the top part
// holds exactly the live postings of largest length-normalised tf, and the
// rest points cover every other live posting, so that the walk's bound for
// a document outside the top part can never be too low.
#include <algorithm>
#include <random>

#include "index/tier.h"
#include "util.h"

using namespace lode;
using namespace lode::test;

TEST_CASE("an impact tier keeps the strongest live postings and bounds the rest") {
  std::mt19937 rng(99);
  std::vector<std::pair<std::string, std::string>> docs;
  for (int d = 0; d < 3000; ++d) {
    std::string body;
    const int len = 2 + static_cast<int>(rng() % 80);
    for (int i = 0; i < len; ++i) body += rng() % 4 == 0 ? "tide " : "w" + std::to_string(rng() % 500) + " ";
    docs.emplace_back("", body);
  }
  TempDir dir;
  const std::string path = dir.str("t.sqlite");
  build_index(path, docs, AnalyzerOptions{"none", false});
  {  // dead documents must stay out of both parts
    auto w = IndexWriter::open(path, IndexSettings{AnalyzerOptions{"none", false}}, WriterOptions{});
    REQUIRE(w.ok());
    for (int d = 1; d <= 3000; d += 7) REQUIRE((*w)->remove_file("/virtual/d" + std::to_string(d)).ok());
    REQUIRE((*w)->commit().ok());
  }
  ReaderOptions ro;
  ro.tier_min_postings = 500;  // "tide" is in ~2,300 live documents, "w7" in ~200
  ro.tier_share = 8;
  auto reader = IndexReader::open(path, ro);
  REQUIRE(reader.ok());
  auto scope = (*reader)->begin();
  REQUIRE(scope.ok());
  auto info = (*reader)->term(Field::kBody, "tide");
  REQUIRE(info.ok());
  REQUIRE(info->has_value());
  auto norms = (*reader)->norms();
  REQUIRE(norms.ok());
  const double avg = (*reader)->stats().average_length(Field::kBody);

  // Every live posting of the list, with its impact, the way the tier ranks them.
  struct P {
    DocId doc;
    std::uint32_t tf, length;
    double impact;
  };
  std::vector<P> live;
  auto cursor = (*reader)->postings(**info);
  for (; cursor->valid(); cursor->next())
    if ((*norms)->live(cursor->doc())) {
      const std::uint32_t len = (*norms)->length(cursor->doc(), Field::kBody);
      live.push_back(P{cursor->doc(), cursor->tf(), len, cursor->tf() / (0.25 + 0.75 * len / avg)});
    }
  REQUIRE(cursor->status().ok());
  REQUIRE(live.size() > 1000);

  auto tiers = (*reader)->impact_tiers({**info});
  REQUIRE(tiers.ok());
  REQUIRE(tiers->size() == 1);
  const auto& tier = (*tiers)[0];
  REQUIRE(tier);
  REQUIRE(tier->top->postings() == live.size() / 8);

  std::vector<DocId> top_docs;
  PostingCursor top(tier->top, nullptr);
  double weakest_top = 1e300;
  for (; top.valid(); top.next()) {
    auto it = std::find_if(live.begin(), live.end(), [&](const P& p) { return p.doc == top.doc(); });
    REQUIRE(it != live.end());  // a live posting of the list ...
    CHECK(top.tf() == it->tf);  // ... with its real tf
    weakest_top = std::min(weakest_top, it->impact);
    top_docs.push_back(top.doc());
  }
  REQUIRE(top.status().ok());
  CHECK(std::is_sorted(top_docs.begin(), top_docs.end()));
  for (const P& p : live) {
    if (std::binary_search(top_docs.begin(), top_docs.end(), p.doc)) continue;
    CHECK(p.impact <= weakest_top);  // nothing left out beats what was kept
    const bool covered = std::any_of(tier->rest_points.begin(), tier->rest_points.end(),
                                     [&](const BoundPoint& b) { return b.tf >= p.tf && b.length <= p.length; });
    CHECK(covered);
  }

  // Short lists get none; a second call is served from the cache.
  auto rare = (*reader)->term(Field::kBody, "w7");
  REQUIRE(rare.ok());
  REQUIRE(rare->has_value());
  auto again = (*reader)->impact_tiers({**info, **rare});
  REQUIRE(again.ok());
  CHECK((*again)[0] == tier);
  CHECK((*again)[1] == nullptr);
}
