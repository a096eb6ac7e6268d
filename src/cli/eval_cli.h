// Shared pieces of `lode eval` and its `compare` and `sweep` subcommands.
// Presentation only: runs, metrics, tests and sweeps come from lode/eval.h.
#pragma once

#include <string>
#include <vector>

#include "cli/model_options.h"
#include "lode/eval.h"

namespace lode::cli {

struct EvalArgs {
  std::string queries, judgments, run_file, save_run, run_tag = "lode";
  std::size_t k = EvalOptions{}.k, depth = EvalOptions{}.depth;
  bool json = false, per_query = false;
  bool query_syntax = false;  // parse judged queries as query syntax (default: plain text, the TREC convention)
  ModelArgs model;
  // compare
  std::string metric = "map", baseline;
  std::vector<std::string> candidates;
  std::size_t permutations = PermutationOptions{}.permutations;
  std::uint64_t seed = PermutationOptions{}.seed;
  // sweep
  std::string sweep_k1, sweep_b, sweep_title, sweep_body, svg;
};

// One system under evaluation: an existing run file, or an index searched
// with a setting.
struct System {
  std::string index;     // index file (when run_file is empty)
  std::string run_file;  // an existing TREC run
  SearchOptions options;
  std::string label() const;  // "run FILE" or "INDEX: bm25 k1=..."
};

// The eval-level system: --run, or the index and the model options.
Result<System> base_system(const EvalArgs& a, const Setup& setup);
// The base system changed by a settings string in the `lode search` option
// vocabulary plus --index FILE and --run FILE, e.g. "--k1 0.9 --index b.sqlite".
Result<System> derived_system(const EvalArgs& a, const Setup& setup, const std::string& settings);
// The run of a system: read, or searched over `queries` (loaded on demand).
Result<Run> system_run(const System& s, const EvalArgs& a);

Result<Qrels> load_judgments(const EvalArgs& a);
Result<std::vector<QueryLine>> load_queries(const EvalArgs& a);
EvalOptions eval_options(const EvalArgs& a);

int run_eval_compare(const EvalArgs& a, const Setup& setup);
int run_eval_sweep(const EvalArgs& a, const Setup& setup);

}  // namespace lode::cli
