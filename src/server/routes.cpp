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

// The commit generation the reader sees now, in a snapshot of its own.
Result<std::uint64_t> generation(IndexReader& reader) {
  auto scope = reader.begin();
  if (!scope) return scope.status();
  return reader.stats().generation;
}

void search(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  auto parsed = parse_search(p, ctx.options.limits, true);
  LODE_SEND_IF_PROBLEM(parsed);
  auto& r = std::get<SearchRequest>(parsed);
  auto lease = lease_for(ctx, r.index);
  LODE_SEND_IF_PROBLEM(lease);
  Lease& set = std::get<Lease>(lease);
  auto before = generation(*set->reader);
  if (!before) return send_failure(req, res, from_status(before.status()));
  const std::string key = ResultCache::key(set.index_name(), *before, p, "index");
  if (auto cached = ctx.cache->get(key)) return res.set_content(*cached, "application/json");
  auto results = set->searcher->search(r.query, r.options);
  if (!results) return send_failure(req, res, from_status(results.status(), "q"));
  auto words = hit_words(*set->reader, *set->analyzer, results->hits);
  if (!words) return send_failure(req, res, from_status(words.status()));
  nlohmann::json json = results_json(r.query, *results, r.options);
  json["words"] = *words;
  std::string body = json_text(json);
  // Searcher::search takes its own snapshot: keep the answer only when no
  // commit came between, so the entry holds exactly generation `before`.
  auto after = generation(*set->reader);
  if (after && *after == *before) ctx.cache->put(key, body);
  res.set_content(std::move(body), "application/json");
}

void breakdown(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
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
  send_json(res, breakdown_json(r.query, *hit, r.options));
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

// Answered by the connection thread with the reserved readers: never waits
// for a worker. Also shows the result cache and the connection loop.
void health(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params&) {
  nlohmann::json indexes = nlohmann::json::array();
  for (auto& pool : ctx.reserved) {
    auto lease = pool->acquire(ctx.options.limits.time_budget);
    if (!lease) return send_failure(req, res, from_status(lease.status()));
    IndexReader& reader = *lease.value()->reader;
    auto scope = reader.begin();
    if (!scope) return send_failure(req, res, from_status(scope.status()));
    auto stats = reader.stats();
    indexes.push_back({{"name", pool->name()}, {"documents", stats.documents}, {"generation", stats.generation}});
  }
  const CacheCounters cache = ctx.cache->counters();
  nlohmann::json body{{"schema", "lode.health/1"},
                      {"serving", true},
                      {"version", LODE_VERSION},
                      {"indexes", indexes},
                      {"result_cache",
                       {{"hits", cache.hits},
                        {"misses", cache.misses},
                        {"entries", cache.entries},
                        {"bytes", cache.bytes},
                        {"capacity_bytes", cache.capacity_bytes}}}};
  if (ctx.load) {
    const LoopLoad l = ctx.load();
    body["connections"] = {{"open", l.open_connections},          {"queued", l.queued},
                           {"busy_workers", l.busy_workers},      {"refused_busy", l.refused_busy},
                           {"refused_connections", l.refused_connections}, {"timed_out", l.timed_out}};
  }
  send_json(res, body);
}

using RouteFn = void (*)(const Context&, const httplib::Request&, httplib::Response&, const Params&);

struct ApiRoute {
  const char* path;
  bool post;  // also POST (parameters in a JSON body)
  std::vector<std::string> params;
  RouteFn fn;
};

// Every API route with its parameters: registration and Allow both read it.
const std::vector<ApiRoute>& api_routes() {
  static const std::vector<ApiRoute> routes = [] {
    const std::vector<std::string> model = {"index", "q", "model", "k1", "b", "weighting", "log_base",
                                            "title_weight", "body_weight", "fields"};
    auto search_params = model, breakdown_params = model;
    search_params.insert(search_params.end(), {"top", "offset", "breakdown", "snippets", "count_all"});
    breakdown_params.push_back("doc");
    return std::vector<ApiRoute>{
        {"/api/v1/search", true, search_params, search},
        {"/api/v1/breakdown", false, breakdown_params, breakdown},
        {"/api/v1/document", false, {"index", "doc", "q"}, document},
        {"/api/v1/documents", false, {"index", "top", "offset"}, listing},
        {"/api/v1/stats", false, {"index"}, stats},
        {"/api/v1/health", false, {}, health},
    };
  }();
  return routes;
}

}  // namespace

void add_api_routes(httplib::Server& http, const Context& ctx) {
  for (const ApiRoute& a : api_routes()) {
    RouteFn fn = a.fn;
    auto handler = route(a.params, [&ctx, fn](const httplib::Request& req, httplib::Response& res, const Params& p) {
      fn(ctx, req, res, p);
    });
    http.Get(a.path, handler);
    if (a.post) http.Post(a.path, handler);
  }
  add_inspect_routes(http, ctx);
  add_sift_routes(http, ctx);
  http.Get("/api/v1/openapi.yaml", [](const httplib::Request&, httplib::Response& res) {
    if (const EmbeddedFile* f = find_embedded("openapi.yaml")) send_embedded(res, *f);
  });
}

std::string allowed_methods(std::string_view path) {
  for (const ApiRoute& a : api_routes())
    if (path == a.path) return a.post ? "GET, HEAD, POST" : "GET, HEAD";
  if (path == "/" || path == "/api/v1/openapi.yaml") return "GET, HEAD";
  if (path.size() > 1 && path != "/openapi.yaml" && find_embedded(path.substr(1))) return "GET, HEAD";
  return "";
}

}  // namespace lode::server
