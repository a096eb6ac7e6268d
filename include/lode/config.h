// lode/config.h — where lode keeps its files, and the user's config file.
//
// Base folders follow the XDG Base Directory convention: data under
// $XDG_DATA_HOME (default ~/.local/share), settings under $XDG_CONFIG_HOME
// (default ~/.config). The default index is <data>/lode/index.sqlite; the
// optional config file is <config>/lode/config.
//
// The config file holds defaults a user sets once, one `key = value` a line:
//
//   # lines starting with '#' and blank lines are ignored
//   index = ~/archive/lode.sqlite     # the index file (~/ is the home folder;
//                                     # a relative path is relative to this file's folder)
//   model = tfidf                     # bm25 or tfidf
//   title_weight = 3                  # field weights, numbers >= 0
//   body_weight = 1
//   serve.address = 127.0.0.1         # lode serve: listen address,
//   serve.port = 7340                 # port (0-65535)
//   serve.token_file = ~/.config/lode/token   # and token file
//
// A value may be wrapped in double quotes (to keep a '#' or outer spaces).
// Each key may appear once. Precedence everywhere: command-line option >
// environment variable (LODE_INDEX, LODE_SERVE_TOKEN) > config file > default.
//
// Thread safety: pure functions; from_environment() reads the environment.
#pragma once

#include <optional>
#include <string>

#include "lode/status.h"

namespace lode {

struct BaseDirs {
  std::string home;         // $HOME ("" when unset)
  std::string data_home;    // $XDG_DATA_HOME if absolute, else <home>/.local/share
  std::string config_home;  // $XDG_CONFIG_HOME if absolute, else <home>/.config

  // From $HOME, $XDG_DATA_HOME and $XDG_CONFIG_HOME. The XDG convention
  // ignores relative values of the XDG variables, and so does this.
  static BaseDirs from_environment();
  std::string default_index() const { return data_home + "/lode/index.sqlite"; }
  std::string config_file() const { return config_home + "/lode/config"; }
};

// The settings of one config file; unset keys stay nullopt.
struct UserConfig {
  std::string path;  // the file read ("" when there was none)
  std::optional<std::string> index;         // absolute after ~ and relative-path expansion
  std::optional<std::string> model;         // "bm25" or "tfidf"
  std::optional<double> title_weight, body_weight;
  std::optional<std::string> serve_address;
  std::optional<int> serve_port;
  std::optional<std::string> serve_token_file;  // expanded like index
};

// Parses config text; `path` names the file in errors and anchors relative
// paths, `home` expands "~/". Errors: InvalidArgument "<path>:<line>: <what>"
// for a line that is not `key = value`, an unknown or repeated key, or a bad
// value (naming the key and what it takes).
Result<UserConfig> parse_config(std::string_view text, const std::string& path, const std::string& home);

// Reads dirs.config_file(): an empty UserConfig when the file does not
// exist; IOError naming the file when it exists but cannot be read; the
// errors of parse_config otherwise.
Result<UserConfig> load_user_config(const BaseDirs& dirs);

}  // namespace lode
