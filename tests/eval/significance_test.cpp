// The paired randomization test and paired t-test against SciPy (Debian
// python3-scipy, run as /usr/bin/python3 by tests/scripts/scipy_significance.py):
// scipy.stats.ttest_rel to 1e-9, and scipy.stats.permutation_test
// (permutation_type="samples", two-sided). With 2^n within the permutation
// budget both enumerate every sign assignment and must agree to 1e-12; above
// it both sample N = 100000 assignments, and the two estimates may differ by
// Monte-Carlo error: each has standard error sqrt(p(1-p)/N), so the check
// allows 4.5 standard errors of the difference, sqrt(2 p(1-p)/N), plus 2/N
// for the two +1 conventions.
#include <cmath>
#include <nlohmann/json.hpp>
#include <random>

#include "core/util.h"
#include "lode/eval.h"

using namespace lode;
using namespace lode::test;

namespace {

// Per-query scores in [0,1] for a baseline and a system that is better by `shift` on average.
std::pair<std::vector<double>, std::vector<double>> paired(std::mt19937& rng, std::size_t n, double shift) {
  std::uniform_real_distribution<double> u(0, 1);
  std::normal_distribution<double> noise(shift, 0.15);
  std::vector<double> a, b;
  for (std::size_t i = 0; i < n; ++i) {
    double x = u(rng);
    a.push_back(x);
    b.push_back(std::clamp(x + noise(rng), 0.0, 1.0));
  }
  return {a, b};
}

nlohmann::json scipy(const nlohmann::json& input) {
  TempDir dir;
  write_file(dir.path() / "in.json", input.dump());
  int rc = 0;
  std::string out = run("/usr/bin/python3 " LODE_SOURCE_DIR "/tests/scripts/scipy_significance.py " +
                            dir.str("in.json") + " 2>&1",
                        &rc);
  REQUIRE_MESSAGE(rc == 0, "SciPy reference failed (install python3-scipy): " << out);
  return nlohmann::json::parse(out);
}

}  // namespace

TEST_CASE("paired t-test and exact randomization test equal SciPy's (n = 6..14)") {
  std::mt19937 rng(7);
  std::vector<std::pair<std::vector<double>, std::vector<double>>> cases;
  nlohmann::json input{{"cases", nlohmann::json::array()}};
  for (std::size_t n : {6, 9, 12, 14})
    for (double shift : {0.0, 0.05, 0.15}) {
      cases.push_back(paired(rng, n, shift));
      input["cases"].push_back({{"a", cases.back().first}, {"b", cases.back().second}, {"resamples", 100000}});
    }
  auto ref = scipy(input);
  for (std::size_t i = 0; i < cases.size(); ++i) {
    CAPTURE(i);
    PairedTest t = paired_test(cases[i].first, cases[i].second);
    CHECK(t.exact);
    CHECK(t.permutations == (std::size_t{1} << cases[i].first.size()));
    CHECK(std::abs(t.t - ref[i]["t"].get<double>()) < 1e-9 * std::max(1.0, std::abs(t.t)));
    CHECK(std::abs(t.t_p - ref[i]["t_p"].get<double>()) < 1e-9);
    CHECK(std::abs(t.randomization_p - ref[i]["perm_p"].get<double>()) < 1e-12);
  }
}

TEST_CASE("sampled randomization test agrees with SciPy within Monte-Carlo error (n = 40 / N = 100000)") {
  std::mt19937 rng(11);
  std::vector<std::pair<std::vector<double>, std::vector<double>>> cases;
  nlohmann::json input{{"cases", nlohmann::json::array()}};
  for (double shift : {0.0, 0.02, 0.04, 0.06}) {
    cases.push_back(paired(rng, 40, shift));
    input["cases"].push_back({{"a", cases.back().first}, {"b", cases.back().second}, {"resamples", 100000}});
  }
  auto ref = scipy(input);
  std::size_t informative = 0;
  for (std::size_t i = 0; i < cases.size(); ++i) {
    CAPTURE(i);
    PairedTest t = paired_test(cases[i].first, cases[i].second, PermutationOptions{100000, 20080707});
    CHECK(!t.exact);
    CHECK(t.permutations == 100000);
    double p_ref = ref[i]["perm_p"].get<double>();
    double p = std::clamp(p_ref, 1e-5, 1.0 - 1e-5);
    double allowed = 4.5 * std::sqrt(2 * p * (1 - p) / 100000) + 2.0 / 100000;
    CAPTURE(t.randomization_p);
    CAPTURE(p_ref);
    CHECK(std::abs(t.randomization_p - p_ref) <= allowed);
    CHECK(std::abs(t.t_p - ref[i]["t_p"].get<double>()) < 1e-9);
    informative += p_ref > 0.001 && p_ref < 0.9;
  }
  CHECK(informative >= 2);  // the cases span p-values where the tolerance is meaningful
}

TEST_CASE("randomization test: a fixed seed gives the same p-value / counts and edge cases") {
  std::mt19937 rng(3);
  auto [a, b] = paired(rng, 50, 0.03);
  PairedTest x = paired_test(a, b, {20000, 99}), y = paired_test(a, b, {20000, 99});
  CHECK(x.randomization_p == y.randomization_p);
  CHECK(x.seed == 99);
  CHECK(x.wins + x.ties + x.losses == 50);
  // Identical systems: every difference 0, nothing to detect.
  PairedTest same = paired_test(a, a);
  CHECK(same.ties == 50);
  CHECK(same.randomization_p == 1.0);
  CHECK(same.t_p == 1.0);
  // Fewer than two queries: no test.
  PairedTest one = paired_test({0.2}, {0.4});
  CHECK(one.t_p == 1.0);
  CHECK(one.randomization_p == 1.0);
  CHECK(one.wins == 1);
}

TEST_CASE("student_t_p: symmetric / 1 at t = 0 / and the normal limit for large df") {
  CHECK(student_t_p(0, 5) == doctest::Approx(1.0).epsilon(1e-14));
  CHECK(student_t_p(2.5, 7) == doctest::Approx(student_t_p(-2.5, 7)).epsilon(1e-14));
  // df -> infinity: two-sided normal p at 1.96 is 0.0499958 (erfc(1.96/sqrt 2)).
  CHECK(student_t_p(1.96, 1e7) == doctest::Approx(std::erfc(1.96 / std::sqrt(2.0))).epsilon(1e-6));
  // df = 1 is the Cauchy distribution: p = 1 - 2 atan(t)/pi.
  CHECK(student_t_p(3.0, 1) == doctest::Approx(1 - 2 * std::atan(3.0) / M_PI).epsilon(1e-12));
}
