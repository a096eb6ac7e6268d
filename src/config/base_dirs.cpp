#include <cstdlib>
#include <string>

#include "lode/config.h"

namespace lode {
namespace {

std::string env(const char* name) {
  const char* v = std::getenv(name);
  return v ? v : "";
}

// An XDG variable counts only when absolute (the convention says relative
// values are invalid and must be ignored).
std::string xdg_or(const char* name, const std::string& fallback) {
  std::string v = env(name);
  return !v.empty() && v[0] == '/' ? v : fallback;
}

}  // namespace

BaseDirs BaseDirs::from_environment() {
  BaseDirs d;
  d.home = env("HOME");
  d.data_home = xdg_or("XDG_DATA_HOME", d.home + "/.local/share");
  d.config_home = xdg_or("XDG_CONFIG_HOME", d.home + "/.config");
  return d;
}

}  // namespace lode
