#include "cli/common.h"

#include <unistd.h>

#include <cstdlib>

namespace lode::cli {

std::string resolve_index(const std::string& flag) {
  if (!flag.empty()) return flag;
  if (const char* env = std::getenv("LODE_INDEX"); env && *env) return env;
  return kDefaultIndex;
}

bool stderr_is_tty() { return ::isatty(STDERR_FILENO) == 1; }
bool stdout_is_tty() { return ::isatty(STDOUT_FILENO) == 1; }

int fail(const Status& s) {
  std::fprintf(stderr, "lode: %s\n", s.to_string().c_str());
  return s.code() == Code::kInvalidArgument || s.code() == Code::kLimit ? kExitUsage : kExitError;
}

}  // namespace lode::cli
