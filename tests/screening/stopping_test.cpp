// The knee rule (Cormack & Grossman, SIGIR 2016) on gain curves whose knee
// and slope ratio are worked out by hand below, and the recall estimate's
// Wilson intervals against SciPy (Debian python3-scipy).
#include "explore/fixture.h"
#include "lode/screening.h"

using namespace lode;
using namespace lode::test;

namespace {
std::vector<bool> curve(std::size_t hits, std::size_t misses) {
  std::vector<bool> v(hits, true);
  v.insert(v.end(), misses, false);
  return v;
}
}  // namespace

TEST_CASE("knee: 10 relevant then 190 not — knee at 10, ratio 190 >= 146, stop") {
  // rho = (10/10) / ((10 - 10 + 1) / (200 - 10)) = 190; needed 156 - min(10, 150) = 146.
  KneeVerdict v = knee_check(curve(10, 190));
  CHECK(v.knee_reviewed == 10);
  CHECK(v.knee_found == 10);
  CHECK(v.slope_ratio == doctest::Approx(190.0));
  CHECK(v.needed == doctest::Approx(146.0));
  CHECK(v.stop);
}

TEST_CASE("knee: 10 relevant then 140 not — ratio 140 < 146, keep going") {
  KneeVerdict v = knee_check(curve(10, 140));
  CHECK(v.slope_ratio == doctest::Approx(140.0));
  CHECK_FALSE(v.stop);
}

TEST_CASE("knee: a steep ratio does not stop before the fewest documents to review") {
  KneeOptions o;
  o.min_reviewed = 300;  // raised from 150 so the 200-document curve above falls short
  KneeVerdict v = knee_check(curve(10, 190), o);
  CHECK(v.slope_ratio == doctest::Approx(190.0));
  CHECK_FALSE(v.stop);
  KneeVerdict w = knee_check(curve(150, 60));  // rho = 60 >= 156 - 150 = 6, 210 reviewed
  CHECK(w.slope_ratio == doctest::Approx(60.0));
  CHECK(w.stop);
}

TEST_CASE("knee: a straight line has no knee to stop at") {
  std::vector<bool> v;
  for (int i = 0; i < 400; ++i) v.push_back(i % 2 == 0);
  KneeVerdict k = knee_check(v);
  CHECK_FALSE(k.stop);
  CHECK(knee_check({}).stop == false);
}

TEST_CASE("recall estimate: Wilson intervals equal SciPy's") {
  TempDir dir;
  std::vector<std::pair<std::size_t, std::size_t>> cases = {{0, 50}, {3, 50}, {25, 50}, {50, 50}, {7, 400}};
  nlohmann::json in = nlohmann::json::array();
  for (auto& [k, n] : cases) in.push_back({k, n});
  auto ref = python_reference("tests/scripts/scipy_wilson.py", dir, in);
  for (std::size_t i = 0; i < cases.size(); ++i) {
    auto [lo, hi] = wilson_interval(cases[i].first, cases[i].second);
    CHECK(lo == doctest::Approx(ref[i][0].get<double>()).epsilon(1e-9).scale(1.0));
    CHECK(hi == doctest::Approx(ref[i][1].get<double>()).epsilon(1e-9).scale(1.0));
  }
}

TEST_CASE("recall estimate: 40 found, 2 of a 50-document sample relevant among 1000 left") {
  // p = 0.04: about 40 left, recall 40 / (40 + 40) = 0.5, found_now 42 counts the sample's two.
  RecallEstimate e = estimate_recall(40, 42, 1000, 50, 2);
  REQUIRE(e.known);
  CHECK(e.value == doctest::Approx(42.0 / 80.0));
  auto [lo, hi] = wilson_interval(2, 50);
  CHECK(e.low == doctest::Approx(42.0 / (40 + hi * 1000)));
  CHECK(e.high == doctest::Approx(std::min(1.0, 42.0 / (40 + lo * 1000))));
  CHECK(e.low < e.value);
  CHECK(e.value < e.high);
  CHECK_FALSE(estimate_recall(1, 1, 10, 0, 0).known);
}

TEST_CASE("batch sizes grow by a tenth, rounded up, to the cap") {
  SiftOptions o;
  std::vector<std::size_t> sizes;
  for (std::size_t n = 0; n < 12; ++n) sizes.push_back(o.batch_size(n));
  // 1, 1+1=2, 2+1=3, 3+1=4, ... 10+1=11, 11+2=13 (the published schedule)
  CHECK(sizes == std::vector<std::size_t>{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 13});
  o.max_batch = 5;
  CHECK(o.batch_size(100) == 5);
}
