// `lode eval`: run judged queries (or read a run file) and report metrics;
// `lode eval compare` and `lode eval sweep` live beside it.
#include <cstdio>
#include <fstream>
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/eval_cli.h"
#include "lode/json_text.h"

namespace lode::cli {

std::string System::label() const {
  return run_file.empty() ? index + ": " + describe(options) + "; " + describe_reading(options.reading)
                          : "run " + run_file;
}

Result<System> base_system(const EvalArgs& a, const Setup& setup) {
  System s;
  s.run_file = a.run_file;
  s.index = resolve_index(setup);
  auto o = to_search_options(a.model);
  if (!o) return o.status();
  s.options = *o;
  s.options.reading = a.query_syntax ? QueryReading::kSyntax : QueryReading::kPlain;
  return s;
}

Result<System> derived_system(const EvalArgs& a, const Setup& setup, const std::string& settings) {
  EvalArgs copy = a;
  std::string index = resolve_index(setup), run_file = a.run_file;
  CLI::App parser{"system settings"};
  add_model_options(parser, copy.model);
  parser.add_option("--index", index);
  parser.add_option("--run", run_file);
  parser.add_flag("--query-syntax", copy.query_syntax);
  try {
    parser.parse(settings, false);
  } catch (const CLI::ParseError& e) {
    return Status::InvalidArgument("settings '" + settings + "': " + e.what());
  }
  if (parser.count("--index") && !parser.count("--run")) run_file.clear();  // an index given means: search it
  auto s = base_system(copy, setup);  // its index is replaced below
  if (!s) return s.status();
  s->index = index;
  s->run_file = run_file;
  return s;
}

Result<Qrels> load_judgments(const EvalArgs& a) { return read_qrels(a.judgments); }

Result<std::vector<QueryLine>> load_queries(const EvalArgs& a) {
  if (a.queries.empty()) return Status::InvalidArgument("--queries FILE is needed to search an index");
  return read_queries(a.queries);
}

EvalOptions eval_options(const EvalArgs& a) { return EvalOptions{a.k, a.depth}; }

Result<Run> system_run(const System& s, const EvalArgs& a) {
  if (!s.run_file.empty()) return read_run(s.run_file);
  auto queries = load_queries(a);
  if (!queries) return queries.status();
  auto reader = IndexReader::open(s.index);
  if (!reader) return reader.status();
  auto searcher = Searcher::create(**reader);
  if (!searcher) return searcher.status();
  return run_queries(**searcher, *queries, s.options, a.depth);
}

namespace {

void print_report(const Evaluation& ev, const System& s, bool per_query) {
  const EvalOptions& o = ev.options;
  std::string k = std::to_string(o.k), depth = std::to_string(o.depth);
  std::printf("lode %s eval: %s\n", LODE_VERSION, s.label().c_str());
  std::printf("%zu judged queries; %zu queries of the run have no judgments (left out)\n", ev.per_query.size(),
              ev.unjudged.size());
  const QueryScores& m = ev.mean;
  std::printf("  %-16s %.4f\n  %-16s %.4f\n  %-16s %.4f\n", "map", m.ap, "ndcg@10", m.ndcg10, "p@10", m.p10);
  if (o.k != 10)
    std::printf("  %-16s %.4f\n  %-16s %.4f\n", ("ndcg@" + k).c_str(), m.ndcg_k, ("p@" + k).c_str(), m.p_k);
  std::printf("  %-16s %.4f\n  %-16s %.4f\n  %-16s %.4f\n", "rprec", m.rprec, "rr", m.rr,
              ("recall@" + depth).c_str(), m.recall_depth);
  std::printf("  %-16s %.2f judged, %.2f unjudged (mean per query)\n", ("top " + k).c_str(), m.judged_k,
              m.unjudged_k);
  std::printf("  %-16s", "11-pt precision");
  for (double p : m.interpolated) std::printf(" %.3f", p);
  std::printf("\n");
  if (!per_query) return;
  std::printf("\n%-12s %7s %8s %7s %7s %7s %9s %8s %8s\n", "query", "map", ("ndcg@" + k).c_str(), ("p@" + k).c_str(),
              "rprec", "rr", ("recall@" + depth).c_str(), "judged", "relevant");
  for (const QueryScores& q : ev.per_query)
    std::printf("%-12s %7.4f %8.4f %7.4f %7.4f %7.4f %9.4f %8.0f %8.0f\n", q.qid.c_str(), q.ap, q.ndcg_k, q.p_k,
                q.rprec, q.rr, q.recall_depth, q.judged_k, q.relevant);
}

int run_eval(const EvalArgs& a, const Setup& setup) {
  auto qrels = load_judgments(a);
  if (!qrels) return fail(qrels.status());
  auto system = base_system(a, setup);
  if (!system) return fail(system.status());
  auto run = system_run(*system, a);
  if (!run) return fail(run.status());
  if (!a.save_run.empty()) {
    std::ofstream out(a.save_run, std::ios::binary);
    out << format_run(*run, a.run_tag);
    if (!out.flush()) return fail(Status::IOError(a.save_run + ": cannot write the run"));
  }
  Evaluation ev = evaluate(*run, *qrels, eval_options(a));
  if (a.json) {
    auto j = evaluation_json(ev, a.per_query);
    j["system"] = system->label();
    j["lode_version"] = LODE_VERSION;
    std::cout << dump_json(j, 2) << "\n";
  } else {
    print_report(ev, *system, a.per_query);
  }
  return kExitOk;
}

}  // namespace

Runner add_eval_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<EvalArgs>();
  app.fallthrough();  // eval's options may follow `compare` / `sweep`
  app.add_option("--judgments", a->judgments, "relevance judgments, TREC qrels 'qid 0 docid grade'")
      ->type_name("FILE")
      ->required();
  app.add_option("--queries", a->queries, "queries, 'id<TAB>text' per line or JSON Lines {id, text}")
      ->type_name("FILE");
  app.add_flag("--query-syntax", a->query_syntax,
               "read the judged queries as query syntax (\"phrases\", +required, -excluded); default: plain text");
  app.add_option("--run", a->run_file, "score this TREC run instead of searching the index")->type_name("FILE");
  app.add_option("--k", a->k, "cut-off for p@k, ndcg@k and the judged count (default 10)")
      ->check(CLI::Range(1, 100000));
  app.add_option("--depth", a->depth, "entries per query scored, and recall depth (default 1000)")
      ->check(CLI::Range(1, 1000000));
  app.add_flag("--json", a->json, "print as JSON (schema lode.eval/1)");
  app.add_flag("--per-query", a->per_query, "also list every judged query");
  app.add_option("--save-run", a->save_run, "write the run searched to this file (TREC format)")->type_name("FILE");
  app.add_option("--run-tag", a->run_tag, "last column of the saved run (default lode)");
  apply_config(a->model, setup.config);
  add_model_options(app, a->model);

