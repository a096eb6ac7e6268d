// JSON shapes of why-not and what-moved (lode/inspect.h; docs/inspect.md).
#include "lode/inspect.h"
#include "lode/present.h"

namespace lode {
namespace {

nlohmann::json opt_rank(const std::optional<std::size_t>& r) { return r ? nlohmann::json(*r) : nlohmann::json(nullptr); }

}  // namespace

nlohmann::json why_not_json(std::string_view query, const WhyNot& w, const SearchOptions& options,
                            const WhyNotOptions& wo) {
  nlohmann::json words = nlohmann::json::array();
  for (const WordPresence& p : w.words)
    words.push_back({{"term", p.term},
                     {"field", p.field ? nlohmann::json(field_name(*p.field)) : nlohmann::json(nullptr)},
                     {"in_title", p.in_title},
                     {"in_body", p.in_body},
                     {"in_index", p.in_index},
                     {"lacking", !(p.field ? (*p.field == Field::kTitle ? p.in_title : p.in_body) : p.in_title || p.in_body)}});
  nlohmann::json clauses = nlohmann::json::array();
  for (const ClauseVerdict& c : w.clauses)
    clauses.push_back({{"kind", c.kind}, {"text", c.text}, {"holds", c.holds}, {"why", c.why}});
  nlohmann::json j = {{"schema", kWhyNotSchema},
                      {"query", query},
                      {"model", model_json(options)},
                      {"doc", w.doc.external_id},
                      {"matches", w.matches},
                      {"rank", opt_rank(w.rank)},
                      {"searched_to", wo.max_rank},
                      {"matched", w.matched},
                      {"k", wo.k},
                      {"words", words},
                      {"dropped", w.dropped},
                      {"clauses", clauses},
                      {"hit", hit_json(w.doc, w.rank.value_or(0), true)},
                      {"kth", w.kth ? hit_json(*w.kth, wo.k, true) : nlohmann::json(nullptr)}};
  j["hit"].erase("rank");
  return j;
}

nlohmann::json moved_json(std::string_view query, const Moved& m, const SearchOptions& before,
                          const SearchOptions& after, const MovedOptions& o) {
  nlohmann::json docs = nlohmann::json::array();
  for (const MovedDoc& d : m.docs) {
    nlohmann::json shifts = nlohmann::json::array();
    for (const TermShift& s : d.shifts)
      shifts.push_back({{"term", s.term}, {"field", field_name(s.field)}, {"before", s.before}, {"after", s.after}});
    docs.push_back({{"doc", d.after.external_id},
                    {"title", d.after.title},
                    {"change", d.change},
                    {"rank_before", opt_rank(d.rank_before)},
                    {"rank_after", opt_rank(d.rank_after)},
                    {"score_before", d.before.score},
                    {"score_after", d.after.score},
                    {"shifts", shifts}});
  }
  return {{"schema", kMovedSchema},
          {"query", query},
          {"depth", o.depth},
          {"before", model_json(before)},
          {"after", model_json(after)},
          {"counts", {{"entered", m.entered}, {"left", m.left}, {"up", m.up}, {"down", m.down}, {"same", m.same}}},
          {"docs", docs}};
}

}  // namespace lode
