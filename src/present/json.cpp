#include "lode/present.h"

namespace lode {

namespace {
nlohmann::json marks_json(const std::vector<std::pair<std::uint32_t, std::uint32_t>>& marks) {
  nlohmann::json out = nlohmann::json::array();
  for (auto& [b, e] : marks) out.push_back({b, e});
  return out;
}
}  // namespace

nlohmann::json model_json(const SearchOptions& o) {
  nlohmann::json m{{"name", model_name(o.model)}};
  if (o.model == Model::kBm25) {
    m["k1"] = o.bm25.k1;
    m["b"] = o.bm25.b;
    m["fields"] = field_scoring_name(o.fields);
  } else {
    m["fields"] = field_scoring_name(o.fields);
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
    for (const TermContribution& c : hit.breakdown) {
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
      if (c.proximity) parts.back()["proximity"] = true;
    }
    h["breakdown"] = parts;
  }
  h["snippet"] = {{"text", hit.snippet.text}, {"marks", marks_json(hit.snippet.marks)}};
  return h;
}

nlohmann::json results_json(std::string_view query, const SearchResults& r, const SearchOptions& o) {
  nlohmann::json hits = nlohmann::json::array();
  for (std::size_t i = 0; i < r.hits.size(); ++i) {
    hits.push_back(hit_json(r.hits[i], o.offset + i + 1, o.breakdown));
    if (!o.snippets) hits.back().erase("snippet");  // not asked for: absent, not empty
  }
  return {{"schema", kSearchSchema}, {"query", query},          {"model", model_json(o)},
          {"matched", r.matched},    {"matched_exact", r.matched_exact}, {"offset", o.offset}, {"hits", hits},
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

nlohmann::json breakdown_json(std::string_view query, const Hit& hit, const SearchOptions& o) {
  nlohmann::json h = hit_json(hit, 0, true);
  h.erase("rank");
  return {{"schema", kBreakdownSchema}, {"query", query},  {"model", model_json(o)},
          {"matches", !hit.breakdown.empty()}, {"hit", h}};
}

std::unordered_set<std::string> query_terms(const Query& query) {
  std::unordered_set<std::string> terms;
  for (const Clause& c : query.clauses)
    if (c.occur != Occur::kMustNot)
      for (const QueryWord& w : c.words) terms.insert(w.term);
  return terms;
}

std::vector<std::pair<std::uint32_t, std::uint32_t>> mark_terms(std::string_view text, Analyzer& analyzer,
                                                                const std::unordered_set<std::string>& terms) {
  std::vector<std::pair<std::uint32_t, std::uint32_t>> marks;
  if (terms.empty()) return marks;
  for (const Token& t : analyzer.analyze(text).tokens)
    if (terms.count(t.term)) marks.emplace_back(t.begin, t.end);
  return marks;
}

nlohmann::json document_json(const DocumentInfo& info, std::string_view query, const MarkedText& title,
                             const MarkedText& body) {
  auto field = [](const MarkedText& m) {
    return nlohmann::json{{"text", m.text}, {"marks", marks_json(m.marks)}, {"truncated", m.truncated}};
  };
  return {{"schema", kDocumentSchema},
          {"doc", info.external_id},
          {"title", info.title},
          {"kind", info.kind},
          {"path", info.path},
          {"lengths", {{"title", info.length[0]}, {"body", info.length[1]}}},
          {"query", query},
          {"fields", {{"title", field(title)}, {"body", field(body)}}}};
}

}  // namespace lode
