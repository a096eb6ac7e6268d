// `lode eval compare`: a baseline against one or more candidates on one
// metric, per query, with wins/ties/losses and paired significance tests.
#include <cstdio>
#include <iostream>

#include "cli/common.h"
#include "cli/eval_cli.h"
#include "lode/json_text.h"

namespace lode::cli {
namespace {

void print_comparison(const Comparison& c, const System& cand, const EvalOptions& eo,
                      bool per_query) {
  const PairedTest& t = c.test;
  std::string metric = metric_name(c.metric, eo);
  std::printf("\ncandidate: %s\n", cand.label().c_str());
  std::printf("  %s %.4f vs baseline %.4f: difference %+.4f", metric.c_str(), t.mean_b, t.mean_a, t.mean_diff);
  if (t.mean_a != 0) std::printf(" (%+.1f%%)", 100 * t.mean_diff / t.mean_a);
  std::printf("\n  per query: %zu better, %zu tied, %zu worse (of %zu)\n", t.wins, t.ties, t.losses, t.n);
  if (t.exact)
    std::printf("  paired randomization test, two-sided, all %zu sign assignments (exact): p = %.4g\n",
                t.permutations, t.randomization_p);
  else
    std::printf("  paired randomization test, two-sided, %zu random sign flips (seed %llu): p = %.4g\n",
                t.permutations, static_cast<unsigned long long>(t.seed), t.randomization_p);
  std::printf("  paired t-test, two-sided, df %zu: t = %.3f, p = %.4g\n", t.n > 0 ? t.n - 1 : 0, t.t, t.t_p);
  if (!per_query) return;
  std::printf("  %-12s %9s %9s %9s\n", "query", "baseline", "candidate", "diff");
  for (auto& d : c.per_query)
    std::printf("  %-12s %9.4f %9.4f %+9.4f\n", d.qid.c_str(), d.a, d.b, d.b - d.a);
}

}  // namespace

int run_eval_compare(const EvalArgs& a, const Setup& setup) {
  auto metric = parse_metric(a.metric);
  if (!metric) return fail(metric.status());
  auto qrels = load_judgments(a);
  if (!qrels) return fail(qrels.status());
  auto base = derived_system(a, setup, a.baseline);
  if (!base) return fail(base.status());
  auto base_run = system_run(*base, a);
  if (!base_run) return fail(base_run.status());
  EvalOptions eo = eval_options(a);
  PermutationOptions po{a.permutations, a.seed};
  nlohmann::json out{{"schema", kEvalSchema},
                     {"lode_version", LODE_VERSION},
                     {"baseline", base->label()},
                     {"candidates", nlohmann::json::array()}};
  if (!a.json)
    std::printf("lode %s eval compare on %s\nbaseline:  %s\n", LODE_VERSION, metric_name(*metric, eo).c_str(),
                base->label().c_str());
  for (const std::string& settings : a.candidates) {
    auto cand = derived_system(a, setup, settings);
    if (!cand) return fail(cand.status());
    auto cand_run = system_run(*cand, a);
    if (!cand_run) return fail(cand_run.status());
    Comparison c = compare_runs(*base_run, *cand_run, *qrels, *metric, eo, po);
    if (a.json) {
      auto j = comparison_json(c, eo);
      j["system"] = cand->label();
      if (!a.per_query) j.erase("per_query");
      out["candidates"].push_back(j);
    } else {
      print_comparison(c, *cand, eo, a.per_query);
    }
  }
  if (a.json) std::cout << dump_json(out, 2) << "\n";
  return kExitOk;
}

}  // namespace lode::cli
