// Similar documents: heaviest source terms find candidates by pruned
// retrieval, exact cosine ranks them (method in lode/similar.h).
#include <algorithm>
#include <charconv>
#include <cmath>

#include "explore/top_n.h"
#include "lode/ranking.h"
#include "lode/similar.h"
#include "lode/topk.h"

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

// The candidate score of a document: its partial dot product with the
// heaviest source terms (document tf weight without the per-document
// statistics max tf and length, which only the forward index holds) divided by
// sqrt(1 + its length). Bounds for pruned retrieval (lode/topk.h): the tf
// weight grows with tf, and the length is at least the field's.
class CandidateModel final : public TopKModel {
 public:
  struct Term {
    double weight;     // source weight x field weight x idf
    std::uint64_t cf;  // bounds any tf
  };
  CandidateModel(IndexReader& reader, const VectorOptions& vo, DocId exclude)
      : reader_(reader), exclude_(exclude), log_base_(vo.log_base),
        tf_letter_(vo.tf == 'r' || vo.tf == 'a' || vo.tf == 'L' ? 'l' : vo.tf) {}
  std::vector<Term> terms;

  double term_bound(std::size_t i) const override { return part(i, static_cast<double>(terms[i].cf), 1); }
  double block_bound(std::size_t i, std::uint32_t tf, std::uint32_t length) const override {
    return part(i, tf, length);
  }
  double doc_bound(std::size_t i, std::uint32_t tf, DocId doc) const override { return part(i, tf, length(doc)); }
  Result<bool> admit(DocId doc) override { return doc != exclude_ && reader_.live(doc); }
  Result<double> score(DocId doc, const std::vector<std::uint32_t>& tfs) override {
    double sum = 0, len = length(doc);
    for (std::size_t i = 0; i < terms.size(); ++i) sum += part(i, tfs[i], len);
    return sum;
  }

 private:
  double length(DocId doc) const {
    return static_cast<double>(reader_.length(doc, Field::kTitle)) + reader_.length(doc, Field::kBody);
  }
  double part(std::size_t i, double tf, double length) const {
    return terms[i].weight * smart_tf(tf_letter_, tf, 0, 0, 0, log_base_) / std::sqrt(1.0 + length);
  }
  IndexReader& reader_;
  DocId exclude_;
  double log_base_;
  char tf_letter_;
};

// The search itself, inside the caller's read scope. `exclude` = 0: none.
Result<SimilarResults> find_similar(VectorSource& src, const SparseVector& source, DocId exclude,
                                    const SimilarOptions& o) {
  IndexReader& reader = src.reader();
  const VectorOptions& vo = src.options();
  SimilarResults out;
  const double n = static_cast<double>(reader.stats().documents);
  CandidateModel model(reader, vo, exclude);
  std::vector<std::unique_ptr<PostingCursor>> cursors;
  for (auto& q : heaviest(source, o.query_terms)) {
    auto info = src.term(q.term);
    if (!info) return info.status();
    const TermInfo& t = **info;
    out.query_terms.push_back(std::string(field_name(t.field)) + ":" + t.term);
    const double idf = smart_idf(vo.idf, n, static_cast<double>(t.df), vo.log_base);
    const double fw = vo.field_weight[static_cast<std::size_t>(t.field)];
    model.terms.push_back({q.weight * fw * idf, t.cf});
    cursors.push_back(reader.postings(t));
  }
  auto found = top_k(cursors, model, o.candidates, false);
  if (!found) return found.status();
  std::vector<ScoredDoc>& pool = found->ranked;
  if (pool.size() > o.candidates) pool.resize(o.candidates);  // candidates tied with the last one: as before
  out.candidates = pool.size();
  for (auto& c : pool) {
    auto v = src.document(c.doc);
    if (!v) return v.status();
    c.score = cosine(source, *v);
  }
  explore::keep_top(pool, o.top, ranks_above);
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
