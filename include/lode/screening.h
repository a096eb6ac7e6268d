// lode/screening.h — finding all of it: reviews ("sifts") with continuous
// active learning, a stopping rule and a recall estimate (docs/screening.md).
//
// A sift starts from a query (its words become a synthetic relevant document;
// its @filters choose the part of the archive in scope) and, optionally, seed
// documents already known to be relevant. The reader judges batches the tool
// proposes; after every batch a logistic-regression classifier (liblinear,
// L2-regularised, on the TF-IDF vectors of lode/vectors.h) is trained on the
// judged documents, plus a fresh random sample of unjudged ones presumed not
// relevant, and ranks the rest. Batches grow exponentially. This is
// continuous active learning as published by Cormack & Grossman (SIGIR 2014,
// "Evaluation of machine-learning protocols for technology-assisted review";
// SIGIR 2015 / arXiv 1504.06868, "Autonomy and reliability of continuous
// active learning for technology-assisted review").
//
// When to stop: the knee rule (Cormack & Grossman, SIGIR 2016, "Engineering
// quality and reliability in technology-assisted review"). How far along: a
// random check sample of the unreviewed remainder gives an estimate of recall
// with a 95% Wilson interval (Wilson 1927).
//
// A sift is saved in the index file, in tables of its own created on first use
// (docs/index-format.md, "Review tables"); the index's own tables are never
// touched. Judgments are keyed by the document id users see plus a hash of
// the document's stored text, so they survive re-indexing: a document whose
// text changed goes back to the pool (its old judgment is kept, marked
// "changed"); one that left the index is kept as "gone".
//
// Thread safety: a SiftBook is one SQLite connection: one thread at a time.
// Several SiftBooks (in any processes) may work on one index; each write is
// one transaction. The other functions are pure, except SiftEngine (one
// thread, one read scope).
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <random>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "lode/index.h"
#include "lode/status.h"
#include "lode/vectors.h"

