#include "server/static_files.h"

#include <string>

#include "server/problem.h"

namespace lode::server {
namespace {

bool ends_with(std::string_view s, std::string_view tail) {
  return s.size() >= tail.size() && s.substr(s.size() - tail.size()) == tail;
}

// True when `path` (already percent-decoded) could step outside the root:
// a "." or ".." segment, a backslash or a NUL byte.
bool escapes_root(std::string_view path) {
  if (path.find('\\') != std::string_view::npos || path.find('\0') != std::string_view::npos) return true;
  std::size_t at = 0;
  while (at <= path.size()) {
    std::size_t end = path.find('/', at);
    if (end == std::string_view::npos) end = path.size();
    std::string_view seg = path.substr(at, end - at);
    if (seg == "." || seg == "..") return true;
    at = end + 1;
  }
  return false;
}

}  // namespace

const EmbeddedFile* find_embedded(std::string_view name) {
  for (const EmbeddedFile& f : embedded_files())
    if (name == f.name) return &f;
  return nullptr;
}

std::string_view content_type(std::string_view name) {
  if (ends_with(name, ".html")) return "text/html; charset=utf-8";
  if (ends_with(name, ".css")) return "text/css; charset=utf-8";
  if (ends_with(name, ".js")) return "text/javascript; charset=utf-8";
  if (ends_with(name, ".svg")) return "image/svg+xml";
  if (ends_with(name, ".yaml")) return "application/yaml";  // RFC 9512
  return "application/octet-stream";
}

void send_embedded(httplib::Response& res, const EmbeddedFile& file) {
  // The page loads only its own files: no inline script, no third party.
  res.set_header("Content-Security-Policy",
                 "default-src 'self'; img-src 'self' data:; style-src 'self'; script-src 'self'; "
                 "connect-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'self'");
  res.set_content(std::string(reinterpret_cast<const char*>(file.data), file.size),
                  std::string(content_type(file.name)));
}

void serve_static(const httplib::Request& req, httplib::Response& res) {
  if (escapes_root(req.path))
    return send_problem(req, res, {400, "bad-path", "The path is not allowed",
                                   "paths may not contain '.' or '..' segments, backslashes or NUL bytes", {}});
  std::string_view name = std::string_view(req.path).substr(1);
  if (name.empty()) name = "index.html";
  const EmbeddedFile* f = name == "openapi.yaml" ? nullptr : find_embedded(name);
  if (!f) return send_problem(req, res, {404, "not-found", "Not found", "no page or file at '" + req.path + "'", {}});
  send_embedded(res, *f);
}

}  // namespace lode::server
