// Weight functions of the ranking models (formulas in include/lode/ranking.h).
#include <charconv>
#include <cmath>

#include "lode/ranking.h"

namespace lode {

Result<double> parse_log_base(std::string_view text, std::string_view name) {
  if (text == "e") return std::exp(1.0);
  double v = 0;
  auto [p, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
  if (ec == std::errc() && p == text.data() + text.size() && v > 1 && v <= 1e9) return v;
  return Status::InvalidArgument(std::string(name) + " must be a number above 1 or e, not '" + std::string(text) +
                                 "'");
}

std::string_view model_name(Model m) { return m == Model::kBm25 ? "bm25" : "tfidf"; }

std::optional<Model> parse_model(std::string_view name) {
  if (name == "bm25") return Model::kBm25;
  if (name == "tfidf") return Model::kTfIdf;
  return std::nullopt;
}

namespace {
constexpr std::string_view kTfLetters = "nlabLr";
constexpr std::string_view kIdfLetters = "ntps";
constexpr std::string_view kNormLetters = "nc";

Status check_triple(std::string_view t, std::string_view side) {
  if (t.size() != 3)
    return Status::InvalidArgument("weighting: the " + std::string(side) + " part '" + std::string(t) +
                                   "' must have 3 letters (tf, idf, normalisation)");
  if (kTfLetters.find(t[0]) == std::string_view::npos)
    return Status::InvalidArgument("weighting: unknown tf letter '" + std::string(1, t[0]) +
                                   "' (use one of n l a b L r)");
  if (kIdfLetters.find(t[1]) == std::string_view::npos)
    return Status::InvalidArgument("weighting: unknown idf letter '" + std::string(1, t[1]) +
                                   "' (use one of n t p s)");
  if (kNormLetters.find(t[2]) == std::string_view::npos)
    return Status::InvalidArgument("weighting: unknown normalisation letter '" + std::string(1, t[2]) +
                                   "' (use n or c)");
  return Status();
}
}  // namespace

Result<SmartWeighting> SmartWeighting::parse(std::string_view notation) {
  auto dot = notation.find('.');
  if (dot == std::string_view::npos)
    return Status::InvalidArgument("weighting '" + std::string(notation) +
                                   "': expected document.query, e.g. lnc.ltc");
  auto d = notation.substr(0, dot), q = notation.substr(dot + 1);
  LODE_RETURN_IF_ERROR(check_triple(d, "document"));
  LODE_RETURN_IF_ERROR(check_triple(q, "query"));
  SmartWeighting w;
  w.doc_tf = d[0], w.doc_idf = d[1], w.doc_norm = d[2];
  w.query_tf = q[0], w.query_idf = q[1], w.query_norm = q[2];
  return w;
}

std::string SmartWeighting::notation() const {
  return std::string{doc_tf, doc_idf, doc_norm, '.', query_tf, query_idf, query_norm};
}

double smart_tf(char letter, double tf, double max_tf, double avg_tf, double length, double log_base) {
  if (tf <= 0) return 0;
  double ln_base = std::log(log_base);
  switch (letter) {
    case 'n': return tf;
    case 'l': return 1.0 + std::log(tf) / ln_base;
    case 'a': return max_tf > 0 ? 0.5 + 0.5 * tf / max_tf : 0;
    case 'b': return 1.0;
    case 'L': return (1.0 + std::log(tf) / ln_base) / (1.0 + std::log(avg_tf) / ln_base);
    case 'r': return length > 0 ? tf / length : 0;
    default: return 0;
  }
}

double smart_idf(char letter, double n_docs, double df, double log_base) {
  if (df <= 0) return 0;  // a term no live document has carries no weight
  double ln_base = std::log(log_base);
  switch (letter) {
    case 'n': return 1.0;
    case 't': return std::log(n_docs / df) / ln_base;
    case 'p': return n_docs > df ? std::max(0.0, std::log((n_docs - df) / df) / ln_base) : 0.0;
    case 's': return std::log((1.0 + n_docs) / (1.0 + df)) / ln_base + 1.0;
    default: return 0;
  }
}

double bm25_idf(double n_docs, double df) { return std::log(1.0 + (n_docs - df + 0.5) / (df + 0.5)); }

double bm25_length_norm(double length, double avg_length, double b) {
  return avg_length > 0 ? (1.0 - b + b * length / avg_length) : 1.0;
}

double bm25_tf_part(double tf, double length, double avg_length, const Bm25Params& p) {
  if (tf <= 0) return 0;
  return tf * (p.k1 + 1.0) / (tf + p.k1 * bm25_length_norm(length, avg_length, p.b));
}

std::string_view field_scoring_name(FieldScoring f) { return f == FieldScoring::kJoint ? "joint" : "sum"; }

std::optional<FieldScoring> parse_field_scoring(std::string_view name) {
  if (name == "joint") return FieldScoring::kJoint;
  if (name == "sum") return FieldScoring::kSum;
  return std::nullopt;
}

}  // namespace lode
