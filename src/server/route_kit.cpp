#include "server/route_kit.h"

namespace lode::server {

httplib::Server::Handler route(std::vector<std::string> allowed, Body body) {
  return [allowed = std::move(allowed), body = std::move(body)](const httplib::Request& req, httplib::Response& res) {
    auto params = request_params(req);
    if (auto* bad = std::get_if<Problem>(&params)) return send_problem(req, res, *bad);
    if (auto bad = check_known(std::get<Params>(params), allowed)) return send_problem(req, res, *bad);
    body(req, res, std::get<Params>(params));
  };
}

Parsed<ReaderPool*> pool_for(const Context& ctx, const std::string& name) {
  for (auto& pool : ctx.pools)
    if (name.empty() || pool->name() == name) return pool.get();
  std::string names;
  for (auto& pool : ctx.pools) names += (names.empty() ? "" : ", ") + pool->name();
  return Problem{404, "unknown-index", "No such index", "no index named '" + name + "'; this server has " + names,
                 "index"};
}

Parsed<Lease> lease_for(const Context& ctx, const std::string& name) {
  auto pool = pool_for(ctx, name);
  if (auto* bad = std::get_if<Problem>(&pool)) return *bad;
  auto lease = std::get<ReaderPool*>(pool)->acquire(ctx.options.limits.time_budget);
  if (!lease) return from_status(lease.status());
  return std::move(lease.value());
}

Parsed<DocId> named_doc(IndexReader& reader, const Params& p) {
  auto it = p.find("doc");
  if (it == p.end() || it->second.empty()) return bad_parameter("doc", "doc (a document id) is required");
  auto scope = reader.begin();
  if (!scope) return from_status(scope.status());
  auto id = reader.find_external(it->second);
  if (!id) return from_status(id.status(), "doc");
  return *id;
}

void send_failure(const httplib::Request& req, httplib::Response& res, const Problem& p) {
  if (p.status == 503) res.set_header("Retry-After", "1");
  send_problem(req, res, p);
}

}  // namespace lode::server
