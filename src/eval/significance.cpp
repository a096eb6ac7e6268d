// Paired significance tests over per-query metric values: the randomization
// (sign-flip permutation) test and Student's paired t-test. Method and
// choices are in docs/evaluation.md, "Significance".
#include <cmath>
#include <limits>
#include <random>

#include "lode/eval.h"

namespace lode {
namespace {

// Continued fraction of the regularized incomplete beta function I_x(a, b),
// evaluated by the modified Lentz method (DLMF 8.17.22).
double beta_fraction(double a, double b, double x) {
  constexpr double kTiny = 1e-300, kEps = 1e-16;
  auto guard = [](double v) { return std::abs(v) < kTiny ? kTiny : v; };
  double c = 1, d = 1 / guard(1 - (a + b) * x / (a + 1)), h = d;
  for (int m = 1; m <= 1000; ++m) {
    double dm = m;
    double even = dm * (b - dm) * x / ((a - 1 + 2 * dm) * (a + 2 * dm));
    d = 1 / guard(1 + even * d);
    c = guard(1 + even / c);
    h *= d * c;
    double odd = -(a + dm) * (a + b + dm) * x / ((a + 2 * dm) * (a + 1 + 2 * dm));
    d = 1 / guard(1 + odd * d);
    c = guard(1 + odd / c);
    double step = d * c;
    h *= step;
    if (std::abs(step - 1) < kEps) break;
  }
  return h;
}

double regularized_beta(double a, double b, double x) {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  double front = std::exp(std::lgamma(a + b) - std::lgamma(a) - std::lgamma(b) + a * std::log(x) +
                          b * std::log1p(-x));
  // The fraction converges fast only below the mean of the beta distribution; use the symmetry otherwise.
  if (x < (a + 1) / (a + b + 2)) return front * beta_fraction(a, b, x) / a;
  return 1 - front * beta_fraction(b, a, 1 - x) / b;
}

// Share of sign assignments whose |sum of ±d| reaches |observed| (see eval.h).
void randomization(const std::vector<double>& d, const PermutationOptions& o, PairedTest& out) {
  double observed = 0, scale = 0;
  for (double x : d) {
    observed += x;
    scale += std::abs(x);
  }
  // Sums of the same values in another order may differ in the last bits; count those as reaching.
  const double bar = std::abs(observed) - 1e-12 * std::max(1.0, scale);
  const std::size_t n = d.size();
  out.seed = o.seed;
  if (n < 63 && (std::uint64_t{1} << n) <= o.permutations) {
    std::uint64_t total = std::uint64_t{1} << n, reach = 0;
    for (std::uint64_t mask = 0; mask < total; ++mask) {
      double s = 0;
      for (std::size_t i = 0; i < n; ++i) s += (mask >> i) & 1 ? -d[i] : d[i];
      reach += std::abs(s) >= bar;
    }
    out.exact = true;
    out.permutations = static_cast<std::size_t>(total);
    out.randomization_p = static_cast<double>(reach) / static_cast<double>(total);
    return;
  }
  std::mt19937_64 rng(o.seed);  // fully specified by the standard: the same draws everywhere
  std::uint64_t reach = 0;
  for (std::size_t draw = 0; draw < o.permutations; ++draw) {
    double s = 0;
    std::uint64_t bits = 0;
    for (std::size_t i = 0; i < n; ++i) {
      if (i % 64 == 0) bits = rng();
      s += (bits >> (i % 64)) & 1 ? -d[i] : d[i];
    }
    reach += std::abs(s) >= bar;
  }
  out.exact = false;
  out.permutations = o.permutations;
  out.randomization_p = static_cast<double>(reach + 1) / static_cast<double>(o.permutations + 1);
}

}  // namespace

double student_t_p(double t, double df) {
  if (std::isnan(t)) return 1;
  if (std::isinf(t)) return 0;
  return regularized_beta(df / 2, 0.5, df / (df + t * t));
}

PairedTest paired_test(const std::vector<double>& a, const std::vector<double>& b, const PermutationOptions& o) {
  PairedTest r;
  r.n = a.size();
  std::vector<double> d(r.n);
  for (std::size_t i = 0; i < r.n; ++i) {
    d[i] = b[i] - a[i];
    r.mean_a += a[i];
    r.mean_b += b[i];
    r.mean_diff += d[i];
    (d[i] > 0 ? r.wins : d[i] < 0 ? r.losses : r.ties) += 1;
  }
  r.seed = o.seed;
  if (r.n < 2) return r;
  double n = static_cast<double>(r.n);
  r.mean_a /= n;
  r.mean_b /= n;
  r.mean_diff /= n;
  double ss = 0;
  for (double x : d) ss += (x - r.mean_diff) * (x - r.mean_diff);
  double se = std::sqrt(ss / (n - 1) / n);
  if (se > 0) {
    r.t = r.mean_diff / se;
    r.t_p = student_t_p(r.t, n - 1);
  } else {  // every difference equal: no spread to test against
    r.t = r.mean_diff == 0 ? 0 : std::copysign(std::numeric_limits<double>::infinity(), r.mean_diff);
    r.t_p = r.mean_diff == 0 ? 1 : 0;
  }
  randomization(d, o, r);
  return r;
}

Comparison compare_runs(const Run& a, const Run& b, const Qrels& qrels, const Metric& metric,
                        const EvalOptions& eval, const PermutationOptions& perm) {
  Comparison c;
  c.metric = metric;
  auto va = per_query_metric(a, qrels, metric, eval);
  auto vb = per_query_metric(b, qrels, metric, eval);
  std::vector<double> xa, xb;
  for (std::size_t i = 0; i < va.size(); ++i) {  // same judged queries, same order
    c.per_query.push_back(QueryDelta{va[i].first, va[i].second, vb[i].second});
    xa.push_back(va[i].second);
    xb.push_back(vb[i].second);
  }
  c.test = paired_test(xa, xb, perm);
  return c;
}

}  // namespace lode
