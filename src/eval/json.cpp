// JSON shapes of `lode eval --json` (schema lode.eval/1, docs/evaluation.md).
#include "lode/eval.h"

namespace lode {
namespace {

nlohmann::json scores_json(const QueryScores& s, const EvalOptions& o) {
  std::string k = std::to_string(o.k), depth = std::to_string(o.depth);
  return {{"query", s.qid},
          {"map", s.ap},
          {"ndcg@10", s.ndcg10},
          {"p@10", s.p10},
          {"rprec", s.rprec},
          {"rr", s.rr},
          {"recall@1000", s.recall1000},
          {"ndcg@" + k, s.ndcg_k},
          {"p@" + k, s.p_k},
          {"recall@" + depth, s.recall_depth},
          {"judged@" + k, s.judged_k},
          {"unjudged@" + k, s.unjudged_k},
          {"relevant", s.relevant},
          {"retrieved", s.retrieved},
          {"relevant_retrieved", s.relevant_retrieved},
          {"interpolated_precision", s.interpolated}};
}

nlohmann::json test_json(const PairedTest& t) {
  return {{"queries", t.n},
          {"mean_a", t.mean_a},
          {"mean_b", t.mean_b},
          {"mean_difference", t.mean_diff},
          {"wins", t.wins},
          {"ties", t.ties},
          {"losses", t.losses},
          {"randomization",
           {{"method", "paired randomization test, two-sided, statistic mean(b - a)"},
            {"p", t.randomization_p},
            {"permutations", t.permutations},
            {"exact", t.exact},
            {"seed", t.seed}}},
          {"t_test", {{"method", "paired t-test, two-sided"}, {"t", t.t}, {"df", t.n > 0 ? t.n - 1 : 0}, {"p", t.t_p}}}};
}

}  // namespace

nlohmann::json evaluation_json(const Evaluation& ev, bool per_query) {
  nlohmann::json j{{"schema", kEvalSchema},
                   {"k", ev.options.k},
                   {"depth", ev.options.depth},
                   {"judged_queries", ev.per_query.size()},
                   {"mean", scores_json(ev.mean, ev.options)},
                   {"unjudged_queries", ev.unjudged}};
  if (per_query) {
    nlohmann::json q = nlohmann::json::array();
    for (auto& s : ev.per_query) q.push_back(scores_json(s, ev.options));
    j["per_query"] = q;
  }
  return j;
}

nlohmann::json comparison_json(const Comparison& c, const EvalOptions& eval) {
  nlohmann::json q = nlohmann::json::array();
  for (auto& d : c.per_query) q.push_back({{"query", d.qid}, {"a", d.a}, {"b", d.b}, {"difference", d.b - d.a}});
  return {{"metric", metric_name(c.metric, eval)}, {"test", test_json(c.test)}, {"per_query", q}};
}

nlohmann::json sweep_json(const SweepResult& s) {
  nlohmann::json axes = nlohmann::json::array(), cells = nlohmann::json::array();
  for (auto& a : s.axes) axes.push_back({{"parameter", sweep_param_name(a.param)}, {"values", a.values}});
  for (auto& c : s.cells) cells.push_back({{"setting", c.setting}, {"value", c.value}});
  return {{"schema", kEvalSchema},
          {"metric", metric_name(s.metric, s.eval)},
          {"axes", axes},
          {"cells", cells},
          {"best", {{"setting", s.cells[s.best].setting}, {"value", s.cells[s.best].value}}}};
}

}  // namespace lode
