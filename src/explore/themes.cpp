// Topic groups: spherical k-means with a silhouette-suggested k (method in
// lode/themes.h).
#include <algorithm>
#include <numeric>

#include "explore/kmeans.h"
#include "explore/minhash.h"
#include "explore/terms.h"
#include "explore/top_n.h"
#include "lode/surface.h"
#include "lode/themes.h"

namespace lode {

Status ThemeOptions::check() const {
  LODE_RETURN_IF_ERROR(vectors.check());
  if (k == 1 || k > 1000) return Status::InvalidArgument("k must be 0 (suggest) or between 2 and 1000");
  if (k == 0 && (max_k < 2 || max_k > 100)) return Status::InvalidArgument("max k must be between 2 and 100");
  if (max_iterations == 0) return Status::InvalidArgument("max iterations must be at least 1");
  if (sample < 3 || sample > 20000) return Status::InvalidArgument("sample must be between 3 and 20000");
  if (max_documents < 2) return Status::InvalidArgument("max documents must be at least 2");
  return Status();
}

namespace {

// `n` of `items` chosen by a seeded shuffle, then sorted back into order.
template <typename T>
std::vector<T> seeded_sample(std::vector<T> items, std::size_t n, std::uint64_t seed) {
  if (items.size() <= n) return items;
  for (std::size_t i = 0; i < n; ++i) {
    std::size_t j = i + static_cast<std::size_t>(explore::mix64(seed ^ explore::mix64(i)) % (items.size() - i));
    std::swap(items[i], items[j]);
  }
  items.resize(n);
  std::sort(items.begin(), items.end());
  return items;
}

// The k with the best mean silhouette on a sample of `rows`.
std::size_t suggest_k(const std::vector<explore::Row>& rows, const ThemeOptions& o,
                      std::vector<std::pair<std::size_t, double>>& scores) {
  std::vector<std::size_t> all(rows.size());
  std::iota(all.begin(), all.end(), std::size_t{0});
  std::vector<explore::Row> sample;
  for (std::size_t i : seeded_sample(all, o.sample, o.seed)) sample.push_back(rows[i]);
  const std::size_t n = sample.size();
  std::size_t dims = 0;
  for (auto& r : sample)
    if (!r.empty()) dims = std::max<std::size_t>(dims, r.back().first + 1);
  std::vector<double> dist(n * n, 0.0);
  for (std::size_t i = 0; i < n; ++i) {
    std::vector<double> dense(dims, 0.0);
    for (auto& [j, w] : sample[i]) dense[j] = w;
    for (std::size_t j = i + 1; j < n; ++j) dist[i * n + j] = dist[j * n + i] = 1.0 - explore::dot(sample[j], dense);
  }
  std::size_t best = 2;
  double best_score = -2;
  for (std::size_t k = 2; k <= std::min(o.max_k, n - 1); ++k) {
    auto res = explore::spherical_kmeans(sample, explore::kmeanspp(sample, dims, k, o.seed), o.max_iterations);
    double s = explore::silhouette(dist, n, res.assignment, k);
    scores.emplace_back(k, s);
    if (s > best_score) best = k, best_score = s;
  }
  return best;
}

}  // namespace

Result<ThemeReport> find_themes(IndexReader& reader, const ThemeOptions& o) {
  LODE_RETURN_IF_ERROR(o.check());
  auto scope = reader.begin();
  if (!scope) return scope.status();
  VectorSource src(reader, o.vectors);
  ThemeReport report;
  std::vector<DocId> live = live_documents(reader);
  report.sampled = live.size() > o.max_documents;
  auto loaded = explore::load_rows(src, seeded_sample(live, o.max_documents, o.seed), o.min_df);
  if (!loaded) return loaded.status();
  // Documents left without terms (all below min_df) cannot be placed.
  explore::Rows data;
  for (std::size_t i = 0; i < loaded->rows.size(); ++i)
    if (!loaded->rows[i].empty()) {
      data.docs.push_back(loaded->docs[i]);
      data.rows.push_back(std::move(loaded->rows[i]));
    }
  data.columns = std::move(loaded->columns);
  const std::size_t n = data.rows.size();
  if (n < 3 || (o.k != 0 && o.k > n))
    return Status::InvalidArgument("too few documents with shared terms (" + std::to_string(n) + ") for " +
                                   (o.k ? std::to_string(o.k) + " groups" : std::string("grouping")));
  report.k = o.k;
  if (o.k == 0) {
    report.k = suggest_k(data.rows, o, report.silhouettes);
    report.k_suggested = true;
  }
  auto res = explore::spherical_kmeans(data.rows, explore::kmeanspp(data.rows, data.columns.size(), report.k, o.seed),
                                       o.max_iterations);
  report.objective = res.objective;
  report.iterations = res.iterations;
  report.converged = res.converged;
  report.documents = n;

  // Describe each group, then order groups by size. Its terms are shown as
  // the words its most central documents use (lode/surface.h): enough text to
  // count forms, little enough to read quickly (a bound, not tuned).
  constexpr std::size_t kWordSample = 50;
  auto analyzer = Analyzer::create(reader.settings().analyzer);
  if (!analyzer) return analyzer.status();
  std::vector<Theme> themes(report.k);
  std::vector<std::vector<std::pair<double, std::size_t>>> members(report.k);
  for (std::size_t i = 0; i < n; ++i) {
    auto g = res.assignment[i];
    double c = explore::dot(data.rows[i], res.centres[g]);
    members[g].emplace_back(c, i);
    themes[g].cohesion += c;
  }
  for (std::size_t g = 0; g < report.k; ++g) {
    Theme& t = themes[g];
    t.size = members[g].size();
    if (t.size) t.cohesion /= static_cast<double>(t.size);
    std::vector<TermWeight> centre;
    for (std::size_t j = 0; j < data.columns.size(); ++j)
      if (res.centres[g][j] > 0) centre.push_back({data.columns[j], res.centres[g][j]});
    auto named = explore::merge_fields(src, centre, o.top_terms);
    if (!named) return named.status();
    auto& m = members[g];
    explore::keep_top(m, std::max(o.top_documents, kWordSample), [](const auto& a, const auto& b) {
      return a.first != b.first ? a.first > b.first : a.second < b.second;
    });
    std::vector<std::string> wanted;
    for (auto& w : *named) wanted.push_back(w.term);
    SurfaceForms forms(wanted);
    for (auto& member : m)
      for (Field f : kAllFields) {
        if (o.vectors.field_weight[static_cast<std::size_t>(f)] == 0) continue;
        auto text = reader.stored_text(data.docs[member.second], f);
        if (!text) return text.status();
        forms.add(*text, **analyzer);
      }
    for (auto& w : *named) t.terms.push_back({w.term, forms.word(w.term), w.weight});
    if (m.size() > o.top_documents) m.resize(o.top_documents);
    for (auto& [c, i] : m) {
      auto doc = reader.document(data.docs[i]);
      if (!doc) return doc.status();
      t.central.push_back({data.docs[i], doc->external_id, doc->title, c});
    }
  }
  std::vector<std::uint32_t> order(report.k), rank(report.k);
  std::iota(order.begin(), order.end(), 0u);
  std::stable_sort(order.begin(), order.end(),
                   [&](std::uint32_t a, std::uint32_t b) { return themes[a].size > themes[b].size; });
  for (std::uint32_t r = 0; r < report.k; ++r) {
    rank[order[r]] = r;
    report.themes.push_back(std::move(themes[order[r]]));
  }
  report.docs = data.docs;
  for (auto g : res.assignment) report.group.push_back(rank[g]);
  return report;
}

}  // namespace lode
