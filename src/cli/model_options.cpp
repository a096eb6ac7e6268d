#include "cli/model_options.h"

#include <cstdio>

namespace lode::cli {

namespace {
std::string fmt(double x) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%g", x);
  return buf;
}
}  // namespace

void apply_config(ModelArgs& a, const UserConfig& c) {
  if (c.model) a.model = *c.model;
  if (c.title_weight) a.title_weight = *c.title_weight;
  if (c.body_weight) a.body_weight = *c.body_weight;
}

void add_model_options(CLI::App& app, ModelArgs& a) {
  app.add_option("--model", a.model, "bm25 (default) or tfidf");
  app.add_option("--k1", a.k1, "BM25 tf saturation (default 1.2)")->check(CLI::Range(0.0, 1000.0));
  app.add_option("--b", a.b, "BM25 length normalisation (default 0.75)")->check(CLI::Range(0.0, 1.0));
  app.add_option("--weighting", a.weighting, "TF-IDF SMART weighting, document.query (default lnc.ltc)");
  app.add_option("--log-base", a.log_base, "base of the logs in TF-IDF weights: a number or e (default 10)");
  app.add_option("--title-weight", a.title_weight, "weight of title matches (default " + fmt(a.title_weight) + ")")
      ->check(CLI::Range(0.0, 1e6));
  app.add_option("--body-weight", a.body_weight, "weight of body matches (default " + fmt(a.body_weight) + ")")
      ->check(CLI::Range(0.0, 1e6));
  app.add_option("--fields", a.fields,
                 "joint (BM25F, title and body tf combined before saturation; TF-IDF: one vector over title "
                 "and body) or sum (each field scored alone, then added); default " + a.fields);
  app.add_option("--feedback-docs", a.feedback_docs,
                 "pseudo-relevance feedback (RM3) from this many top documents (default 0 = off)")
      ->check(CLI::Range(0, 1000));
  app.add_option("--feedback-terms", a.feedback_terms, "expansion words feedback adds (default 10)")
      ->check(CLI::Range(1, 1000));
  app.add_flag("--proximity,!--no-proximity", a.proximity,
               "BM25: add term proximity (BM25TP: query words near each other in the body score higher)");
  app.add_option("--feedback-weight", a.feedback_weight, "weight of the original query in the feedback mix (default 0.5)")
      ->check(CLI::Range(0.0, 1.0));
}

Result<SearchOptions> to_search_options(const ModelArgs& a) {
  SearchOptions o;
  auto model = parse_model(a.model);
  if (!model) return Status::InvalidArgument("--model must be bm25 or tfidf, not '" + a.model + "'");
  o.model = *model;
  auto w = SmartWeighting::parse(a.weighting);
  if (!w) return w.status();
  if (o.model == Model::kBm25 && w->notation() != o.smart.notation())
    return Status::InvalidArgument("--weighting applies to --model tfidf");
  if (o.model == Model::kTfIdf && (a.k1 != o.bm25.k1 || a.b != o.bm25.b))
    return Status::InvalidArgument("--k1 and --b apply to --model bm25");
  auto fields = parse_field_scoring(a.fields);
  if (!fields) return Status::InvalidArgument("--fields must be joint or sum, not '" + a.fields + "'");
  o.fields = *fields;
  o.bm25 = {a.k1, a.b};
  o.smart = *w;
  auto base = parse_log_base(a.log_base, "--log-base");
  if (!base) return base.status();
  o.smart.log_base = *base;
  o.field_weight = {a.title_weight, a.body_weight};
  o.feedback = {a.feedback_docs, a.feedback_terms, a.feedback_weight};
  if (a.proximity && o.model != Model::kBm25) return Status::InvalidArgument("--proximity applies to --model bm25");
  o.proximity.enabled = a.proximity;
  return o;
}

std::string describe(const SearchOptions& o) {
  char buf[256];
  if (o.model == Model::kBm25)
    std::snprintf(buf, sizeof buf, "bm25 k1=%g b=%g fields=%s", o.bm25.k1, o.bm25.b,
                  std::string(field_scoring_name(o.fields)).c_str());
  else
    std::snprintf(buf, sizeof buf, "tfidf %s log=%g fields=%s", o.smart.notation().c_str(), o.smart.log_base,
                  std::string(field_scoring_name(o.fields)).c_str());
  std::string s = buf;
  std::snprintf(buf, sizeof buf, " title=%g body=%g", o.field_weight[0], o.field_weight[1]);
  s += buf;
  if (o.proximity.enabled) s += " proximity=bm25tp";
  if (o.feedback.documents > 0) {
    std::snprintf(buf, sizeof buf, " feedback=%zu docs/%zu terms/%g", o.feedback.documents, o.feedback.terms,
                  o.feedback.original_weight);
    s += buf;
  }
  return s;
}

std::string describe_reading(QueryReading r) {
  return r == QueryReading::kPlain ? "queries read as plain text" : "queries parsed as query syntax";
}

}  // namespace lode::cli
