// lode/ranking.h — scoring models, top-k retrieval, per-term breakdowns, snippets.
//
// Models (published; usual names kept):
//  * BM25 (Robertson & Zaragoza 2009, "The Probabilistic Relevance Framework"),
//    per field, summed with field weights:
//      score(d) = sum over query terms t and fields f of
//                 w_f * qtf(t) * idf(t,f) * tf*(k1+1) / (tf + k1*(1 - b + b*len_f(d)/avglen_f))
//      idf(t,f) = ln(1 + (N - df + 0.5) / (df + 0.5))
//    or, with FieldScoring::kJoint, BM25F (Robertson, Zaragoza & Taylor 2004,
//    "Simple BM25 extension to multiple weighted fields"): the fields' length-
//    normalised tfs are weighted and added before the one saturation,
//      x(t,d)   = sum over fields f of w_f * tf_f / (1 - b + b*len_f(d)/avglen_f)
//      score(d) = sum over t of qtf(t) * idf(t) * x*(k1+1) / (x + k1)
//    with idf(t) from the documents having t in any field. A (term, field)
//    entry of the breakdown gets the share w_f*tf_f/B_f / x of its term's part.
//    This idf is the RSJ weight without relevance information, shifted by 1
//    inside the log so it stays positive when df > N/2 (the raw RSJ form goes
//    negative there, which would make matching a common word lower a score).
//  * TF-IDF cosine in SMART notation "ddd.qqq" (document triple, query triple),
//    over one vector of title and body (FieldScoring::kJoint, the default), or
//    per field, summed with field weights (kSum). Letters:
//      tf:  n tf | l 1+log(tf) | a 0.5+0.5*tf/max_tf | b 1 | L (1+log tf)/(1+log avg_tf)
//           | r tf/field length (lode extension: "count/length")
//      idf: n 1 | t log(N/df) | p max(0, log((N-df)/df))
//           | s log((1+N)/(1+df)) + 1 (lode extension: smoothed, as scikit-learn's smooth_idf)
//      norm: n none | c cosine (divide by the vector's Euclidean length)
//    log() is base 10 by default (as in Manning et al. 2008); SmartWeighting::log_base
//    changes it (e.g. e to match scikit-learn's sublinear_tf).
// Every hit's breakdown lists one entry per matched (term, field) and the
// entries' contributions, added in order, equal the score exactly (the same
// arithmetic computes both).
//
// Thread safety: a Searcher wraps one IndexReader and one Analyzer; use it
// from one thread at a time.
#pragma once

#include <array>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "lode/index.h"
#include "lode/query.h"
#include "lode/status.h"

