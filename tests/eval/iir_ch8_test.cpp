// Worked examples of chapter 8 ("Evaluation in information retrieval") of
// Manning, Raghavan & Schütze, "Introduction to Information Retrieval"
// (Cambridge University Press, 2008). The ranked lists and question wording
// are recalled from memory of the book's exercises in section 8.4
// ("Evaluation of ranked retrieval results"), as are the page numbers; the
// expected values are worked out by hand from the chapter's definitions
// (precision and recall, section 8.3, eq. 8.1-8.2 and F1 eq. 8.5; interpolated
// precision and MAP, section 8.4, eq. 8.8; R-precision, section 8.4).
#include <cmath>

#include "core/util.h"
#include "lode/eval.h"

using namespace lode;

namespace {

// "R N R ..." -> ranked ids d1..dn and judgments (R = relevant), plus
// `extra_relevant` relevant documents the list does not contain.
std::pair<std::vector<std::string>, std::map<std::string, int>> judged_list(const std::string& marks,
                                                                           int extra_relevant) {
  std::vector<std::string> ranked;
  std::map<std::string, int> judged;
  for (char c : marks) {
    if (c != 'R' && c != 'N') continue;
    std::string id = "d" + std::to_string(ranked.size() + 1);
    ranked.push_back(id);
    judged[id] = c == 'R' ? 1 : 0;
  }
  for (int i = 0; i < extra_relevant; ++i) judged["missed" + std::to_string(i)] = 1;
  return {ranked, judged};
}

}  // namespace

TEST_CASE("IIR 8.4 / Exercise 8.8 (p. 162 / recalled): 20 results / 6 relevant among them / 8 relevant in all") {
  auto [ranked, judged] = judged_list("R R N N N N N N R N R N N N R N N N N R", 2);
  REQUIRE(ranked.size() == 20);
  // a. precision on the top 20 = 6/20
  CHECK(precision_at(ranked, judged, 20) == doctest::Approx(0.30).epsilon(1e-12));
  // b. F1 on the top 20: P 0.3, R 6/8 = 0.75, F1 = 2PR/(P+R) = 0.428571...
  double p = precision_at(ranked, judged, 20), r = recall_at(ranked, judged, 20);
  CHECK(r == doctest::Approx(0.75).epsilon(1e-12));
  CHECK(2 * p * r / (p + r) == doctest::Approx(3.0 / 7.0).epsilon(1e-12));
  // c. uninterpolated precision at 25% recall: the 2nd relevant document is at rank 2 -> 1.0
  CHECK(precision_at(ranked, judged, 2) == 1.0);
  // d. interpolated precision at 33% recall: best precision at recall >= 1/3,
  //    i.e. from the 3rd relevant (rank 9) on: max(3/9, 4/11, 5/15, 6/20) = 4/11.
  //    lode's 11-point curve has 0.3 and 0.4; 1/3 lies between, with the same
  //    maximum as the 0.3 level here (recall 3/8 = 0.375 is the first above both).
  auto ip = interpolated_precision(ranked, judged);
  CHECK(ip[3] == doctest::Approx(4.0 / 11.0).epsilon(1e-12));
  CHECK(ip[4] == doctest::Approx(4.0 / 11.0).epsilon(1e-12));  // recall 4/8 reached at rank 11
  CHECK(ip[0] == 1.0);
  CHECK(ip[8] == 0.0);  // recall 0.8 is never reached (6/8 = 0.75)
  // e. MAP if these 20 are all the system returns: (1 + 1 + 3/9 + 4/11 + 5/15 + 6/20) / 8 = 0.416288...
  const double e = (1.0 + 1.0 + 3.0 / 9 + 4.0 / 11 + 5.0 / 15 + 6.0 / 20) / 8;
  CHECK(average_precision(ranked, judged) == doctest::Approx(e).epsilon(1e-12));
  CHECK(e == doctest::Approx(0.4163).epsilon(1e-4));
  // f. largest possible MAP with 10,000 ranked: the 2 missing ones at ranks 21 and 22.
  auto best = ranked;
  best.push_back("missed0");
  best.push_back("missed1");
  CHECK(average_precision(best, judged) == doctest::Approx(e + (7.0 / 21 + 8.0 / 22) / 8).epsilon(1e-12));
  // g. smallest: at ranks 9,999 and 10,000.
  auto worst = ranked;
  for (int i = 21; i <= 9998; ++i) worst.push_back("filler" + std::to_string(i));
  worst.push_back("missed0");
  worst.push_back("missed1");
  REQUIRE(worst.size() == 10000);
  CHECK(average_precision(worst, judged) == doctest::Approx(e + (7.0 / 9999 + 8.0 / 10000) / 8).epsilon(1e-12));
}