  auto* compare = app.add_subcommand("compare", "compare systems per query, with paired significance tests");
  compare->fallthrough();
  compare->add_option("--baseline", a->baseline,
                      "the baseline's settings in search options, plus --index FILE or --run FILE (default: eval's)");
  compare->add_option("--candidate", a->candidates, "a system to compare with the baseline (repeatable)")
      ->required();
  compare->add_option("--metric", a->metric, "map (default), ndcg@K, p@K, recall@K, rprec or rr");
  compare->add_option("--permutations", a->permutations, "random sign flips of the randomization test (default 100000)")
      ->check(CLI::Range(100, 100000000));
  compare->add_option("--seed", a->seed, "seed of the randomization test (default 20080707)");

  auto* sweep = app.add_subcommand("sweep", "grid over BM25 k1, b and field weights; best setting and SVG heat map");
  sweep->fallthrough();
  sweep->add_option("--k1", a->sweep_k1, "k1 values: 'a,b,c' or 'start:stop:step'");
  sweep->add_option("--b", a->sweep_b, "b values");
  sweep->add_option("--title-weight", a->sweep_title, "title weights");
  sweep->add_option("--body-weight", a->sweep_body, "body weights");
  sweep->add_option("--metric", a->metric, "map (default), ndcg@K, p@K, recall@K, rprec or rr");
  sweep->add_option("--svg", a->svg, "write the heat map here")->type_name("FILE");

  return [a, &setup, compare, sweep] {
    if (compare->parsed()) return run_eval_compare(*a, setup);
    if (sweep->parsed()) return run_eval_sweep(*a, setup);
    return run_eval(*a, setup);
  };
}

}  // namespace lode::cli
