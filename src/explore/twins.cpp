// Near-duplicates: MinHash + LSH banding for candidates, exact cosine to
// verify, union-find to group (method in lode/twins.h).
#include <algorithm>
#include <numeric>
#include <unordered_set>

#include "explore/minhash.h"
#include "lode/twins.h"

namespace lode {

Status TwinOptions::check() const {
  LODE_RETURN_IF_ERROR(vectors.check());
  if (!(threshold > 0 && threshold <= 1)) return Status::InvalidArgument("threshold must be in (0, 1]");
  if (shingle == 0 || shingle > 16) return Status::InvalidArgument("shingle must be between 1 and 16 words");
  if (bands == 0 || rows == 0 || bands * rows > 1024)
    return Status::InvalidArgument("bands and rows must be at least 1, with bands x rows at most 1024");
  return Status();
}

namespace {

// The shingle hashes of one document: its vector's dimensions (k = 1), or
// runs of k index terms of its stored, re-analyzed text.
Result<std::vector<std::uint64_t>> doc_shingles(IndexReader& reader, Analyzer* analyzer, DocId doc,
                                                const SparseVector& v, const TwinOptions& o) {
  std::vector<std::uint64_t> items;
  if (o.shingle == 1) {
    std::vector<TermWeight> heavy(v.begin(), v.end());
    if (o.top_terms != 0 && heavy.size() > o.top_terms) {
      auto heavier = [](const TermWeight& a, const TermWeight& b) {
        return a.weight != b.weight ? a.weight > b.weight : a.term < b.term;
      };
      std::nth_element(heavy.begin(), heavy.begin() + static_cast<std::ptrdiff_t>(o.top_terms), heavy.end(), heavier);
      heavy.resize(o.top_terms);
    }
    for (auto& e : heavy) items.push_back(static_cast<std::uint64_t>(e.term));
    return explore::shingles(items, 1);
  }
  std::vector<std::uint64_t> all;
  for (Field f : kAllFields) {
    if (o.vectors.field_weight[static_cast<std::size_t>(f)] == 0) continue;
    auto text = reader.stored_text(doc, f);
    if (!text) return text.status();
    items.clear();
    for (auto& t : analyzer->analyze(*text).tokens) items.push_back(explore::hash_text(t.term));
    auto sh = explore::shingles(items, o.shingle);
    all.insert(all.end(), sh.begin(), sh.end());
  }
  std::sort(all.begin(), all.end());
  all.erase(std::unique(all.begin(), all.end()), all.end());
  return all;
}

struct UnionFind {
  std::vector<std::size_t> parent;
  explicit UnionFind(std::size_t n) : parent(n) { std::iota(parent.begin(), parent.end(), std::size_t{0}); }
  std::size_t find(std::size_t x) {
    while (parent[x] != x) x = parent[x] = parent[parent[x]];
    return x;
  }
  void join(std::size_t a, std::size_t b) {
    a = find(a), b = find(b);
    if (a != b) parent[std::max(a, b)] = std::min(a, b);
  }
};

}  // namespace

Result<TwinReport> find_twins(IndexReader& reader, const TwinOptions& o) {
  LODE_RETURN_IF_ERROR(o.check());
  std::unique_ptr<Analyzer> analyzer;
  if (o.shingle > 1) {
    auto a = Analyzer::create(reader.settings().analyzer);
    if (!a) return a.status();
    analyzer = std::move(a.value());
  }
  auto scope = reader.begin();
  if (!scope) return scope.status();
  VectorSource src(reader, o.vectors);
  std::vector<DocId> docs = live_documents(reader);
  TwinReport report;
  report.documents = docs.size();

  // 1. Signatures; documents without shingles take no part.
  explore::MinHasher hasher(o.bands * o.rows, o.seed);
  std::vector<std::vector<std::uint64_t>> sigs(docs.size());
  for (std::size_t i = 0; i < docs.size(); ++i) {
    auto v = src.document(docs[i]);
    if (!v) return v.status();
    auto sh = doc_shingles(reader, analyzer.get(), docs[i], *v, o);
    if (!sh) return sh.status();
    if (!sh->empty() && !v->empty()) sigs[i] = hasher.signature(*sh);
    if (o.progress && (i % 1024 == 0 || i + 1 == docs.size())) o.progress(i + 1, docs.size());
  }

  // 2. Banding: equal band keys make candidate pairs (indices into docs).
  std::unordered_set<std::uint64_t> candidates;
  std::vector<std::pair<std::uint64_t, std::uint32_t>> keys;
  for (std::size_t b = 0; b < o.bands; ++b) {
    keys.clear();
    for (std::size_t i = 0; i < docs.size(); ++i)
      if (!sigs[i].empty()) keys.emplace_back(explore::band_key(sigs[i], b, o.rows), static_cast<std::uint32_t>(i));
    std::sort(keys.begin(), keys.end());
    for (std::size_t s = 0, e; s < keys.size(); s = e) {
      for (e = s + 1; e < keys.size() && keys[e].first == keys[s].first;) ++e;
      for (std::size_t x = s; x < e; ++x)
        for (std::size_t y = x + 1; y < e; ++y)
          candidates.insert(std::uint64_t{keys[x].second} << 32 | keys[y].second);
    }
  }
  report.candidate_pairs = candidates.size();

  // 3. Verify by exact cosine (vectors read again: pairs come ordered by
  // their first document, which is read once per run), group with union-find.
  std::vector<std::uint64_t> ordered(candidates.begin(), candidates.end());
  candidates = {};
  std::sort(ordered.begin(), ordered.end());
  UnionFind uf(docs.size());
  std::vector<TwinPair> kept;
  SparseVector first;
  std::size_t first_of = SIZE_MAX;
  for (std::uint64_t key : ordered) {
    auto i = static_cast<std::size_t>(key >> 32), j = static_cast<std::size_t>(key & 0xffffffffu);
    if (i != first_of) {
      auto v = src.document(docs[i]);
      if (!v) return v.status();
      first = std::move(v.value());
      first_of = i;
    }
    auto second = src.document(docs[j]);
    if (!second) return second.status();
    double c = cosine(first, *second);
    if (c + 1e-12 < o.threshold) continue;
    kept.push_back({docs[i], docs[j], std::min(c, 1.0)});
    uf.join(i, j);
  }
  report.verified_pairs = kept.size();
  std::vector<std::size_t> group_of(docs.size(), SIZE_MAX);
  auto index_of = [&](DocId d) {
    return static_cast<std::size_t>(std::lower_bound(docs.begin(), docs.end(), d) - docs.begin());
  };
  for (auto& p : kept) {
    std::size_t root = uf.find(index_of(p.a));
    if (group_of[root] == SIZE_MAX) {
      group_of[root] = report.groups.size();
      report.groups.emplace_back();
      report.groups.back().min_similarity = 1;
    }
    TwinGroup& g = report.groups[group_of[root]];
    g.pairs.push_back(p);
    g.docs.push_back(p.a);
    g.docs.push_back(p.b);
    g.min_similarity = std::min(g.min_similarity, p.similarity);
    g.max_similarity = std::max(g.max_similarity, p.similarity);
  }
  for (auto& g : report.groups) {
    std::sort(g.docs.begin(), g.docs.end());
    g.docs.erase(std::unique(g.docs.begin(), g.docs.end()), g.docs.end());
    for (DocId d : g.docs) {
      auto info = reader.document(d);
      if (!info) return info.status();
      g.external_ids.push_back(info->external_id);
    }
  }
  std::sort(report.groups.begin(), report.groups.end(), [](const TwinGroup& a, const TwinGroup& b) {
    return a.docs.size() != b.docs.size() ? a.docs.size() > b.docs.size() : a.docs[0] < b.docs[0];
  });
  return report;
}

}  // namespace lode
