// lode/eval.h — relevance judgments, TREC run files and ranking metrics.
//
// File formats are the standard TREC ones:
//   qrels: "qid 0 docid grade" per line (grade > 0 is relevant; graded gains)
//   run:   "qid Q0 docid rank score tag" per line
// Metrics follow their usual definitions: average precision divides by all
// relevant documents of the query (retrieved or not); nDCG uses gain = grade
// and a log2(rank+1) discount, ideal ranking from the judgments.
//
// Thread safety: plain functions and values.
#pragma once

#include <map>
#include <string>
#include <string_view>
#include <vector>

#include "lode/status.h"

namespace lode {

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
// Parses a run; entries are ordered by score descending, ties by docid
// descending (the trec_eval convention, so files with equal scores evaluate
// the same everywhere).
Result<Run> parse_run(std::string_view text, std::string_view source);
Result<Run> read_run(const std::string& path);
// One line in run format, no newline.
std::string format_run_line(std::string_view qid, std::string_view docid, std::size_t rank,
                            double score, std::string_view tag);

// Queries file: "id<TAB>text" per line (blank lines and lines starting with
// '#' skipped). Errors name the line.
struct QueryLine {
  std::string id;
  std::string text;
};
Result<std::vector<QueryLine>> read_queries(const std::string& path);

// Per-query metrics of one ranked list against one query's judgments.
double average_precision(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged);
double ndcg_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k);
double precision_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k);
double recall_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k);
double r_precision(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged);
double reciprocal_rank(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged);

struct QueryScores {
  std::string qid;
  double ap = 0, ndcg10 = 0, p10 = 0, rprec = 0, rr = 0, recall1000 = 0;
};
struct Evaluation {
  std::vector<QueryScores> per_query;  // judged queries only, by qid
  QueryScores mean;                    // means over judged queries (qid "all")
  std::vector<std::string> unjudged;   // queries in the run without judgments
};
// Scores `run` on every query that has relevant judgments; queries judged but
// absent from the run count as zero.
Evaluation evaluate(const Run& run, const Qrels& qrels);

}  // namespace lode
