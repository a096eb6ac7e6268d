// Key terms: heaviest centroid entries, merged over fields, with surface forms
// counted in the stored text (method in lode/keyterms.h).
#include <algorithm>
#include <unordered_map>

#include "explore/terms.h"
#include "lode/keyterms.h"
#include "lode/surface.h"

namespace lode {

Status KeyTermOptions::check() const {
  LODE_RETURN_IF_ERROR(vectors.check());
  if (top == 0) return Status::InvalidArgument("top must be at least 1");
  if (hits == 0) return Status::InvalidArgument("hits must be at least 1");
  return Status();
}

namespace {

// Key terms of `docs` inside the caller's read scope.
Result<KeyTermResults> key_terms(IndexReader& reader, const std::vector<DocId>& docs, const KeyTermOptions& o) {
  VectorSource src(reader, o.vectors);
  std::unordered_map<TermId, double> sum;
  KeyTermResults out;
  for (DocId d : docs) {
    auto v = src.document(d);
    if (!v) {
      if (v.status().code() == Code::kNotFound) continue;  // removed since the search
      return v.status();
    }
    out.documents.push_back(d);
    for (auto& e : *v) sum[e.term] += e.weight;
  }
  if (out.documents.empty()) return Status::NotFound("no live document to take key terms from");
  std::vector<TermWeight> centroid;
  const double count = static_cast<double>(out.documents.size());
  for (auto& [id, w] : sum) centroid.push_back({id, w / count});
  auto named = explore::merge_fields(src, centroid, o.top);
  if (!named) return named.status();
  std::vector<KeyTerm> ranked;
  for (auto& n : *named) ranked.push_back(KeyTerm{n.term, "", n.weight, 0, n.df});

  auto analyzer = Analyzer::create(reader.settings().analyzer);
  if (!analyzer) return analyzer.status();
  std::vector<std::string> wanted;
  for (auto& k : ranked) wanted.push_back(k.term);
  SurfaceForms forms(wanted);
  for (DocId d : out.documents)
    for (Field f : kAllFields) {
      if (o.vectors.field_weight[static_cast<std::size_t>(f)] == 0) continue;
      auto text = reader.stored_text(d, f);
      if (!text) return text.status();
      forms.add(*text, **analyzer);
    }
  for (auto& k : ranked) {
    k.surface = forms.word(k.term);
    k.occurrences = forms.occurrences(k.term);
  }
  out.terms = std::move(ranked);
  return out;
}

}  // namespace

Result<KeyTermResults> key_terms_of_document(IndexReader& reader, DocId doc, const KeyTermOptions& options) {
  LODE_RETURN_IF_ERROR(options.check());
  auto scope = reader.begin();
  if (!scope) return scope.status();
  if (!reader.live(doc)) return Status::NotFound("document " + std::to_string(doc) + " is not in the index");
  return key_terms(reader, {doc}, options);
}

Result<KeyTermResults> key_terms_of_query(IndexReader& reader, std::string_view query, const SearchOptions& search,
                                          const KeyTermOptions& options) {
  LODE_RETURN_IF_ERROR(options.check());
  auto searcher = Searcher::create(reader);
  if (!searcher) return searcher.status();
  SearchOptions so = search;
  so.top = options.hits;
  so.offset = 0;
  so.breakdown = false;
  so.snippets = false;
  auto res = (*searcher)->search(query, so);
  if (!res) return res.status();
  if (res->hits.empty()) return Status::NotFound("the query '" + std::string(query) + "' matches no document");
  std::vector<DocId> docs;
  for (auto& h : res->hits) docs.push_back(h.doc);
  auto scope = reader.begin();
  if (!scope) return scope.status();
  auto out = key_terms(reader, docs, options);
  if (out) out->warnings = res->warnings;
  return out;
}

}  // namespace lode
