#include "server/problem.h"

#include "lode/json_text.h"

namespace lode::server {

Problem bad_parameter(std::string parameter, std::string detail) {
  return {400, "bad-parameter", "A request parameter is not valid", std::move(detail), std::move(parameter)};
}

Problem over_limit(std::string parameter, std::string detail) {
  return {400, "over-limit", "The request exceeds a server limit", std::move(detail), std::move(parameter)};
}

Problem from_status(const Status& s, std::string parameter) {
  switch (s.code()) {
    case Code::kInvalidArgument:
      return bad_parameter(std::move(parameter), s.message());
    case Code::kLimit:
      return over_limit(std::move(parameter), s.message());
    case Code::kNotFound:
      return {404, "not-found", "Not found", s.message(), std::move(parameter)};
    case Code::kBusy:
      return {503, "busy", "The index is busy", s.message(), {}};
    default:
      return {500, "index-error", "The index could not be read", s.to_string(), {}};
  }
}

std::string json_text(const nlohmann::json& body) { return dump_json(body); }

void send_json(httplib::Response& res, const nlohmann::json& body) { res.set_content(json_text(body), "application/json"); }

nlohmann::json problem_json(const Problem& p, std::string_view instance) {
  nlohmann::json body{{"type", "urn:lode:problem:" + p.slug},
                      {"title", p.title},
                      {"status", p.status},
                      {"detail", p.detail},
                      {"instance", instance}};
  if (!p.parameter.empty()) body["parameter"] = p.parameter;
  return body;
}

std::string problem_response(const Problem& p, std::string_view extra_headers) {
  std::string body = json_text(problem_json(p, ""));
  std::string out = "HTTP/1.1 " + std::to_string(p.status) + " " + p.title + "\r\n";
  for (const auto& [name, value] : kCommonHeaders) out += std::string(name) + ": " + value + "\r\n";
  out += "Content-Type: application/problem+json\r\nConnection: close\r\n";
  out += extra_headers;
  out += "Content-Length: " + std::to_string(body.size()) + "\r\n\r\n";
  return out + body;
}

void send_problem(const httplib::Request& req, httplib::Response& res, const Problem& p) {
  res.status = p.status;
  res.set_content(json_text(problem_json(p, req.path)), "application/problem+json");
}

}  // namespace lode::server
