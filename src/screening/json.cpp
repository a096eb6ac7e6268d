// JSON shapes of sifts (lode/screening_json.h).
#include <map>

#include "lode/screening_json.h"

namespace lode {
namespace {

nlohmann::json summary_json(const SiftSummary& s) {
  return {{"name", s.name},       {"query", s.query},     {"created_by", s.created_by},
          {"created_ns", s.created_ns}, {"judged", s.judged}, {"relevant", s.relevant},
          {"batches", s.batches}};
}

}  // namespace

nlohmann::json sift_json(const SiftState& s, bool with_judgments) {
  nlohmann::json j = summary_json(s.summary);
  j["schema"] = kSiftSchema;
  j["scope"] = s.scope;
  j["unjudged"] = s.unjudged;
  j["changed"] = s.changed;
  j["gone"] = s.gone;
  j["open_batch"] = s.open_batch ? nlohmann::json(s.open_batch->number) : nlohmann::json(nullptr);
  j["pending"] = s.pending;
  const KneeVerdict& k = s.knee;
  j["stop"] = {{"advice", k.stop},
               {"rule", "knee"},
               {"reviewed", k.reviewed},
               {"found", k.found},
               {"knee_reviewed", k.knee_reviewed},
               {"knee_found", k.knee_found},
               {"slope_ratio", k.slope_ratio},
               {"needed", k.needed}};
  const RecallEstimate& r = s.recall;
  j["recall"] = r.known ? nlohmann::json{{"estimate", r.value},
                                         {"low", r.low},
                                         {"high", r.high},
                                         {"level", 0.95},
                                         {"sample", r.sample},
                                         {"sample_relevant", r.sample_relevant},
                                         {"remainder", r.remainder}}
                        : nlohmann::json(nullptr);
  if (with_judgments) {
    nlohmann::json js = nlohmann::json::array();
    for (const SiftJudgment& x : s.judgments)
      js.push_back({{"doc", x.doc}, {"relevant", x.relevant}, {"reviewer", x.reviewer},
                    {"time_ns", x.time_ns}, {"batch", x.batch}, {"state", x.state}});
    j["judgments"] = js;
  }
  return j;
}

Result<nlohmann::json> batch_json(IndexReader& reader, const std::string& sift, const SiftBatch& b,
                                  const SiftState& state) {
  std::map<std::string, bool> judged;
  for (const SiftJudgment& x : state.judgments)
    if (x.state == "current") judged[x.doc] = x.relevant;
  nlohmann::json items = nlohmann::json::array();
  for (std::size_t i = 0; i < b.docs.size(); ++i) {
    nlohmann::json item = {{"doc", b.docs[i]}, {"score", b.scores[i]}, {"title", ""}, {"present", false}};
    if (auto id = reader.find_external(b.docs[i]); id.ok()) {
      auto info = reader.document(*id);
      if (!info) return info.status();
      item["title"] = info->title;
      item["kind"] = info->kind;
      item["present"] = true;
    }
    auto it = judged.find(b.docs[i]);
    item["judged"] = it == judged.end() ? nlohmann::json(nullptr) : nlohmann::json(it->second);
    items.push_back(std::move(item));
  }
  return nlohmann::json{{"schema", kSiftBatchSchema}, {"sift", sift},
                        {"number", b.number},         {"kind", b.check ? "check" : "ranked"},
                        {"model", b.model},           {"trained_on", b.trained_on},
                        {"time_ns", b.time_ns},       {"items", items}};
}

nlohmann::json sift_list_json(const std::vector<SiftSummary>& sifts) {
  nlohmann::json all = nlohmann::json::array();
  for (const SiftSummary& s : sifts) all.push_back(summary_json(s));
  return {{"schema", kSiftListSchema}, {"sifts", all}};
}

}  // namespace lode
