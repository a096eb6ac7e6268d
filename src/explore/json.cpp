// JSON shapes of the explore features (see lode/explore_json.h).
#include "lode/explore_json.h"

namespace lode {

nlohmann::json vectors_json(const VectorOptions& o) {
  return {{"tf", std::string(1, o.tf)},
          {"idf", std::string(1, o.idf)},
          {"log_base", o.log_base},
          {"field_weights", {{"title", o.field_weight[0]}, {"body", o.field_weight[1]}}}};
}

nlohmann::json nearest_json(const nlohmann::json& source, const SimilarResults& r, const SimilarOptions& o) {
  nlohmann::json hits = nlohmann::json::array();
  for (std::size_t i = 0; i < r.hits.size(); ++i) {
    const SimilarHit& h = r.hits[i];
    nlohmann::json shared = nlohmann::json::array();
    for (auto& s : h.shared) shared.push_back({{"term", s.term}, {"field", field_name(s.field)}, {"share", s.share}});
    hits.push_back({{"rank", i + 1}, {"doc", h.external_id}, {"title", h.title}, {"path", h.path},
                    {"similarity", h.similarity}, {"shared", shared}});
  }
  return {{"schema", kNearestSchema}, {"source", source},          {"vectors", vectors_json(o.vectors)},
          {"query_terms", r.query_terms}, {"candidates", r.candidates}, {"hits", hits}};
}

nlohmann::json keyterms_json(const nlohmann::json& source, const KeyTermResults& r, const KeyTermOptions& o) {
  nlohmann::json terms = nlohmann::json::array();
  for (auto& k : r.terms)
    terms.push_back({{"term", k.term}, {"surface", k.surface}, {"weight", k.weight},
                     {"occurrences", k.occurrences}, {"df", k.df}});
  return {{"schema", kKeyTermsSchema}, {"source", source}, {"vectors", vectors_json(o.vectors)},
          {"documents", r.documents.size()}, {"terms", terms}, {"warnings", r.warnings}};
}

nlohmann::json twins_json(const TwinReport& r, const TwinOptions& o) {
  nlohmann::json groups = nlohmann::json::array();
  for (auto& g : r.groups) {
    auto id_of = [&](DocId d) {
      auto it = std::lower_bound(g.docs.begin(), g.docs.end(), d);
      return g.external_ids[static_cast<std::size_t>(it - g.docs.begin())];
    };
    nlohmann::json pairs = nlohmann::json::array();
    for (auto& p : g.pairs) pairs.push_back({{"a", id_of(p.a)}, {"b", id_of(p.b)}, {"similarity", p.similarity}});
    groups.push_back({{"docs", g.external_ids}, {"min_similarity", g.min_similarity},
                      {"max_similarity", g.max_similarity}, {"pairs", pairs}});
  }
  return {{"schema", kTwinsSchema},
          {"vectors", vectors_json(o.vectors)},
          {"threshold", o.threshold},
          {"shingle", o.shingle},
          {"top_terms", o.top_terms},
          {"bands", o.bands},
          {"rows", o.rows},
          {"seed", o.seed},
          {"documents", r.documents},
          {"candidate_pairs", r.candidate_pairs},
          {"verified_pairs", r.verified_pairs},
          {"groups", groups}};
}

nlohmann::json themes_json(const ThemeReport& r, const ThemeOptions& o) {
  nlohmann::json themes = nlohmann::json::array();
  for (auto& t : r.themes) {
    nlohmann::json terms = nlohmann::json::array(), central = nlohmann::json::array();
    for (auto& w : t.terms) terms.push_back({{"term", w.term}, {"word", w.word}, {"weight", w.weight}});
    for (auto& c : t.central)
      central.push_back({{"doc", c.external_id}, {"title", c.title}, {"similarity", c.similarity}});
    themes.push_back({{"size", t.size}, {"cohesion", t.cohesion}, {"terms", terms}, {"central", central}});
  }
  nlohmann::json sil = nlohmann::json::array();
  for (auto& [k, s] : r.silhouettes) sil.push_back({{"k", k}, {"silhouette", s}});
  return {{"schema", kThemesSchema}, {"vectors", vectors_json(o.vectors)}, {"k", r.k},
          {"k_suggested", r.k_suggested}, {"silhouettes", sil}, {"seed", o.seed},
          {"documents", r.documents}, {"sampled", r.sampled}, {"objective", r.objective},
          {"iterations", r.iterations}, {"converged", r.converged}, {"themes", themes}};
}

nlohmann::json matrix_json(const MatrixSummary& s, const MatrixFiles& f, const MatrixOptions& o) {
  nlohmann::json fields = nlohmann::json::array();
  for (Field x : kAllFields)
    if (o.fields[static_cast<std::size_t>(x)]) fields.push_back(field_name(x));
  return {{"schema", kMatrixSchema},
          {"files", {{"matrix", f.matrix}, {"vocabulary", f.vocabulary}, {"documents", f.documents}}},
          {"rows", s.rows},
          {"columns", s.columns},
          {"entries", s.entries},
          {"weighting", {{"tf", std::string(1, o.tf)}, {"idf", std::string(1, o.idf)}, {"log_base", o.log_base},
                         {"norm", o.l2 ? "l2" : "none"}}},
          {"fields", fields},
          {"filters", {{"min_df", o.min_df}, {"max_df", o.max_df}, {"max_terms", o.max_terms}}}};
}

}  // namespace lode