namespace lode {

enum class Model { kBm25, kTfIdf };
std::string_view model_name(Model m);                      // "bm25", "tfidf"
std::optional<Model> parse_model(std::string_view name);

// How the title and body fields combine. BM25: kSum scores each field on its
// own (own saturation, own df) and adds the weighted scores; kJoint is BM25F
// (above). TF-IDF: kSum adds per-field cosines (each field its own document
// and query vector, SMART weights per field); kJoint is one vector over the
// fields, a word's tf = sum of w_f * tf_f and its df the documents with it in
// any weighted field, so with weights 1 and 1 it is the vector of title and
// text joined into one field (docs/evaluation.md measures both).
enum class FieldScoring { kSum, kJoint };
std::string_view field_scoring_name(FieldScoring f);       // "sum", "joint"
std::optional<FieldScoring> parse_field_scoring(std::string_view name);

struct Bm25Params {
  double k1 = 1.2;   // tf saturation; 1.2 is the common-practice default (range 0..3)
  double b = 0.75;   // length normalisation; 0.75 common practice (range 0..1)
};

struct SmartWeighting {
  char doc_tf = 'l', doc_idf = 'n', doc_norm = 'c';
  char query_tf = 'l', query_idf = 't', query_norm = 'c';
  double log_base = 10.0;  // base of every log in tf and idf
  // Parses "lnc.ltc" (InvalidArgument naming the bad letter otherwise).
  static Result<SmartWeighting> parse(std::string_view notation);
  std::string notation() const;  // "lnc.ltc"
};

// A logarithm base as users write it, the same in every command and the API:
// a number above 1, or "e" (2.718...). InvalidArgument "<name> must be a
// number above 1 or e, not '<text>'" otherwise.
Result<double> parse_log_base(std::string_view text, std::string_view name);

// Weight functions, exposed for tests and for the matrix export.
double smart_tf(char letter, double tf, double max_tf, double avg_tf, double length, double log_base);
double smart_idf(char letter, double n_docs, double df, double log_base);
double bm25_idf(double n_docs, double df);
double bm25_tf_part(double tf, double length, double avg_length, const Bm25Params& p);
// BM25's length normaliser 1 - b + b*length/avg_length (1 when avg_length is 0).
double bm25_length_norm(double length, double avg_length, double b);

// Pseudo-relevance feedback in the RM3 form (Lavrenko & Croft 2001, relevance
// models; Abdul-Jaleel et al. 2004, UMass at TREC 2004, the mix with the
// original query). A first BM25 pass takes its top `documents` hits as
// relevant; the relevance model P(w|R) = sum_d P(d) * tf(w,d)/|d| over them
// (P(d) = the hit's first-pass score over the sum of those scores; tf and |d|
// over title and body together, from the forward index) keeps its `terms`
// most probable words, renormalised; every word of the mix
//   weight(w) = lambda * qtf(w) + (1 - lambda) * |q| * P(w|R)
// (|q| = the original query's word count, lambda = original_weight) is then
// ranked as a bare word with query_weight = weight(w), so the breakdown still
// sums to the score. Required, excluded and phrase clauses keep applying.
// BM25 only (TF-IDF query weights take logs of qtf). Measured in docs/evaluation.md.
struct FeedbackOptions {
  std::size_t documents = 0;     // feedback documents; 0 = off (default: see docs/evaluation.md)
  std::size_t terms = 10;        // expansion words kept; 10 is the published common setting
  double original_weight = 0.5;  // lambda in [0, 1]; 1 reproduces the first pass
};

// Term proximity for BM25: BM25TP (Büttcher, Clarke & Lushman 2006, "Term
// proximity scoring for ad-hoc retrieval on very large text collections",
// SIGIR). In a document's body, every two occurrences of different query
// words with no other query word between them, at distance d, add
// w(other) / d^2 to each word's accumulator acc(t), with w(t) = ln(N/df_body);
// each word then adds
//   min(1, w(t)) * acc(t) * (k1 + 1) / (acc(t) + k1 * (1 - b + b * len/avglen))
// to the BM25 score, with the BM25 k1 and b in force. A word's part is below
// min(1, w(t)) * (k1 + 1) in every document, which bounds it for pruning.
// Its breakdown row has `proximity` set. Measured in docs/evaluation.md.
struct ProximityOptions {
  bool enabled = false;  // off by default: docs/evaluation.md gives the figures behind the choice
};

struct SearchOptions {
  Model model = Model::kBm25;
  Bm25Params bm25;
  SmartWeighting smart;
  // How fields combine and their weights. Default BM25F (kJoint) with title
  // weight 2, body 1: a title word counts as two body words of a body of the
  // title's relative length. Chosen on five public collections together
  // (docs/evaluation.md): at or above a one-field BM25 on 14 of 15
  // (collection, metric) pairs, significantly above on three, and nowhere
  // significantly below; the separate-field sum (kSum) is kept as an option.
  std::array<double, kFieldCount> field_weight = {2.0, 1.0};
  FieldScoring fields = FieldScoring::kJoint;  // BM25 only
  std::size_t top = 10;       // hits to return
  std::size_t offset = 0;     // hits to skip (paging)
  bool breakdown = true;      // fill Hit::breakdown
  bool snippets = true;       // fill Hit::snippet
  // Count every matching document exactly. Off, retrieval is pruned
  // (lode/topk.h: the same hits and scores, far fewer documents scored) and
  // SearchResults::matched may be a lower bound.
  bool count_all = false;
  QueryLimits limits;
  // Query text as typed syntax (default: people type queries) or as plain
  // words (lode/query.h); judged queries and batch files use kPlain.
  QueryReading reading = QueryReading::kSyntax;
  FeedbackOptions feedback;   // pseudo-relevance feedback (off by default)
  ProximityOptions proximity; // BM25TP term proximity (off by default)
};

// One (term, field) pair's share of a hit's score.
struct TermContribution {
  std::string term;
  Field field = Field::kBody;
  std::uint32_t tf = 0;
  std::uint64_t df = 0;      // documents with the term in this field (joint BM25: in any field)
  double idf = 0;            // BM25: bm25_idf; TF-IDF: the query-side idf factor
  std::uint32_t doc_length = 0;
  double avg_length = 0;
  double tf_part = 0;        // BM25: saturated, length-normalised tf; TF-IDF: normalised document weight
  double query_weight = 0;   // BM25: qtf; TF-IDF: normalised query weight
  double field_weight = 0;
  double contribution = 0;   // = field_weight * query_weight * idf * tf_part (BM25)
                             // = field_weight * query_weight * tf_part (TF-IDF)
  // A BM25TP proximity row (ProximityOptions): tf_part = the saturated
  // accumulator acc*(k1+1)/(acc+K), idf = min(1, w), query_weight and
  // field_weight 1, contribution = idf * tf_part; tf, df and lengths are the
  // body term's.
  bool proximity = false;
};

struct Snippet {
  std::string text;  // an excerpt of the body (UTF-8), "…" where cut
  std::vector<std::pair<std::uint32_t, std::uint32_t>> marks;  // [begin, end) byte ranges of matched words
};

struct Hit {
  DocId doc = 0;
  std::string external_id;
  std::string title;
  std::string kind;
  std::string path;
  double score = 0;
  std::vector<TermContribution> breakdown;
  Snippet snippet;
  std::uint32_t page = 0;  // paged documents (PDF): 1-based page the snippet comes from; else 0
};

struct SearchResults {
  std::vector<Hit> hits;       // best first; equal scores by external id (ascending), so the
                               // order never depends on the order documents were indexed in
  std::uint64_t matched = 0;   // live documents matching the query (a lower bound unless matched_exact)
  bool matched_exact = true;   // false: pruning skipped documents that match (SearchOptions::count_all)
  std::vector<std::string> warnings;
};

class Searcher {
 public:
  // Builds the query analyzer from the index's recorded settings.
  static Result<std::unique_ptr<Searcher>> create(IndexReader& reader);
  ~Searcher();

  // Runs one query in one read snapshot. Errors: those of parse_query,
  // InvalidArgument for bad options (k1 < 0, b outside [0,1], negative
  // field weight, feedback with TF-IDF or original_weight outside [0,1]),
  // and index read errors.
  Result<SearchResults> search(std::string_view query, const SearchOptions& options);

  // The breakdown of one document for a query (empty hit.breakdown if it does
  // not match). Same snapshot rules as search().
  Result<Hit> explain(std::string_view query, DocId doc, const SearchOptions& options);

 private:
  struct Impl;
  explicit Searcher(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

}  // namespace lode
