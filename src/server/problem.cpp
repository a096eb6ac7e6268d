#include "server/problem.h"

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

void send_json(httplib::Response& res, const nlohmann::json& body) {
  res.set_content(body.dump(-1, ' ', false, nlohmann::json::error_handler_t::replace), "application/json");
}

void send_problem(const httplib::Request& req, httplib::Response& res, const Problem& p) {
  nlohmann::json body{{"type", "urn:lode:problem:" + p.slug},
                      {"title", p.title},
                      {"status", p.status},
                      {"detail", p.detail},
                      {"instance", req.path}};
  if (!p.parameter.empty()) body["parameter"] = p.parameter;
  res.status = p.status;
  res.set_content(body.dump(-1, ' ', false, nlohmann::json::error_handler_t::replace),
                  "application/problem+json");
}

}  // namespace lode::server
