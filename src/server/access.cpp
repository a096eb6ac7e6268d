#include "server/access.h"

#include "server/problem.h"
#include "server/static_files.h"

namespace lode::server {
namespace {

// The value of cookie `name` in a Cookie header ("a=1; b=2"), or "".
std::string_view cookie_value(std::string_view header, std::string_view name) {
  while (!header.empty()) {
    std::size_t end = header.find(';');
    std::string_view pair = header.substr(0, end);
    while (!pair.empty() && pair.front() == ' ') pair.remove_prefix(1);
    if (pair.size() > name.size() && pair.substr(0, name.size()) == name && pair[name.size()] == '=')
      return pair.substr(name.size() + 1);
    if (end == std::string_view::npos) break;
    header.remove_prefix(end + 1);
  }
  return {};
}

}  // namespace

bool constant_time_equal(std::string_view given, std::string_view secret) {
  unsigned diff = given.size() == secret.size() ? 0u : 1u;
  for (std::size_t i = 0; i < secret.size(); ++i) {
    unsigned char g = i < given.size() ? static_cast<unsigned char>(given[i]) : 0;
    diff |= static_cast<unsigned>(g ^ static_cast<unsigned char>(secret[i]));
  }
  return diff == 0;
}

bool valid_token(std::string_view token) {
  if (token.empty()) return false;
  for (char c : token)
    if (c <= ' ' || c >= 127 || c == '"' || c == ',' || c == ';' || c == '\\') return false;
  return true;
}

bool authorized(const httplib::Request& req, const std::string& token) {
  // get_header_value returns a copy: keep it alive while views point into it.
  const std::string auth = req.get_header_value("Authorization");
  constexpr std::string_view kBearer = "Bearer ";
  if (auth.size() > kBearer.size() && std::string_view(auth).substr(0, kBearer.size()) == kBearer &&
      constant_time_equal(std::string_view(auth).substr(kBearer.size()), token))
    return true;
  const std::string cookies = req.get_header_value("Cookie");
  std::string_view cookie = cookie_value(cookies, kAccessCookie);
  return !cookie.empty() && constant_time_equal(cookie, token);
}

void refuse(const httplib::Request& req, httplib::Response& res) {
  res.set_header("WWW-Authenticate", "Bearer realm=\"lode\"");
  const EmbeddedFile* page = find_embedded("unlock.html");
  if (req.get_header_value("Accept").find("text/html") != std::string::npos && page) {
    send_embedded(res, *page);
    res.status = 401;
    return;
  }
  send_problem(req, res, {401, "unauthorized", "An access token is required",
                          "send 'Authorization: Bearer TOKEN' (the token the server was started with)", {}});
}

void unlock(const httplib::Request& req, httplib::Response& res, const std::string& token) {
  if (!constant_time_equal(req.get_param_value("token"), token)) return refuse(req, res);
  res.set_header("Set-Cookie", std::string(kAccessCookie) + "=" + token + "; Path=/; HttpOnly; SameSite=Strict");
  res.set_redirect("/", 303);
}

}  // namespace lode::server
