// Similar documents: heaviest source terms find candidates, exact cosine ranks
// them (method in lode/similar.h).
#include <algorithm>
#include <charconv>
#include <cmath>

#include "explore/top_n.h"
#include "lode/ranking.h"
#include "lode/similar.h"

namespace lode {

Status SimilarOptions::check() const {
  LODE_RETURN_IF_ERROR(vectors.check());
  if (top == 0) return Status::InvalidArgument("top must be at least 1");
  if (query_terms == 0) return Status::InvalidArgument("query terms must be at least 1");
  if (candidates < top) return Status::InvalidArgument("candidates must be at least top");
  return Status();
}

Result<DocId> resolve_document(IndexReader& reader, std::string_view name) {
  auto scope = reader.begin();
  if (!scope) return scope.status();
  auto found = reader.find_external(name);
  if (found || found.status().code() != Code::kNotFound) return found;
  if (name.size() > 1 && name[0] == '#') {
    DocId id = 0;
    auto [p, ec] = std::from_chars(name.data() + 1, name.data() + name.size(), id);
    if (ec == std::errc() && p == name.data() + name.size() && reader.live(id)) return id;
  }
  return Status::NotFound("no live document '" + std::string(name) + "' (give its id as search shows it, or #N)");
}

namespace {

struct Scored {
  double score;
  DocId doc;
};
bool better(const Scored& a, const Scored& b) { return a.score != b.score ? a.score > b.score : a.doc < b.doc; }


Status describe(VectorSource& src, const SparseVector& source, const SparseVector& target, std::size_t n,
                SimilarHit& hit) {
  SparseVector shares;
  std::size_t i = 0, j = 0;
  while (i < source.size() && j < target.size()) {
    if (source[i].term < target[j].term) ++i;
    else if (target[j].term < source[i].term) ++j;
    else shares.push_back({source[i].term, source[i++].weight * target[j++].weight});
  }
  for (auto& s : heaviest(shares, n)) {
    auto info = src.term(s.term);
    if (!info) return info.status();
    hit.shared.push_back({(*info)->term, (*info)->field, s.weight});
  }
  auto doc = src.reader().document(hit.doc);
  if (!doc) return doc.status();
  hit.external_id = doc->external_id;
  hit.title = doc->title;
  hit.path = doc->path;
  return Status();
}

// The search itself, inside the caller's read scope. `exclude` = 0: none.
Result<SimilarResults> find_similar(VectorSource& src, const SparseVector& source, DocId exclude,
                                    const SimilarOptions& o) {
  IndexReader& reader = src.reader();
  const VectorOptions& vo = src.options();
  SimilarResults out;
  const double n = static_cast<double>(reader.stats().documents);
  // Partial dot products over the heaviest terms, in a dense accumulator.
  std::vector<double> acc(reader.doc_id_limit(), 0.0);
  std::vector<DocId> touched;
  for (auto& q : heaviest(source, o.query_terms)) {
    auto info = src.term(q.term);
    if (!info) return info.status();
    const TermInfo& t = **info;
    out.query_terms.push_back(std::string(field_name(t.field)) + ":" + t.term);
    double idf = smart_idf(vo.idf, n, static_cast<double>(t.df), vo.log_base);
    double fw = vo.field_weight[static_cast<std::size_t>(t.field)];
    auto cursor = reader.postings(t);
    for (; cursor->valid(); cursor->next()) {
      DocId d = cursor->doc();
      if (d == exclude || d >= acc.size() || !reader.live(d)) continue;
      // Document-side tf weight without its per-document statistics (max tf,
      // length): enough to choose candidates, which are then scored exactly.
      double w = q.weight * fw * idf * smart_tf(vo.tf == 'r' || vo.tf == 'a' || vo.tf == 'L' ? 'l' : vo.tf,
                                                cursor->tf(), 0, 0, 0, vo.log_base);
      if (acc[d] == 0) touched.push_back(d);
      acc[d] += w;
    }
    LODE_RETURN_IF_ERROR(cursor->status());
  }
  std::vector<Scored> pool;
  pool.reserve(touched.size());
  for (DocId d : touched) {
    double len = reader.length(d, Field::kTitle) + reader.length(d, Field::kBody);
    pool.push_back({acc[d] / std::sqrt(1.0 + len), d});
  }
  explore::keep_top(pool, o.candidates, better);
  out.candidates = pool.size();
  for (auto& c : pool) {
    auto v = src.document(c.doc);
    if (!v) return v.status();
    c.score = cosine(source, *v);
  }
  explore::keep_top(pool, o.top, better);
  for (auto& c : pool) {
    if (c.score <= 0) break;
    SimilarHit hit;
    hit.doc = c.doc;
    hit.similarity = c.score;
    auto v = src.document(c.doc);
    if (!v) return v.status();
    LODE_RETURN_IF_ERROR(describe(src, source, *v, o.shared_terms, hit));
    out.hits.push_back(std::move(hit));
  }
  return out;
}

}  // namespace

Result<SimilarResults> similar_to_document(IndexReader& reader, DocId doc, const SimilarOptions& options) {
  LODE_RETURN_IF_ERROR(options.check());
  auto scope = reader.begin();
  if (!scope) return scope.status();
  VectorSource src(reader, options.vectors);
  auto v = src.document(doc);
  if (!v) return v.status();
  return find_similar(src, *v, doc, options);
}

Result<SimilarResults> similar_to_text(IndexReader& reader, std::string_view text, const SimilarOptions& options) {
  LODE_RETURN_IF_ERROR(options.check());
  auto analyzer = Analyzer::create(reader.settings().analyzer);
  if (!analyzer) return analyzer.status();
  auto scope = reader.begin();
  if (!scope) return scope.status();
  VectorSource src(reader, options.vectors);
  auto v = src.passage(text, **analyzer);
  if (!v) return v.status();
  if (v->empty()) return Status::InvalidArgument("the passage has no word that the index contains");
  return find_similar(src, *v, 0, options);
}

}  // namespace lode
