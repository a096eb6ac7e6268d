// The config file parser (format in lode/config.h).
#include <cerrno>
#include <charconv>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>

#include "lode/config.h"

namespace lode {
namespace {

std::string_view trim(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r')) s.remove_suffix(1);
  return s;
}

class LineParser {
 public:
  LineParser(const std::string& path, const std::string& home) : path_(path), home_(home) {}

  Status line(std::string_view raw, std::size_t number, UserConfig& c) {
    number_ = number;
    std::string_view s = trim(raw);
    if (s.empty() || s[0] == '#') return Status();
    const std::size_t eq = s.find('=');
    if (eq == std::string_view::npos) return error("expected 'key = value', found '" + std::string(s) + "'");
    const std::string key(trim(s.substr(0, eq)));
    if (key.empty()) return error("no key before '='");
    auto value = unquote(trim(s.substr(eq + 1)));
    if (!value) return value.status();
    if (!seen_.insert(key).second) return error("'" + key + "' is set twice");
    if (value->empty()) return error("'" + key + "' has no value");
    return assign(key, *value, c);
  }

 private:
  Status error(const std::string& what) const {
    return Status::InvalidArgument(path_ + ":" + std::to_string(number_) + ": " + what);
  }

  // A quoted value keeps everything inside the quotes; an unquoted one ends
  // at a '#' comment.
  Result<std::string> unquote(std::string_view v) const {
    if (!v.empty() && v[0] == '"') {
      const std::size_t close = v.find('"', 1);
      if (close == std::string_view::npos) return error("unclosed quote in the value");
      std::string_view rest = trim(v.substr(close + 1));
      if (!rest.empty() && rest[0] != '#')
        return error("unexpected text after the quoted value: '" + std::string(rest) + "'");
      return std::string(v.substr(1, close - 1));
    }
    if (const std::size_t hash = v.find('#'); hash != std::string_view::npos) v = trim(v.substr(0, hash));
    return std::string(v);
  }

  std::string expand_path(const std::string& v) const {
    if (v == "~" || v.rfind("~/", 0) == 0) return home_ + v.substr(1);
    if (!v.empty() && v[0] == '/') return v;
    return (std::filesystem::path(path_).parent_path() / v).lexically_normal().string();
  }

  Result<double> number(const std::string& key, const std::string& v) const {
    double x = 0;
    auto [p, ec] = std::from_chars(v.data(), v.data() + v.size(), x);
    if (ec != std::errc() || p != v.data() + v.size() || !(x >= 0) || x > 1e6)
      return error("'" + key + "' takes a number from 0 to 1000000, not '" + v + "'");
    return x;
  }

  Status assign(const std::string& key, const std::string& v, UserConfig& c) const {
    if (key == "index") {
      c.index = expand_path(v);
    } else if (key == "model") {
      if (v != "bm25" && v != "tfidf") return error("'model' takes bm25 or tfidf, not '" + v + "'");
      c.model = v;
    } else if (key == "title_weight" || key == "body_weight") {
      auto x = number(key, v);
      if (!x) return x.status();
      (key == "title_weight" ? c.title_weight : c.body_weight) = *x;
    } else if (key == "serve.address") {
      c.serve_address = v;
    } else if (key == "serve.port") {
      int port = -1;
      auto [p, ec] = std::from_chars(v.data(), v.data() + v.size(), port);
      if (ec != std::errc() || p != v.data() + v.size() || port < 0 || port > 65535)
        return error("'serve.port' takes a port number from 0 to 65535, not '" + v + "'");
      c.serve_port = port;
    } else if (key == "serve.token_file") {
      c.serve_token_file = expand_path(v);
    } else {
      return error("unknown key '" + key +
                   "' (known: index, model, title_weight, body_weight, serve.address, serve.port, "
                   "serve.token_file)");
    }
    return Status();
  }

  const std::string& path_;
  const std::string& home_;
  std::size_t number_ = 0;
  std::set<std::string> seen_;
};

}  // namespace

Result<UserConfig> parse_config(std::string_view text, const std::string& path, const std::string& home) {
  UserConfig c;
  c.path = path;
  LineParser parser(path, home);
  std::size_t number = 0;
  while (!text.empty()) {
    const std::size_t nl = text.find('\n');
    const std::string_view line = text.substr(0, nl);
    text = nl == std::string_view::npos ? std::string_view() : text.substr(nl + 1);
    LODE_RETURN_IF_ERROR(parser.line(line, ++number, c));
  }
  return c;
}

Result<UserConfig> load_user_config(const BaseDirs& dirs) {
  const std::string path = dirs.config_file();
  std::error_code ec;
  if (!std::filesystem::exists(path, ec)) return UserConfig{};
  std::ifstream in(path, std::ios::binary);
  if (!in) return Status::IOError("cannot read config file " + path + ": " + std::strerror(errno));
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) return Status::IOError("cannot read config file " + path);
  return parse_config(text.str(), path, dirs.home);
}

}  // namespace lode
