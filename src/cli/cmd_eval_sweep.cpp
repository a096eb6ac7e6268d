// `lode eval sweep`: a grid over BM25 k1, b and field weights on one index
// (never re-indexed), the best setting, and an SVG heat map.
#include <cstdio>
#include <fstream>
#include <iostream>

#include "cli/common.h"
#include "cli/eval_cli.h"
#include "lode/json_text.h"

namespace lode::cli {

int run_eval_sweep(const EvalArgs& a, const Setup& setup) {
  auto metric = parse_metric(a.metric);
  if (!metric) return fail(metric.status());
  std::vector<SweepAxis> axes;
  const std::pair<SweepParam, const std::string*> given[] = {{SweepParam::kK1, &a.sweep_k1},
                                                             {SweepParam::kB, &a.sweep_b},
                                                             {SweepParam::kTitleWeight, &a.sweep_title},
                                                             {SweepParam::kBodyWeight, &a.sweep_body}};
  for (auto& [param, spec] : given) {
    if (spec->empty()) continue;
    auto values = parse_sweep_values(*spec);
    if (!values) return fail(values.status());
    axes.push_back(SweepAxis{param, *values});
  }
  if (axes.empty()) return fail(Status::InvalidArgument("give values for --k1, --b, --title-weight or --body-weight"));
  auto qrels = load_judgments(a);
  if (!qrels) return fail(qrels.status());
  auto queries = load_queries(a);
  if (!queries) return fail(queries.status());
  auto system = base_system(a, setup);
  if (!system) return fail(system.status());
  if (system->options.model != Model::kBm25 && (!a.sweep_k1.empty() || !a.sweep_b.empty()))
    return fail(Status::InvalidArgument("sweeping --k1 or --b needs --model bm25"));
  auto reader = IndexReader::open(system->index);
  if (!reader) return fail(reader.status());
  auto searcher = Searcher::create(**reader);
  if (!searcher) return fail(searcher.status());
  bool tty = stderr_is_tty();
  auto progress = [tty](std::size_t done, std::size_t total) {
    if (tty) std::fprintf(stderr, "\rsweep: %zu/%zu settings", done, total);
    if (tty && done == total) std::fprintf(stderr, "\n");
  };
  EvalOptions eo = eval_options(a);
  auto result = sweep(**searcher, *queries, *qrels, system->options, axes, *metric, eo, progress);
  if (!result) return fail(result.status());
  if (!a.svg.empty()) {
    std::ofstream out(a.svg, std::ios::binary);
    out << sweep_svg(*result, "lode eval sweep: " + system->index);
    if (!out.flush()) return fail(Status::IOError(a.svg + ": cannot write the heat map"));
  }
  if (a.json) {
    auto j = sweep_json(*result);
    j["system"] = system->label();
    j["lode_version"] = LODE_VERSION;
    std::cout << dump_json(j, 2) << "\n";
    return kExitOk;
  }
  std::printf("lode %s eval sweep: %s\n", LODE_VERSION, system->label().c_str());
  for (auto& ax : axes) std::printf("%14s", std::string(sweep_param_name(ax.param)).c_str());
  std::printf("  %s\n", metric_name(*metric, eo).c_str());
  for (std::size_t i = 0; i < result->cells.size(); ++i) {
    for (double v : result->cells[i].setting) std::printf("%14g", v);
    std::printf("  %.4f%s\n", result->cells[i].value, i == result->best ? "  <- best" : "");
  }
  std::printf("best:");
  for (std::size_t i = 0; i < axes.size(); ++i)
    std::printf(" --%s %g", std::string(sweep_param_name(axes[i].param)).c_str(), result->cells[result->best].setting[i]);
  std::printf("  (%s %.4f)\n", metric_name(*metric, eo).c_str(), result->cells[result->best].value);
  if (!a.svg.empty()) std::printf("heat map: %s\n", a.svg.c_str());
  return kExitOk;
}

}  // namespace lode::cli
