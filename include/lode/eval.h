// lode/eval.h — relevance judgments, TREC run files, ranking metrics,
// significance tests and parameter sweeps.
//
// File formats are the standard TREC ones:
//   qrels: "qid 0 docid grade" per line (grade > 0 is relevant; graded gains)
//   run:   "qid Q0 docid rank score tag" per line
// Queries files are "id<TAB>text" per line, or JSON Lines {"id": ..., "text": ...}.
// Metrics follow their usual definitions (docs/evaluation.md): average
// precision divides by all relevant documents of the query (retrieved or
// not); nDCG uses gain = grade (linear) and a log2(rank+1) discount, the ideal
// ranking taken from the judgments.
//
// Thread safety: plain functions and values, except run_queries() and sweep(),
// which use the given Searcher (one thread at a time, as ranking.h says).
#pragma once

#include <array>
#include <cstdint>
#include <functional>
#include <map>
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <vector>

#include "lode/ranking.h"
#include "lode/status.h"

namespace lode {

inline constexpr const char* kEvalSchema = "lode.eval/1";

// qid -> docid -> grade
using Qrels = std::map<std::string, std::map<std::string, int>>;

struct RunEntry {
  std::string docid;
  double score = 0;
};
// qid -> ranked entries (best first)
using Run = std::map<std::string, std::vector<RunEntry>>;

// Parses qrels text; errors name the line. `source` names the file in messages.
Result<Qrels> parse_qrels(std::string_view text, std::string_view source);
Result<Qrels> read_qrels(const std::string& path);
// Parses a run; entries are ordered by score descending, ties kept in the
// order of the file (the rank column is not read). lode writes ties in
// ascending document id (ranking.h), so a run of lode scores the same read
// back, searched afresh, or by an evaluator that keeps the run's order; and
// scores printed equal to 6 decimals keep the order they were ranked in. A document listed twice for one query is an
// InvalidArgument naming the line: its rank would be ambiguous.
Result<Run> parse_run(std::string_view text, std::string_view source);
Result<Run> read_run(const std::string& path);
// One line in run format, no newline.
std::string format_run_line(std::string_view qid, std::string_view docid, std::size_t rank,
                            double score, std::string_view tag);
// The whole run as text, ranks from 1, one line per entry, queries by qid.
std::string format_run(const Run& run, std::string_view tag);

// Queries file: "id<TAB>text" per line, or JSON Lines objects with string
// fields "id" and "text" (chosen per line by a leading '{'). Blank lines and
// lines starting with '#' are skipped. Errors name the line.
struct QueryLine {
  std::string id;
  std::string text;
};
Result<std::vector<QueryLine>> parse_queries(std::string_view text, std::string_view source);
Result<std::vector<QueryLine>> read_queries(const std::string& path);

// Per-query metrics of one ranked list against one query's judgments.
double average_precision(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged);
double ndcg_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k);
double precision_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k);
double recall_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k);
double r_precision(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged);
double reciprocal_rank(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged);
// Interpolated precision at recall 0.0, 0.1, ..., 1.0: at each level the
// highest precision at any rank whose recall reaches it (0 if none does).
std::array<double, 11> interpolated_precision(const std::vector<std::string>& ranked,
                                              const std::map<std::string, int>& judged);
// Documents among the first k that have a judgment (any grade), and that have none.
std::size_t judged_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k);

struct EvalOptions {
  std::size_t k = 10;        // cut-off of P@k, nDCG@k and judged@k; 10 = one page of hits
  std::size_t depth = 1000;  // entries per query scored (deeper ones ignored) and recall@depth; 1000 is the TREC convention
};

struct QueryScores {
  std::string qid;
  // Fixed cut-offs, the usual headline figures (recall1000 counts at most `depth` entries).
  double ap = 0, ndcg10 = 0, p10 = 0, rprec = 0, rr = 0, recall1000 = 0;
  // At the chosen EvalOptions cut-offs.
  double ndcg_k = 0, p_k = 0, recall_depth = 0;
  double judged_k = 0, unjudged_k = 0;  // documents in the top k with / without a judgment
  double relevant = 0;                  // relevant documents judged for the query
  double retrieved = 0;                 // entries scored (at most depth)
  double relevant_retrieved = 0;
  std::array<double, 11> interpolated{};  // 11-point interpolated precision
};
struct Evaluation {
  EvalOptions options;
  std::vector<QueryScores> per_query;  // judged queries only, by qid
  QueryScores mean;                    // means over judged queries (qid "all")
  std::vector<std::string> unjudged;   // queries in the run without relevant judgments
};
// Scores `run` on every query that has a relevant judgment; queries judged
// but absent from the run count as zero. Queries of the run without relevant
// judgments are listed in `unjudged` and left out of the means.
Evaluation evaluate(const Run& run, const Qrels& qrels, const EvalOptions& options = {});

