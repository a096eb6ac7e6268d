// RFC 9457 problem details: the one shape every error response takes.
#pragma once

#include <httplib.h>

#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <utility>

#include "lode/status.h"

namespace lode::server {

// A problem to send: HTTP status, a type slug (documented in docs/api.md as
// urn:lode:problem:SLUG), a short title and a detail naming what is wrong.
struct Problem {
  int status = 500;
  std::string slug;
  std::string title;
  std::string detail;
  std::string parameter;  // the request parameter at fault, if any
};

Problem bad_parameter(std::string parameter, std::string detail);
Problem over_limit(std::string parameter, std::string detail);
// Maps a library Status: InvalidArgument/Limit -> 400, NotFound -> 404,
// Busy -> 503, anything else -> 500.
Problem from_status(const Status& s, std::string parameter = {});

// Headers on every response: no caching (results change with each commit),
// no sniffing, no referrer leaking the query to another site.
inline constexpr std::pair<const char*, const char*> kCommonHeaders[] = {
    {"Cache-Control", "no-store"}, {"X-Content-Type-Options", "nosniff"}, {"Referrer-Policy", "no-referrer"}};

// The problem's JSON body; `instance` is the request path.
nlohmann::json problem_json(const Problem& p, std::string_view instance);
// A whole HTTP/1.1 response carrying `p` that closes the connection, with
// the common headers and `extra_headers` ("Name: value\r\n" lines): the
// connection thread's answer when it refuses a request it did not parse.
std::string problem_response(const Problem& p, std::string_view extra_headers = {});

// Writes `p` to `res` as application/problem+json (instance = request path).
void send_problem(const httplib::Request& req, httplib::Response& res, const Problem& p);
// JSON text as sent: dump_json() (lode/json_text.h), names that are not
// UTF-8 escaped reversibly.
std::string json_text(const nlohmann::json& body);
// Writes a JSON body (json_text).
void send_json(httplib::Response& res, const nlohmann::json& body);

}  // namespace lode::server
