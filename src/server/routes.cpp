#include "server/routes.h"

#include "lode/present.h"
#include "server/params.h"
#include "server/problem.h"
#include "server/route_kit.h"
#include "server/static_files.h"

namespace lode::server {
namespace {

// Stored text of one field, cut to `max_bytes` at a code point boundary,
// with the words of `terms` marked.
Result<MarkedText> marked_field(ReaderSet& set, DocId doc, Field field, std::size_t max_bytes,
                                const std::unordered_set<std::string>& terms) {
  auto text = set.reader->stored_text(doc, field);
  if (!text) return text.status();
  MarkedText m;
  m.text = std::move(text.value());
  if (m.text.size() > max_bytes) {
    std::size_t cut = max_bytes;
    while (cut > 0 && (static_cast<unsigned char>(m.text[cut]) & 0xC0) == 0x80) --cut;
    m.text.resize(cut);
    m.truncated = true;
  }
  m.marks = mark_terms(m.text, *set.analyzer, terms);
  return m;
}

void search(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  auto parsed = parse_search(p, ctx.options.limits, true);
  LODE_SEND_IF_PROBLEM(parsed);
  auto& r = std::get<SearchRequest>(parsed);
  auto lease = lease_for(ctx, r.index);
  LODE_SEND_IF_PROBLEM(lease);
  auto results = std::get<Lease>(lease)->searcher->search(r.query, r.options);
  if (!results) return send_failure(req, res, from_status(results.status(), "q"));
  send_json(res, results_json(r.query, *results, r.options));
}

void explain(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  auto parsed = parse_search(p, ctx.options.limits, false);
  LODE_SEND_IF_PROBLEM(parsed);
  auto& r = std::get<SearchRequest>(parsed);
  auto lease = lease_for(ctx, r.index);
  LODE_SEND_IF_PROBLEM(lease);
  ReaderSet& set = *std::get<Lease>(lease);
  auto id = named_doc(*set.reader, p);
  LODE_SEND_IF_PROBLEM(id);
  auto hit = set.searcher->explain(r.query, std::get<DocId>(id), r.options);
  if (!hit) return send_failure(req, res, from_status(hit.status(), "q"));
  send_json(res, explain_json(r.query, *hit, r.options));
}

void document(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  std::string doc = p.count("doc") ? p.at("doc") : "";
  std::string query = p.count("q") ? p.at("q") : "";
  if (doc.empty()) return send_problem(req, res, bad_parameter("doc", "doc (a document id) is required"));
  const ServeLimits& limits = ctx.options.limits;
  if (query.size() > limits.max_query_bytes)
    return send_problem(req, res, over_limit("q", "q is longer than " + std::to_string(limits.max_query_bytes) + " bytes"));
  auto lease = lease_for(ctx, p.count("index") ? p.at("index") : "");
  LODE_SEND_IF_PROBLEM(lease);
  ReaderSet& set = *std::get<Lease>(lease);
  std::unordered_set<std::string> terms;
  if (!query.empty()) {
    auto parsed = parse_query(query, *set.analyzer, QueryLimits{limits.max_query_bytes, limits.max_query_terms});
    if (!parsed) return send_failure(req, res, from_status(parsed.status(), "q"));
    terms = query_terms(*parsed);
  }
  auto scope = set.reader->begin();  // one snapshot for the lookup and both fields
  if (!scope) return send_failure(req, res, from_status(scope.status()));
  auto id = set.reader->find_external(doc);
  if (!id) return send_failure(req, res, from_status(id.status(), "doc"));
  auto info = set.reader->document(*id);
  if (!info) return send_failure(req, res, from_status(info.status()));
  auto title = marked_field(set, *id, Field::kTitle, limits.max_document_bytes, terms);
  if (!title) return send_failure(req, res, from_status(title.status()));
  auto body = marked_field(set, *id, Field::kBody, limits.max_document_bytes, terms);
  if (!body) return send_failure(req, res, from_status(body.status()));
  send_json(res, document_json(*info, query, *title, *body));
}

void listing(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  auto parsed = parse_paging(p, ctx.options.limits);
  LODE_SEND_IF_PROBLEM(parsed);
  const Paging& o = std::get<Paging>(parsed);
  auto lease = lease_for(ctx, p.count("index") ? p.at("index") : "");
  LODE_SEND_IF_PROBLEM(lease);
  IndexReader& reader = *std::get<Lease>(lease)->reader;
  auto scope = reader.begin();
  if (!scope) return send_failure(req, res, from_status(scope.status()));
  nlohmann::json items = nlohmann::json::array();
  std::size_t seen = 0;
  for (DocId d = 0; d < reader.doc_id_limit() && items.size() < o.top; ++d) {
    if (!reader.live(d) || seen++ < o.offset) continue;
    auto info = reader.document(d);
    if (!info) return send_failure(req, res, from_status(info.status()));
    items.push_back({{"doc", info->external_id}, {"title", info->title}, {"kind", info->kind}});
  }
  send_json(res, {{"schema", "lode.listing/1"}, {"documents", reader.stats().documents},
                  {"offset", o.offset}, {"items", items}});
}

void stats(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  auto lease = lease_for(ctx, p.count("index") ? p.at("index") : "");
  LODE_SEND_IF_PROBLEM(lease);
  IndexReader& reader = *std::get<Lease>(lease)->reader;
  auto scope = reader.begin();
  if (!scope) return send_failure(req, res, from_status(scope.status()));
  send_json(res, stats_json(reader.stats(), reader.settings(), reader.path()));
}

void health(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params&) {
  nlohmann::json indexes = nlohmann::json::array();
  for (auto& pool : ctx.pools) {
    auto lease = lease_for(ctx, pool->name());
    LODE_SEND_IF_PROBLEM(lease);
    IndexReader& reader = *std::get<Lease>(lease)->reader;
    auto scope = reader.begin();
    if (!scope) return send_failure(req, res, from_status(scope.status()));
    indexes.push_back({{"name", pool->name()}, {"documents", reader.stats().documents}});
  }
  send_json(res, {{"schema", "lode.health/1"}, {"serving", true}, {"version", LODE_VERSION}, {"indexes", indexes}});
}

}  // namespace

void add_api_routes(httplib::Server& http, const Context& ctx) {
  auto bind = [&ctx](void (*fn)(const Context&, const httplib::Request&, httplib::Response&, const Params&)) {
    return [&ctx, fn](const httplib::Request& req, httplib::Response& res, const Params& p) { fn(ctx, req, res, p); };
  };
  const std::vector<std::string> model = {"index", "q", "model", "k1", "b", "weighting", "log_base",
                                          "title_weight", "body_weight", "fields"};
  auto search_params = model, explain_params = model;
  search_params.insert(search_params.end(), {"top", "offset", "breakdown", "snippets", "count_all"});
  explain_params.push_back("doc");
  http.Get("/api/v1/search", route(search_params, bind(search)));
  http.Post("/api/v1/search", route(search_params, bind(search)));
  http.Get("/api/v1/explain", route(explain_params, bind(explain)));
  http.Get("/api/v1/document", route({"index", "doc", "q"}, bind(document)));
  http.Get("/api/v1/documents", route({"index", "top", "offset"}, bind(listing)));
  http.Get("/api/v1/stats", route({"index"}, bind(stats)));
  http.Get("/api/v1/health", route({}, bind(health)));
  add_inspect_routes(http, ctx);
  add_sift_routes(http, ctx);
  http.Get("/api/v1/openapi.yaml", [](const httplib::Request&, httplib::Response& res) {
    if (const EmbeddedFile* f = find_embedded("openapi.yaml")) send_embedded(res, *f);
  });
}

}  // namespace lode::server
