// Spherical k-means on l2-normalised sparse rows (private to src/explore;
// method in lode/themes.h). Exposed here so tests can start it from chosen
// centres and compare with an outside computation.
#pragma once

#include <cstdint>
#include <vector>

#include "lode/status.h"
#include "lode/vectors.h"

namespace lode::explore {

using Row = std::vector<std::pair<std::uint32_t, double>>;  // (column, weight), ascending columns
using Centres = std::vector<std::vector<double>>;           // k dense unit vectors

struct Rows {
  std::vector<DocId> docs;        // row i is document docs[i]
  std::vector<TermId> columns;    // column j is term columns[j]
  std::vector<Row> rows;          // l2-normalised; may be empty
};

// The vectors of `docs` restricted to terms with df >= min_df, renormalised;
// columns numbered in order of term id. REQUIRES: an active read scope.
Result<Rows> load_rows(VectorSource& src, const std::vector<DocId>& docs, std::uint64_t min_df);

double dot(const Row& r, const std::vector<double>& centre);

// k-means++ seeding (Arthur & Vassilvitskii 2007) with cosine distance
// 1 - cos: the first centre uniformly, each next one with probability
// proportional to the squared distance to the nearest chosen centre.
// Deterministic for `seed` (own integer-to-double step, no std distributions).
// REQUIRES: 1 <= k <= rows.size().
Centres kmeanspp(const std::vector<Row>& rows, std::size_t dims, std::size_t k, std::uint64_t seed);

struct KMeansResult {
  std::vector<std::uint32_t> assignment;  // centre of each row
  Centres centres;
  double objective = 0;   // sum over rows of cos(row, its centre)
  std::size_t iterations = 0;
  bool converged = false; // no assignment changed in the last iteration
};

// Lloyd iterations: assign each row to the centre of largest cosine (ties: the
// lower centre), move each centre to the normalised sum of its rows (an empty
// group keeps its centre); stop when no assignment changes or after
// max_iterations.
KMeansResult spherical_kmeans(const std::vector<Row>& rows, Centres centres, std::size_t max_iterations);

// Mean silhouette (Rousseeuw 1987) with cosine distance over `rows`, given a
// full distance matrix `dist` (row-major, n x n). Rows alone in their group
// score 0.
double silhouette(const std::vector<double>& dist, std::size_t n, const std::vector<std::uint32_t>& assignment,
                  std::size_t k);

}  // namespace lode::explore
