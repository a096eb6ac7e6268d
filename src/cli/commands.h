// The lode subcommands: each registers its options on a CLI11 app and runs.
#pragma once

#include <CLI/CLI.hpp>
#include <functional>

#include "cli/common.h"

namespace lode::cli {

// Each returns the function to run if its subcommand was chosen.
using Runner = std::function<int()>;
Runner add_index_command(CLI::App& app, const Setup& setup);
Runner add_problems_command(CLI::App& app, const Setup& setup);
Runner add_watch_command(CLI::App& app, const Setup& setup);
Runner add_search_command(CLI::App& app, const Setup& setup);
Runner add_stats_command(CLI::App& app, const Setup& setup);
Runner add_eval_command(CLI::App& app, const Setup& setup);
Runner add_serve_command(CLI::App& app, const Setup& setup);
Runner add_nearest_command(CLI::App& app, const Setup& setup);
Runner add_keyterms_command(CLI::App& app, const Setup& setup);
Runner add_twins_command(CLI::App& app, const Setup& setup);
Runner add_themes_command(CLI::App& app, const Setup& setup);
Runner add_matrix_command(CLI::App& app, const Setup& setup);
Runner add_sift_command(CLI::App& app, const Setup& setup);
Runner add_whynot_command(CLI::App& app, const Setup& setup);
Runner add_moved_command(CLI::App& app, const Setup& setup);
Runner add_verify_command(CLI::App& app, const Setup& setup);

}  // namespace lode::cli
