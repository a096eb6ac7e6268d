#include "lode/present.h"

namespace lode {

nlohmann::json model_json(const SearchOptions& o) {
  nlohmann::json m{{"name", model_name(o.model)}};
  if (o.model == Model::kBm25) {
    m["k1"] = o.bm25.k1;
    m["b"] = o.bm25.b;
  } else {
    m["weighting"] = o.smart.notation();
    m["log_base"] = o.smart.log_base;
  }
  nlohmann::json fw = nlohmann::json::object();
  for (Field f : kAllFields) fw[std::string(field_name(f))] = o.field_weight[static_cast<std::size_t>(f)];
  m["field_weights"] = fw;
  return m;
}

nlohmann::json hit_json(const Hit& hit, std::size_t rank, bool with_breakdown) {
  nlohmann::json h{{"rank", rank},       {"doc", hit.external_id}, {"title", hit.title},
                   {"kind", hit.kind},   {"path", hit.path},       {"score", hit.score}};
  if (with_breakdown) {
    nlohmann::json parts = nlohmann::json::array();
    for (const TermContribution& c : hit.breakdown)
      parts.push_back({{"term", c.term},
                       {"field", field_name(c.field)},
                       {"tf", c.tf},
                       {"df", c.df},
                       {"idf", c.idf},
                       {"doc_length", c.doc_length},
                       {"avg_length", c.avg_length},
                       {"tf_part", c.tf_part},
                       {"query_weight", c.query_weight},
                       {"field_weight", c.field_weight},
                       {"contribution", c.contribution}});
    h["breakdown"] = parts;
  }
  nlohmann::json marks = nlohmann::json::array();
  for (auto& [b, e] : hit.snippet.marks) marks.push_back({b, e});
  h["snippet"] = {{"text", hit.snippet.text}, {"marks", marks}};
  return h;
}

nlohmann::json results_json(std::string_view query, const SearchResults& r, const SearchOptions& o) {
  nlohmann::json hits = nlohmann::json::array();
  for (std::size_t i = 0; i < r.hits.size(); ++i) hits.push_back(hit_json(r.hits[i], o.offset + i + 1, o.breakdown));
  return {{"schema", kSearchSchema}, {"query", query},          {"model", model_json(o)},
          {"matched", r.matched},    {"offset", o.offset},      {"hits", hits},
          {"warnings", r.warnings}};
}

nlohmann::json stats_json(const CollectionStats& s, const IndexSettings& settings, std::string_view path) {
  return {{"schema", kStatsSchema},
          {"index", path},
          {"documents", s.documents},
          {"files", s.files},
          {"terms", s.terms},
          {"postings", s.postings},
          {"dead_documents", s.dead_documents},
          {"bytes_on_disk", s.bytes_on_disk},
          {"average_length", {{"title", s.average_length(Field::kTitle)}, {"body", s.average_length(Field::kBody)}}},
          {"analyzer", {{"language", settings.analyzer.language}, {"stopwords", settings.analyzer.stopwords}}},
          {"format_version", kIndexFormatVersion}};
}

}  // namespace lode
