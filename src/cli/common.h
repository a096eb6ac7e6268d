// Shared pieces of the lode command line: exit codes, the index path rule,
// and terminal detection. Presentation only: no ranking or index logic here.
#pragma once

#include <cstdio>
#include <string>
#include <string_view>

#include "lode/config.h"
#include "lode/status.h"

namespace lode::cli {

// Exit codes (documented in README.md).
enum Exit : int {
  kExitOk = 0,
  kExitError = 1,        // the command failed (message on stderr)
  kExitUsage = 2,        // bad command line
  kExitSomeFailed = 3,   // index: finished, but some files could not be read
  kExitDamaged = 4,      // verify: the index is damaged (findings on stdout)
};

// What every command starts from: the global --index and the user's
// folders and config file (lode/config.h), read before the arguments.
struct Setup {
  std::string index_flag;  // --index as given; "" when not given
  BaseDirs dirs;
  UserConfig config;       // empty when there is no config file
};

// The index path, by the documented precedence: --index, else $LODE_INDEX,
// else the config file's `index`, else dirs.default_index()
// ($XDG_DATA_HOME/lode/index.sqlite).
std::string resolve_index(const Setup& setup);
// As resolve_index(), creating the default folder ($XDG_DATA_HOME/lode) if
// it is the one chosen and missing, for the commands that write an index.
Result<std::string> resolve_index_for_writing(const Setup& setup);

bool stderr_is_tty();
bool stdout_is_tty();
// Whether to style output on stdout (bold words): a terminal, and NO_COLOR
// unset or empty (https://no-color.org).
bool stdout_styled();

// `text` (a file name, or a message holding one) as printed on `stream`:
// terminal_name() (lode/names.h) when the stream is a terminal, so a name
// holding control characters cannot steer it; the exact bytes otherwise,
// so scripts read names as they are.
std::string shown(std::string_view text, std::FILE* stream = stdout);

// The exit code for a failed status: kExitUsage for a bad argument or a
// limit (the user can fix the command), else kExitError.
int exit_code(const Status& s);

// Prints "lode: <status>" to stderr and returns the exit code for it.
int fail(const Status& s);

}  // namespace lode::cli
