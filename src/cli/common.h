// Shared pieces of the lode command line: exit codes, the index path rule,
// and terminal detection. Presentation only: no ranking or index logic here.
#pragma once

#include <cstdio>
#include <string>

#include "lode/status.h"

namespace lode::cli {

// Exit codes (documented in README.md).
enum Exit : int {
  kExitOk = 0,
  kExitError = 1,        // the command failed (message on stderr)
  kExitUsage = 2,        // bad command line
  kExitSomeFailed = 3,   // index: finished, but some files could not be read
};

inline constexpr const char* kDefaultIndex = "lode-index.sqlite";

// --index if given, else $LODE_INDEX, else kDefaultIndex in the current folder.
std::string resolve_index(const std::string& flag);

bool stderr_is_tty();
bool stdout_is_tty();

// Prints "lode: <status>" to stderr and returns the exit code for it.
int fail(const Status& s);

}  // namespace lode::cli
