// The model-parameter options shared by `lode search` and `lode eval` (one
// vocabulary: --model, --k1, --b, --weighting, --log-base, --title-weight,
// --body-weight, --fields, --feedback-docs, --feedback-terms, --feedback-weight), and a
// one-line description of a setting for reports. Presentation only.
#pragma once

#include <CLI/CLI.hpp>
#include <string>

#include "lode/config.h"
#include "lode/ranking.h"

namespace lode::cli {

struct ModelArgs {
  std::string model = "bm25";
  double k1 = SearchOptions{}.bm25.k1, b = SearchOptions{}.bm25.b;
  std::string weighting = SearchOptions{}.smart.notation();
  std::string log_base = "10";  // a number above 1 or e (SearchOptions{}.smart.log_base)
  double title_weight = SearchOptions{}.field_weight[0], body_weight = SearchOptions{}.field_weight[1];
  std::string fields{field_scoring_name(SearchOptions{}.fields)};
  std::size_t feedback_docs = SearchOptions{}.feedback.documents;
  std::size_t feedback_terms = SearchOptions{}.feedback.terms;
  double feedback_weight = SearchOptions{}.feedback.original_weight;
  bool proximity = SearchOptions{}.proximity.enabled;
};

// Takes the config file's model and field weights as defaults (an option
// given on the command line still wins). Call before add_model_options.
void apply_config(ModelArgs& args, const UserConfig& config);
// Registers the options on `app`, writing into `args` (which must outlive parsing).
void add_model_options(CLI::App& app, ModelArgs& args);
// The SearchOptions for `args`; InvalidArgument for an unknown model or
// weighting, or a parameter of the other model set away from its default.
Result<SearchOptions> to_search_options(const ModelArgs& args);
// "bm25 k1=1.2 b=0.75 fields=joint title=1 body=1" (+ " feedback=10x10@0.5"), or the TF-IDF equivalent.
std::string describe(const SearchOptions& o);
// How queries were read, for run and report headers: "queries read as plain
// text" or "queries parsed as query syntax".
std::string describe_reading(QueryReading r);

}  // namespace lode::cli
