// Options shared by `lode index` and `lode watch` (crawl, readers, limits,
// threads), their registration, and the stop flag set by Ctrl-C.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "lode/indexer.h"

namespace lode::cli {

struct IndexArgs {
  std::vector<std::string> paths;
  std::string language = "english";
  bool no_stopwords = false;
  std::vector<std::string> include, exclude;
  std::string id_field = "id", title_field = "title", text_field = "text";
  double batch_mb = 256;
  double max_file_mb = 1024;
  double max_text_mb = 64;
  double max_unpacked_mb = 512;
  unsigned max_html_depth = 512;
  unsigned jobs = 0;
  bool hidden = false, follow = false, keep_missing = false, quiet = false;
};

// Registers the shared options on `app` (the paths positional included).
void add_index_options(CLI::App& app, IndexArgs& a);

// Analyzer settings for a new index, when --language / --no-stopwords were given.
std::optional<IndexSettings> settings_from(const IndexArgs& a, CLI::App& app);
WriterOptions writer_options_from(const IndexArgs& a);
// Run options; `cancelled` polls the Ctrl-C flag installed here (SIGINT, SIGTERM).
IndexRunOptions run_options_from(const IndexArgs& a);

// Prints warnings, problems and the per-kind summary of one run to stderr.
void print_report(const IndexReport& r, bool quiet, double seconds, const std::string& index_path,
                  const CollectionStats& stats);

}  // namespace lode::cli
