// Options the explore commands (like, keyterms, twins, themes) share: how
// document vectors are weighted. Presentation only.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <string>

#include "cli/common.h"
#include "lode/index.h"
#include "lode/status.h"
#include "lode/vectors.h"

namespace lode::cli {

struct VectorArgs {
  std::string weighting = "lt";   // SMART tf and idf letters
  std::string log_base = "10";    // a number or "e"
  double title_weight = 1.0, body_weight = 1.0;
};

// Registers --vector-weighting, --log-base, --title-weight, --body-weight.
void add_vector_options(CLI::App& app, VectorArgs& args);
Result<VectorOptions> to_vector_options(const VectorArgs& args);

// Opens the index at the resolved path (error printed, nullptr on failure).
std::unique_ptr<IndexReader> open_reader(const Setup& setup);
// The document named on the command line, or an error already printed (nullopt).
std::optional<DocId> named_document(IndexReader& reader, const std::string& name);

}  // namespace lode::cli
