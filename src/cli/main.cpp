// lode — command-line entry point. Parses arguments with CLI11 and hands each
// subcommand to the library; exceptions stop here.
#include <CLI/CLI.hpp>
#include <cstdio>
#include <exception>
#include <algorithm>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/dash_args.h"

int main(int argc, char** argv) {
  CLI::App app{"lode — local full-text search with ranked, explainable results"};
  app.set_version_flag("--version", "lode " LODE_VERSION);
  app.require_subcommand(1);
  lode::cli::Setup setup;
  setup.dirs = lode::BaseDirs::from_environment();
  if (auto config = lode::load_user_config(setup.dirs); !config) {
    std::fprintf(stderr, "lode: %s\n", config.status().to_string().c_str());
    return lode::cli::kExitUsage;
  } else {
    setup.config = std::move(config.value());
  }
  app.add_option("--index", setup.index_flag,
                 "index file (default: $LODE_INDEX, else the config file's index, else "
                 "$XDG_DATA_HOME/lode/index.sqlite)")
      ->type_name("FILE");
  // Options may come after the subcommand too: `lode search --index x.sqlite "q"`.
  app.fallthrough();
  std::vector<std::pair<CLI::App*, lode::cli::Runner>> runners;
  auto* index = app.add_subcommand("index", "add or update folders and files in the index");
  runners.emplace_back(index, lode::cli::add_index_command(*index, setup));
  auto* problems = app.add_subcommand("problems", "files the index could not read, recorded by earlier runs");
  runners.emplace_back(problems, lode::cli::add_problems_command(*problems, setup));
  auto* watch = app.add_subcommand("watch", "index, then keep the index current as files change (Ctrl-C stops)");
  runners.emplace_back(watch, lode::cli::add_watch_command(*watch, setup));
  auto* search = app.add_subcommand("search", "ranked search, one query or a batch");
  runners.emplace_back(search, lode::cli::add_search_command(*search, setup));
  auto* stats = app.add_subcommand("stats", "collection statistics and analyzer settings");
  runners.emplace_back(stats, lode::cli::add_stats_command(*stats, setup));
  auto* eval = app.add_subcommand("eval", "judged queries: metrics, comparisons with significance, sweeps");
  runners.emplace_back(eval, lode::cli::add_eval_command(*eval, setup));
  auto* serve = app.add_subcommand("serve", "HTTP JSON API and browser page (read-only; loopback by default)");
  runners.emplace_back(serve, lode::cli::add_serve_command(*serve, setup));
  auto* nearest = app.add_subcommand("nearest", "documents nearest to a document or a passage (TF-IDF cosine)");
  runners.emplace_back(nearest, lode::cli::add_nearest_command(*nearest, setup));
  auto* keyterms = app.add_subcommand("keyterms", "the heaviest terms of a document or of a search's hits");
  runners.emplace_back(keyterms, lode::cli::add_keyterms_command(*keyterms, setup));
  auto* twins = app.add_subcommand("twins", "groups of near-duplicate documents");
  runners.emplace_back(twins, lode::cli::add_twins_command(*twins, setup));
  auto* themes = app.add_subcommand("themes", "topic groups of the archive (spherical k-means)");
  runners.emplace_back(themes, lode::cli::add_themes_command(*themes, setup));
  auto* matrix = app.add_subcommand("matrix", "export the TF-IDF document-term matrix (Matrix Market)");
  runners.emplace_back(matrix, lode::cli::add_matrix_command(*matrix, setup));
  auto* sift = app.add_subcommand("sift", "find all of it: judge batches, a classifier ranks the rest, a rule says when to stop");
  runners.emplace_back(sift, lode::cli::add_sift_command(*sift, setup));
  auto* whynot = app.add_subcommand("whynot", "why a document is not higher (or not at all) in a query's results");
  runners.emplace_back(whynot, lode::cli::add_whynot_command(*whynot, setup));
  auto* moved = app.add_subcommand("moved", "one query under two model settings: what entered, left and moved");
  runners.emplace_back(moved, lode::cli::add_moved_command(*moved, setup));
  auto* verify = app.add_subcommand("verify", "read the whole index and report any damage (exit code 4)");
  runners.emplace_back(verify, lode::cli::add_verify_command(*verify, setup));
  try {
    // CLI11 takes the arguments last first.
    std::vector<std::string> args = lode::cli::protect_dash_values(app, argc, argv);
    std::reverse(args.begin(), args.end());
    app.parse(args);
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