TEST_CASE("IIR 8.4 / Exercise 8.9 (p. 162 / recalled): two systems / 4 relevant documents / MAP and R-precision") {
  auto [s1, j1] = judged_list("R N R N N N N N R R", 0);
  auto [s2, j2] = judged_list("N R N N R R R N N N", 0);
  // Each list holds all 4 relevant documents.
  // a. System 1: (1/1 + 2/3 + 3/9 + 4/10)/4 = 0.6; System 2: (1/2 + 2/5 + 3/6 + 4/7)/4 = 0.492857...
  CHECK(average_precision(s1, j1) == doctest::Approx(0.6).epsilon(1e-12));
  CHECK(average_precision(s2, j2) == doctest::Approx((0.5 + 0.4 + 0.5 + 4.0 / 7) / 4).epsilon(1e-12));
  // c. R-precision (R = 4): System 1 has 2 relevant in its top 4, System 2 has 1.
  CHECK(r_precision(s1, j1) == 0.5);
  CHECK(r_precision(s2, j2) == 0.25);
  // Reciprocal rank: first relevant at rank 1 and 2.
  CHECK(reciprocal_rank(s1, j1) == 1.0);
  CHECK(reciprocal_rank(s2, j2) == 0.5);
}

TEST_CASE("IIR 8.3 / Exercise 8.1 (recalled): 8 relevant and 10 non-relevant returned / 20 relevant in all") {
  // Precision 8/18 = 0.444..., recall 8/20 = 0.4 (eq. 8.1-8.2); the order within the set does not matter.
  std::string marks = "RRRRRRRRNNNNNNNNNN";
  auto [ranked, judged] = judged_list(marks, 12);
  CHECK(precision_at(ranked, judged, 18) == doctest::Approx(8.0 / 18).epsilon(1e-12));
  CHECK(recall_at(ranked, judged, 18) == doctest::Approx(0.4).epsilon(1e-12));
}

TEST_CASE("nDCG with linear graded gains: a hand-computed list (lode's gain = grade / see docs/evaluation.md)") {
  // IIR eq. 8.9 uses the gain 2^grade - 1; lode, like scikit-learn's ndcg_score, uses the grade itself.
  // Ranked grades 3, 0, 2, 1; a fifth relevant document (grade 2) is missed.
  std::vector<std::string> ranked = {"a", "b", "c", "d"};
  std::map<std::string, int> judged = {{"a", 3}, {"b", 0}, {"c", 2}, {"d", 1}, {"e", 2}};
  double dcg = 3 / std::log2(2.0) + 2 / std::log2(4.0) + 1 / std::log2(5.0);
  double ideal = 3 / std::log2(2.0) + 2 / std::log2(3.0) + 2 / std::log2(4.0) + 1 / std::log2(5.0);
  CHECK(ndcg_at(ranked, judged, 10) == doctest::Approx(dcg / ideal).epsilon(1e-12));
  CHECK(ndcg_at(ranked, judged, 1) == 1.0);
  CHECK(judged_at(ranked, judged, 3) == 3);
}
