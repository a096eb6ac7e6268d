// GET /api/v1/whynot and /api/v1/moved (lode/inspect.h): parameters in,
// the library's JSON out.
#include "lode/inspect.h"
#include "server/route_kit.h"

namespace lode::server {
namespace {

// The model parameters a route shares with /search.
const std::vector<std::string> kModel = {"model", "k1", "b", "weighting", "log_base", "title_weight", "body_weight", "fields"};

void whynot(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  auto parsed = parse_search(p, ctx.options.limits, false);
  LODE_SEND_IF_PROBLEM(parsed);
  auto& r = std::get<SearchRequest>(parsed);
  WhyNotOptions wo;
  auto k = parse_count(p, "k", wo.k, ctx.options.limits.max_page);
  LODE_SEND_IF_PROBLEM(k);
  wo.k = std::max<std::size_t>(1, std::get<std::size_t>(k));
  wo.max_rank = ctx.options.limits.max_window;
  auto lease = lease_for(ctx, r.index);
  LODE_SEND_IF_PROBLEM(lease);
  ReaderSet& set = *std::get<Lease>(lease);
  auto id = named_doc(*set.reader, p);
  LODE_SEND_IF_PROBLEM(id);
  auto w = why_not(*set.searcher, *set.reader, r.query, std::get<DocId>(id), r.options, wo);
  if (!w) return send_failure(req, res, from_status(w.status(), "q"));
  send_json(res, why_not_json(r.query, *w, r.options, wo));
}

void moved(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  auto after = parse_search(p, ctx.options.limits, false);
  LODE_SEND_IF_PROBLEM(after);
  // The first setting: the same parameters prefixed "before_".
  Params bp = {{"q", param(p, "q")}};
  for (const std::string& m : kModel)
    if (auto it = p.find("before_" + m); it != p.end()) bp[m] = it->second;
  auto before = parse_search(bp, ctx.options.limits, false);
  if (auto* bad = std::get_if<Problem>(&before)) {
    Problem named = *bad;
    if (!named.parameter.empty()) named.parameter = "before_" + named.parameter;
    return send_failure(req, res, named);
  }
  MovedOptions o;
  auto depth = parse_count(p, "depth", o.depth, ctx.options.limits.max_page);
  LODE_SEND_IF_PROBLEM(depth);
  o.depth = std::max<std::size_t>(1, std::get<std::size_t>(depth));
  auto& a = std::get<SearchRequest>(after);
  auto lease = lease_for(ctx, a.index);
  LODE_SEND_IF_PROBLEM(lease);
  const SearchOptions& b = std::get<SearchRequest>(before).options;
  auto m = what_moved(*std::get<Lease>(lease)->searcher, a.query, b, a.options, o);
  if (!m) return send_failure(req, res, from_status(m.status(), "q"));
  send_json(res, moved_json(a.query, *m, b, a.options, o));
}

}  // namespace

void add_inspect_routes(httplib::Server& http, const Context& ctx) {
  std::vector<std::string> w = kModel, m = kModel;
  w.insert(w.end(), {"index", "q", "doc", "k"});
  m.insert(m.end(), {"index", "q", "depth"});
  for (const std::string& x : kModel) m.push_back("before_" + x);
  http.Get("/api/v1/whynot", route(w, bound(ctx, whynot)));
  http.Get("/api/v1/moved", route(m, bound(ctx, moved)));
}

}  // namespace lode::server
