// lode — command-line entry point. Parses arguments with CLI11 and hands each
// subcommand to the library; exceptions stop here.
#include <CLI/CLI.hpp>
#include <cstdio>
#include <exception>

#include "cli/commands.h"
#include "cli/common.h"

int main(int argc, char** argv) {
  CLI::App app{"lode — local full-text search with ranked, explainable results"};
  app.set_version_flag("--version", "lode " LODE_VERSION);
  app.require_subcommand(1);
  std::string index_flag;
  app.add_option("--index", index_flag,
                 "index file (default: $LODE_INDEX, else ./lode-index.sqlite)")
      ->type_name("FILE");
  // Options may come after the subcommand too: `lode search --index x.sqlite "q"`.
  app.fallthrough();
  std::vector<std::pair<CLI::App*, lode::cli::Runner>> runners;
  auto* index = app.add_subcommand("index", "add or update folders and files in the index");
  runners.emplace_back(index, lode::cli::add_index_command(*index, index_flag));
  auto* search = app.add_subcommand("search", "ranked search, one query or a batch");
  runners.emplace_back(search, lode::cli::add_search_command(*search, index_flag));
  auto* stats = app.add_subcommand("stats", "collection statistics and analyzer settings");
  runners.emplace_back(stats, lode::cli::add_stats_command(*stats, index_flag));
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    int rc = app.exit(e);
    return rc == 0 ? 0 : lode::cli::kExitUsage;
  }
  try {
    for (auto& [sub, run] : runners)
      if (sub->parsed()) return run();
  } catch (const std::exception& e) {
    std::fprintf(stderr, "lode: internal error: %s\n", e.what());
    return lode::cli::kExitError;
  }
  return lode::cli::kExitUsage;
}
