// What every route handler uses: the parameter-checking wrapper, the reader
// set of the index a request names, and failure replies.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "server/params.h"
#include "server/problem.h"
#include "server/routes.h"

namespace lode::server {

// The route body, given checked parameters.
using Body = std::function<void(const httplib::Request&, httplib::Response&, const Params&)>;

// Wraps a route: reads parameters, refuses unknown ones, then runs `body`.
httplib::Server::Handler route(std::vector<std::string> allowed, Body body);

// A route function with the server's context bound in.
using ContextHandler = void (*)(const Context&, const httplib::Request&, httplib::Response&, const Params&);
inline Body bound(const Context& ctx, ContextHandler fn) {
  return [&ctx, fn](const httplib::Request& req, httplib::Response& res, const Params& p) { fn(ctx, req, res, p); };
}

// The pool of the index named `name` ("" = the first), or a 404 problem.
Parsed<ReaderPool*> pool_for(const Context& ctx, const std::string& name);
// A reader set of the index named `name` ("" = the first).
Parsed<Lease> lease_for(const Context& ctx, const std::string& name);

// The live document a request names with `doc` (required), looked up in its
// own read scope; a 400 or 404 problem naming `doc` otherwise.
Parsed<DocId> named_doc(IndexReader& reader, const Params& p);

// Sends a problem for a failed lease or search; Busy gets Retry-After.
void send_failure(const httplib::Request& req, httplib::Response& res, const Problem& p);

// The value of parameter `name`, or "" when absent.
inline std::string param(const Params& p, const char* name) {
  auto it = p.find(name);
  return it == p.end() ? std::string() : it->second;
}

}  // namespace lode::server

#define LODE_SEND_IF_PROBLEM(parsed) \
  if (auto* bad_ = std::get_if<Problem>(&(parsed))) return send_failure(req, res, *bad_)
