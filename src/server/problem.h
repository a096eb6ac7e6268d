// RFC 9457 problem details: the one shape every error response takes.
#pragma once

#include <httplib.h>

#include <nlohmann/json.hpp>
#include <string>

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

// Writes `p` to `res` as application/problem+json (instance = request path).
void send_problem(const httplib::Request& req, httplib::Response& res, const Problem& p);
// Writes a JSON body (invalid UTF-8, should any reach here, is replaced).
void send_json(httplib::Response& res, const nlohmann::json& body);

}  // namespace lode::server
