// Spherical k-means, k-means++ seeding and the silhouette (see kmeans.h).
#include "explore/kmeans.h"

#include <algorithm>
#include <cmath>
#include <unordered_map>

#include "explore/minhash.h"

namespace lode::explore {

Result<Rows> load_rows(VectorSource& src, const std::vector<DocId>& docs, std::uint64_t min_df) {
  Rows out;
  std::unordered_map<TermId, std::uint32_t> column;
  std::vector<SparseVector> vecs;
  for (DocId d : docs) {
    auto v = src.document(d);
    if (!v) return v.status();
    SparseVector kept;
    for (auto& e : *v) {
      auto info = src.term(e.term);
      if (!info) return info.status();
      if ((*info)->df >= min_df) kept.push_back(e);
    }
    for (auto& e : kept) column.emplace(e.term, 0);
    vecs.push_back(std::move(kept));
  }
  for (auto& [id, col] : column) out.columns.push_back(id);
  std::sort(out.columns.begin(), out.columns.end());
  for (std::size_t j = 0; j < out.columns.size(); ++j) column[out.columns[j]] = static_cast<std::uint32_t>(j);
  out.docs = docs;
  for (auto& v : vecs) {
    double sq = 0;
    for (auto& e : v) sq += e.weight * e.weight;
    Row r;
    for (auto& e : v) r.emplace_back(column[e.term], e.weight / std::sqrt(sq));
    out.rows.push_back(std::move(r));  // terms ascending => columns ascending
  }
  return out;
}

double dot(const Row& r, const std::vector<double>& centre) {
  double s = 0;
  for (auto& [j, w] : r) s += w * centre[j];
  return s;
}

namespace {
// Uniform in [0, 1) from 53 bits of a counter-based stream.
double uniform(std::uint64_t seed, std::uint64_t& counter) {
  return static_cast<double>(mix64(seed ^ mix64(++counter)) >> 11) * 0x1.0p-53;
}

std::vector<double> dense(const Row& r, std::size_t dims) {
  std::vector<double> c(dims, 0.0);
  for (auto& [j, w] : r) c[j] = w;
  return c;
}
}  // namespace

Centres kmeanspp(const std::vector<Row>& rows, std::size_t dims, std::size_t k, std::uint64_t seed) {
  std::uint64_t counter = 0;
  const std::size_t n = rows.size();
  Centres centres;
  auto first = std::min(n - 1, static_cast<std::size_t>(uniform(seed, counter) * static_cast<double>(n)));
  centres.push_back(dense(rows[first], dims));
  std::vector<double> d2(n);
  for (std::size_t i = 0; i < n; ++i) d2[i] = std::pow(1.0 - dot(rows[i], centres[0]), 2);
  while (centres.size() < k) {
    double total = 0;
    for (double x : d2) total += x;
    std::size_t pick = 0;
    if (total > 0) {
      double target = uniform(seed, counter) * total, run = 0;
      for (pick = 0; pick + 1 < n; ++pick) {
        run += d2[pick];
        if (run > target) break;
      }
    } else {
      pick = std::min(n - 1, static_cast<std::size_t>(uniform(seed, counter) * static_cast<double>(n)));
    }
    centres.push_back(dense(rows[pick], dims));
    for (std::size_t i = 0; i < n; ++i) d2[i] = std::min(d2[i], std::pow(1.0 - dot(rows[i], centres.back()), 2));
  }
  return centres;
}

KMeansResult spherical_kmeans(const std::vector<Row>& rows, Centres centres, std::size_t max_iterations) {
  KMeansResult res;
  const std::size_t k = centres.size();
  const std::size_t dims = k ? centres[0].size() : 0;
  res.assignment.assign(rows.size(), 0);
  for (res.iterations = 0; res.iterations < max_iterations; ++res.iterations) {
    bool changed = false;
    res.objective = 0;
    for (std::size_t i = 0; i < rows.size(); ++i) {
      std::uint32_t best = 0;
      double best_cos = dot(rows[i], centres[0]);
      for (std::uint32_t c = 1; c < k; ++c) {
        double cs = dot(rows[i], centres[c]);
        if (cs > best_cos) best = c, best_cos = cs;
      }
      if (res.iterations == 0 || best != res.assignment[i]) changed = true;
      res.assignment[i] = best;
      res.objective += best_cos;
    }
    if (!changed) {
      res.converged = true;
      break;
    }
    Centres sums(k, std::vector<double>(dims, 0.0));
    for (std::size_t i = 0; i < rows.size(); ++i)
      for (auto& [j, w] : rows[i]) sums[res.assignment[i]][j] += w;
    for (std::size_t c = 0; c < k; ++c) {
      double sq = 0;
      for (double x : sums[c]) sq += x * x;
      if (sq <= 0) continue;  // empty group: keep its centre
      for (double& x : sums[c]) x /= std::sqrt(sq);
      centres[c] = std::move(sums[c]);
    }
  }
  res.centres = std::move(centres);
  return res;
}

double silhouette(const std::vector<double>& dist, std::size_t n, const std::vector<std::uint32_t>& assignment,
                  std::size_t k) {
  if (n == 0) return 0;
  std::vector<std::size_t> size(k, 0);
  for (auto a : assignment) ++size[a];
  double total = 0;
  std::vector<double> sum(k);
  for (std::size_t i = 0; i < n; ++i) {
    std::fill(sum.begin(), sum.end(), 0.0);
    for (std::size_t j = 0; j < n; ++j)
      if (j != i) sum[assignment[j]] += dist[i * n + j];
    std::uint32_t own = assignment[i];
    if (size[own] <= 1) continue;
    double a = sum[own] / static_cast<double>(size[own] - 1), b = INFINITY;
    for (std::size_t c = 0; c < k; ++c)
      if (c != own && size[c] > 0) b = std::min(b, sum[c] / static_cast<double>(size[c]));
    if (std::isfinite(b) && std::max(a, b) > 0) total += (b - a) / std::max(a, b);
  }
  return total / static_cast<double>(n);
}

}  // namespace lode::explore
