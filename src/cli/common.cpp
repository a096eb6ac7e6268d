#include "cli/common.h"

#include <unistd.h>

#include <cstdlib>
#include <filesystem>

#include "lode/names.h"

namespace lode::cli {

std::string resolve_index(const Setup& setup) {
  if (!setup.index_flag.empty()) return setup.index_flag;
  if (const char* env = std::getenv("LODE_INDEX"); env && *env) return env;
  if (setup.config.index) return *setup.config.index;
  return setup.dirs.default_index();
}

Result<std::string> resolve_index_for_writing(const Setup& setup) {
  std::string path = resolve_index(setup);
  if (path != setup.dirs.default_index()) return path;
  const std::filesystem::path folder = std::filesystem::path(path).parent_path();
  std::error_code ec;
  std::filesystem::create_directories(folder, ec);
  if (ec) return Status::IOError("cannot create the index folder " + folder.string() + ": " + ec.message());
  return path;
}

bool stderr_is_tty() { return ::isatty(STDERR_FILENO) == 1; }
bool stdout_is_tty() { return ::isatty(STDOUT_FILENO) == 1; }

bool stdout_styled() {
  const char* no_color = std::getenv("NO_COLOR");
  return stdout_is_tty() && (no_color == nullptr || *no_color == '\0');
}

std::string shown(std::string_view text, std::FILE* stream) {
  return ::isatty(::fileno(stream)) == 1 ? terminal_name(text) : std::string(text);
}

int exit_code(const Status& s) {
  return s.code() == Code::kInvalidArgument || s.code() == Code::kLimit ? kExitUsage : kExitError;
}

int fail(const Status& s) {
  std::fprintf(stderr, "lode: %s\n", shown(s.to_string(), stderr).c_str());
  return exit_code(s);
}

}  // namespace lode::cli
