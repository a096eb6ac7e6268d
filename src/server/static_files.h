// The browser page and the OpenAPI file, compiled into the binary
// (embedded_files.cpp is generated at build time by embed_files.cmake from
// web/* and docs/openapi.yaml). Nothing here touches the disk at run time.
#pragma once

#include <httplib.h>

#include <cstddef>
#include <span>
#include <string_view>

namespace lode::server {

struct EmbeddedFile {
  const char* name;            // file name: "index.html", "openapi.yaml"
  const unsigned char* data;
  std::size_t size;
};

// Every embedded file (defined in the generated source).
std::span<const EmbeddedFile> embedded_files();

// The file called `name`, or nullptr.
const EmbeddedFile* find_embedded(std::string_view name);

// Content type for a file name by its extension.
std::string_view content_type(std::string_view name);

// Sends `file` with its content type and the page's security headers.
void send_embedded(httplib::Response& res, const EmbeddedFile& file);

// GET /<name>: "/" is index.html; a path with a "." or ".." segment, a
// backslash or a NUL byte is refused with 400, an unknown name gets 404.
void serve_static(const httplib::Request& req, httplib::Response& res);

}  // namespace lode::server