namespace lode {

// ---------------------------------------------------------------- classifier

struct ClassifierOptions {
  double cost = 1.0;         // C, the loss weight against the L2 penalty; 1 is liblinear's and scikit-learn's default
  double tolerance = 0.01;   // liblinear's stopping tolerance (its default for this solver)
  bool intercept = true;     // a bias feature of value 1 (regularised, as liblinear does)
};

// w·x + b over TermIds.
struct LinearModel {
  std::unordered_map<TermId, double> weights;
  double intercept = 0;
  double score(const SparseVector& x) const;  // the decision value; > 0 leans relevant
};

// L2-regularised logistic regression, min 0.5|w|^2 + C sum log(1 + exp(-y w·x)),
// solved by liblinear (Debian liblinear-dev). InvalidArgument when the sizes
// differ, or when one class is missing.
Result<LinearModel> train_logistic(const std::vector<const SparseVector*>& examples,
                                   const std::vector<bool>& relevant, const ClassifierOptions& options);

// ---------------------------------------------------------------- stopping

// The knee rule as published (Cormack & Grossman 2016; constants recalled
// from memory of the paper): on the gain curve (documents reviewed in order
// vs relevant found), the knee is the point farthest from the line joining
// the origin to the last point; the slope ratio is
//   rho = (found at knee / reviewed at knee) / ((found - found at knee + 1) / (reviewed - reviewed at knee))
// and the rule says stop when rho >= 156 - min(found, 150) and at least 150
// documents have been reviewed.
struct KneeOptions {
  std::size_t min_reviewed = 150;  // published
  double ratio_base = 156;         // published
  std::size_t found_cap = 150;     // published
};
struct KneeVerdict {
  bool stop = false;
  std::size_t reviewed = 0, found = 0;
  std::size_t knee_reviewed = 0, knee_found = 0;
  double slope_ratio = 0;  // rho (0 before a knee exists)
  double needed = 0;       // the ratio that would stop
};
// `relevant[i]` is the judgment of the i-th document reviewed.
KneeVerdict knee_check(const std::vector<bool>& relevant, const KneeOptions& options = {});

// ---------------------------------------------------------------- recall estimate

// From a simple random check sample of `sample` documents drawn from the
// `remainder` unreviewed ones when `found` relevant documents had been found
// (`sample_relevant` of the sample relevant): the remainder holds about
// p*remainder relevant documents, p = sample_relevant/sample, with a 95% Wilson
// score interval on p; recall = found_now / (found + p*remainder), where
// found_now counts relevant documents found so far (including the sample's).
struct RecallEstimate {
  bool known = false;     // false without a judged check sample
  double value = 0, low = 0, high = 0;  // point estimate and 95% interval, in [0, 1]
  std::size_t sample = 0, sample_relevant = 0, remainder = 0;
};
// Wilson score interval for k successes in n trials at normal quantile z.
std::pair<double, double> wilson_interval(std::size_t k, std::size_t n, double z = 1.959963984540054);
RecallEstimate estimate_recall(std::size_t found_then, std::size_t found_now, std::size_t remainder,
                               std::size_t sample, std::size_t sample_relevant);

// ---------------------------------------------------------------- the method

struct SiftOptions {
  VectorOptions vectors;      // features: TF-IDF "ltc" with title and body weight 1 (vectors.h defaults)
  ClassifierOptions classifier;
  std::size_t presumed_negatives = 100;  // random unjudged documents labelled not relevant per round (published: 100)
  std::size_t first_batch = 1;           // published: 1
  double growth = 0.1;                   // each batch is the last plus ceil(growth * last) (published: 10%)
  std::size_t max_batch = 500;           // a person judges a batch in one sitting; not in the papers
  std::uint64_t seed = 17;               // the random samples are reproducible from it
  // Size of the batch numbered `n` (0-based) by the growth rule.
  std::size_t batch_size(std::size_t n) const;
  Status check() const;  // InvalidArgument naming the option
};

struct RankedDoc {
  DocId doc = 0;
  double score = 0;  // classifier decision value
};

// The in-memory state of one sift: every in-scope document's vector, the
// synthetic query document and the judgments. REQUIRES: an active read scope
// on `reader` for create() and every call.
class SiftEngine {
 public:
  // `scope`: live documents the sift covers. `query_text`: the words of the
  // synthetic relevant document ("" for none; then a seed judgment is needed
  // before rank()).
  static Result<std::unique_ptr<SiftEngine>> create(IndexReader& reader, std::string_view query_text,
                                                    std::vector<DocId> scope, const SiftOptions& options);
  ~SiftEngine();

  // Records (or replaces) a judgment; documents out of scope are ignored.
  void judge(DocId doc, bool relevant);
  bool judged(DocId doc) const;
  std::size_t scope_size() const;
  std::size_t unjudged() const;
  // Trains on the judgments and returns the `n` best unjudged documents, best
  // first (ties: lower id). `round` seeds the presumed-negative sample.
  // InvalidArgument when there is nothing relevant to learn from.
  Result<std::vector<RankedDoc>> rank(std::size_t n, std::uint64_t round);
  // `n` unjudged documents drawn uniformly at random (for a check sample).
  std::vector<DocId> sample(std::size_t n, std::uint64_t round) const;
  // How many judgments the last model was trained on.
  std::size_t trained_on() const;