// One metric, chosen by name for comparisons and sweeps.
enum class MetricKind { kAp, kNdcg, kPrecision, kRecall, kRPrecision, kReciprocalRank };
struct Metric {
  MetricKind kind = MetricKind::kAp;
  std::size_t k = 0;  // cut-off for ndcg, p and recall (0 = EvalOptions default)
};
// "map", "ndcg@K", "p@K", "recall@K", "rprec", "rr" (and "ndcg", "p", "recall"
// without a cut-off). InvalidArgument naming the value otherwise.
Result<Metric> parse_metric(std::string_view name);
std::string metric_name(const Metric& m, const EvalOptions& options = {});
// The metric per judged query (same query set and order as evaluate()).
std::vector<std::pair<std::string, double>> per_query_metric(const Run& run, const Qrels& qrels, const Metric& m,
                                                             const EvalOptions& options = {});

// ---- Significance (docs/evaluation.md, "Significance") ----

struct PermutationOptions {
  // Random sign flips drawn when 2^n exceeds this; otherwise all 2^n are
  // enumerated (an exact test). 100000 puts the Monte-Carlo standard error of
  // a p-value at most 0.0016.
  std::size_t permutations = 100000;
  std::uint64_t seed = 20080707;  // fixed: the same inputs give the same p-value
};

// Paired comparison of system B against system A on the same queries.
struct PairedTest {
  std::size_t n = 0;                   // paired queries
  double mean_a = 0, mean_b = 0;
  double mean_diff = 0;                // mean of (b - a)
  std::size_t wins = 0, ties = 0, losses = 0;  // queries where b > a, b == a, b < a
  double t = 0, t_p = 1;               // paired t-test statistic and two-sided p (df n-1)
  double randomization_p = 1;          // paired randomization test, two-sided
  std::size_t permutations = 0;        // sign assignments evaluated
  bool exact = false;                  // all 2^n assignments enumerated
  std::uint64_t seed = 0;
};
// REQUIRES: a.size() == b.size(). With n < 2 the p-values are 1.
// Randomization test: statistic mean(b - a); under H0 each difference's sign
// is exchangeable; p = share of sign assignments with |mean| >= |observed|,
// counting the observed one ((hits + 1) / (draws + 1) when sampled).
PairedTest paired_test(const std::vector<double>& a, const std::vector<double>& b,
                       const PermutationOptions& options = {});
// Two-sided p-value of Student's t with `df` degrees of freedom (df > 0).
double student_t_p(double t, double df);

struct QueryDelta {
  std::string qid;
  double a = 0, b = 0;  // the metric for each system
};
struct Comparison {
  Metric metric;
  std::vector<QueryDelta> per_query;  // judged queries, by qid
  PairedTest test;
};
// Compares run `b` with run `a` on `metric` over the judged queries.
Comparison compare_runs(const Run& a, const Run& b, const Qrels& qrels, const Metric& metric,
                        const EvalOptions& eval = {}, const PermutationOptions& perm = {});

// ---- Running queries and sweeping parameters (no re-indexing) ----

// Runs every query with `options` (top = depth) and returns the run. Errors
// name the query id.
Result<Run> run_queries(Searcher& searcher, const std::vector<QueryLine>& queries, SearchOptions options,
                        std::size_t depth = 1000);

enum class SweepParam { kK1, kB, kTitleWeight, kBodyWeight };
std::string_view sweep_param_name(SweepParam p);  // "k1", "b", "title-weight", "body-weight"
// "a,b,c" or "start:stop:step" (stop included, to 1e-9). InvalidArgument
// naming the spec for an empty list, a bad number, step <= 0 or > 10000 values.
Result<std::vector<double>> parse_sweep_values(std::string_view spec);

struct SweepAxis {
  SweepParam param = SweepParam::kK1;
  std::vector<double> values;
};
struct SweepCell {
  std::vector<double> setting;  // one value per axis
  double value = 0;             // the metric's mean over judged queries
};
struct SweepResult {
  std::vector<SweepAxis> axes;
  Metric metric;
  EvalOptions eval;
  std::vector<SweepCell> cells;  // every combination; the last axis varies fastest
  std::size_t best = 0;          // index into cells: highest value, first on ties
};
// Sets `param` of `o` to `value`.
void apply_sweep_param(SearchOptions& o, SweepParam param, double value);
// Evaluates every combination of the axes' values on `base` (BM25 parameters
// and field weights only change per query: the index is read, never written).
// `progress(done, total)` is called after each setting. Errors: InvalidArgument
// for no axes, an empty axis, a parameter given twice or out of range; those
// of run_queries.
Result<SweepResult> sweep(Searcher& searcher, const std::vector<QueryLine>& queries, const Qrels& qrels,
                          const SearchOptions& base, const std::vector<SweepAxis>& axes, const Metric& metric,
                          const EvalOptions& eval = {},
                          const std::function<void(std::size_t, std::size_t)>& progress = {});

// A self-contained SVG heat map of the sweep: the first axis across, the
// second down (one row if there is one axis), one panel per combination of
// any further axes; every cell shows its value, the best cell is outlined,
// and a colour legend gives the scale. `title` heads the picture.
std::string sweep_svg(const SweepResult& result, std::string_view title);

// ---- JSON (schema lode.eval/1, docs/evaluation.md) ----
nlohmann::json evaluation_json(const Evaluation& ev, bool per_query);
nlohmann::json comparison_json(const Comparison& c, const EvalOptions& eval);
nlohmann::json sweep_json(const SweepResult& s);

}  // namespace lode
