// Arguments that begin with '-' but are not options: a query such as
// `lode search '-storm'` or `lode keyterms --query '-draft +storm'`.
// Presentation only: this rewrites the argument list before CLI11 sees it.
#pragma once

#include <CLI/CLI.hpp>
#include <string>
#include <vector>

namespace lode::cli {

// The arguments (argv[1..]) with every token that starts with '-' and names
// no option of `app` or of the subcommand it follows rewritten so CLI11 takes
// it as a value: after an option that expects a value, joined to it
// ("--query=-storm"); otherwise, when it starts with a single '-', moved
// behind a "--" at the end (a positional, such as search's query). An unknown
// "--name" stays, so CLI11 reports it as the mistyped option it is. Tokens after a "--" the user gave are left alone,
// as are negative numbers ("-1"), which CLI11 already accepts as values.
std::vector<std::string> protect_dash_values(const CLI::App& app, int argc, const char* const* argv);

}  // namespace lode::cli