 private:
  struct Impl;
  explicit SiftEngine(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

// ---------------------------------------------------------------- saved sifts

inline constexpr const char* kSiftModelName = "cal-logistic/1";  // recorded with each batch

struct SiftJudgment {
  std::string doc;           // the document id users see
  bool relevant = false;
  std::string reviewer;
  std::int64_t time_ns = 0;
  std::int64_t batch = -1;   // batch number it answered; -1: a seed or outside any batch
  std::string state;         // "current", "changed" (text differs now), "gone" (left the index)
};

struct SiftBatch {
  std::int64_t number = 0;
  bool check = false;        // a random check sample, not a ranked batch
  std::int64_t time_ns = 0;
  std::string model;         // method and version, e.g. "cal-logistic/1"
  std::size_t trained_on = 0;
  std::vector<std::string> docs;     // in proposed order
  std::vector<double> scores;        // classifier scores (check samples: 0)
  std::size_t found_then = 0;        // check samples: relevant found when drawn
  std::size_t remainder = 0;         // check samples: unreviewed documents when drawn
};

struct SiftSummary {
  std::string name, query, created_by;
  std::int64_t created_ns = 0;
  std::size_t judged = 0, relevant = 0, batches = 0;
};

// Where a sift stands now.
struct SiftState {
  SiftSummary summary;
  std::size_t scope = 0;         // documents in scope now
  std::size_t unjudged = 0;      // in scope and not currently judged
  std::size_t changed = 0, gone = 0;
  std::vector<SiftJudgment> judgments;  // latest per document, oldest first
  std::optional<SiftBatch> open_batch;  // the last batch while some of it is unjudged
  std::vector<std::string> pending;     // its unjudged documents
  KneeVerdict knee;              // over ranked batches' judgments, in review order
  RecallEstimate recall;         // from the last fully judged check sample
};

struct SiftStart {
  std::string name;        // [A-Za-z0-9_.-]{1,64}, unique in the index
  std::string query;       // lode query syntax: words (the synthetic document) and @filters (the scope)
  std::vector<std::string> seeds;  // documents known to be relevant (judged so at start)
  std::string reviewer;
  SiftOptions options;     // kept with the sift
};

class SiftBook {
 public:
  // Opens the sifts of the index at `index_path`. Read-only unless `writable`
  // (then the review tables are created if missing). Errors: those of opening
  // SQLite, NotFound when the file does not exist.
  static Result<std::unique_ptr<SiftBook>> open(const std::string& index_path, bool writable);
  ~SiftBook();

  Result<std::vector<SiftSummary>> list();
  // InvalidArgument for a bad or taken name, an unknown seed or a query
  // without words and no seeds. REQUIRES for the reader: an active scope.
  Status start(IndexReader& reader, const SiftStart& start);
  Status drop(const std::string& name);
  Result<SiftState> state(IndexReader& reader, const std::string& name);
  // The open batch if some of it is unjudged; else trains, proposes and
  // records the next batch.
  Result<SiftBatch> next(IndexReader& reader, const std::string& name);
  // Draws and records a random check sample of `size` unreviewed documents.
  Result<SiftBatch> check_sample(IndexReader& reader, const std::string& name, std::size_t size);
  // Records judgments (doc id users see -> relevant); NotFound for a document
  // not in the index. All or none are written.
  Status mark(IndexReader& reader, const std::string& name,
              const std::vector<std::pair<std::string, bool>>& judgments, const std::string& reviewer);
  // The latest judgment of every document as TREC qrels lines "qid 0 doc 0|1".
  Result<std::string> qrels(const std::string& name, const std::string& qid);

 private:
  struct Impl;
  explicit SiftBook(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

// FNV-1a (64 bit) of a document's stored title, a NUL and its body, as 16
// hex digits: the content key of a judgment.
Result<std::string> content_hash(IndexReader& reader, DocId doc);

// ---------------------------------------------------------------- simulation

// A reviewer played by known judgments: the sift starts from `query`, every
// proposed document is judged from `relevant`, until every relevant document
// is found (or nothing is left). The knee rule is asked after every batch.
struct SimulationRun {
  std::size_t scope = 0, relevant = 0;
  std::vector<bool> order;           // judgments in review order
  std::size_t knee_stop = 0;         // documents reviewed when the knee rule first said stop (0: not before full recall)
  // Documents reviewed to reach recall r (0 if never): r = 0.8, 0.95, 1.
  std::size_t to_recall(double r) const;
};
Result<SimulationRun> simulate_sift(IndexReader& reader, std::string_view query,
                                    const std::vector<DocId>& relevant, const SiftOptions& options,
                                    const KneeOptions& knee = {});
// The same measure for any order of reading: documents read to reach recall r.
std::size_t read_to_recall(const std::vector<bool>& order, std::size_t relevant, double r);

}  // namespace lode
