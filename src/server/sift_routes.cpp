// /api/v1/sift*: saved reviews (lode/screening.h). Reads always; writes
// (start, next, mark, check) only when the server was started with
// ServeOptions::allow_judging, each in its own short SQLite transaction on a
// connection opened for the request.
#include "lode/screening_json.h"
#include "server/route_kit.h"

namespace lode::server {
namespace {

// A request's reader set, read scope and sifts, opened together.
struct Opened {
  std::optional<Lease> lease;
  std::optional<IndexReader::ReadScope> scope;
  std::unique_ptr<SiftBook> book;
};

Parsed<Opened> open_sifts(const Context& ctx, const Params& p, bool write) {
  if (write && !ctx.options.allow_judging)
    return Problem{403, "read-only", "This server records no judgments",
                   "start the server with --allow-judging to judge through the page or the API", {}};
  auto pool = pool_for(ctx, param(p, "index"));
  if (auto* bad = std::get_if<Problem>(&pool)) return *bad;
  Opened o;
  auto lease = std::get<ReaderPool*>(pool)->acquire(ctx.options.limits.time_budget);
  if (!lease) return from_status(lease.status());
  o.lease.emplace(std::move(lease.value()));
  auto scope = (*o.lease)->reader->begin();
  if (!scope) return from_status(scope.status());
  o.scope.emplace(std::move(scope.value()));
  auto book = SiftBook::open(std::get<ReaderPool*>(pool)->path(), write);
  if (!book) return from_status(book.status());
  o.book = std::move(book.value());
  return o;
}

Parsed<std::string> sift_name(const Params& p) {
  std::string name = param(p, "name");
  if (name.empty()) return bad_parameter("name", "name (the sift's name) is required");
  return name;
}

#define LODE_OPEN(write)                                  \
  auto name_ = sift_name(p);                              \
  LODE_SEND_IF_PROBLEM(name_);                            \
  const std::string& name = std::get<std::string>(name_); \
  auto opened_ = open_sifts(ctx, p, write);               \
  LODE_SEND_IF_PROBLEM(opened_);                          \
  Opened& o = std::get<Opened>(opened_);                  \
  IndexReader& reader = *(*o.lease)->reader

void send_state(const httplib::Request& req, httplib::Response& res, Opened& o, const std::string& name,
                bool judgments) {
  auto st = o.book->state(*(*o.lease)->reader, name);
  if (!st) return send_failure(req, res, from_status(st.status(), "name"));
  send_json(res, sift_json(*st, judgments));
}

void send_batch(const httplib::Request& req, httplib::Response& res, Opened& o, const std::string& name,
                const SiftBatch& b) {
  IndexReader& reader = *(*o.lease)->reader;
  auto st = o.book->state(reader, name);
  if (!st) return send_failure(req, res, from_status(st.status(), "name"));
  auto j = batch_json(reader, name, b, *st);
  if (!j) return send_failure(req, res, from_status(j.status()));
  send_json(res, *j);
}

void list(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  auto opened = open_sifts(ctx, p, false);
  LODE_SEND_IF_PROBLEM(opened);
  auto l = std::get<Opened>(opened).book->list();
  if (!l) return send_failure(req, res, from_status(l.status()));
  nlohmann::json j = sift_list_json(*l);
  j["judging"] = ctx.options.allow_judging;  // whether the page may offer judging
  send_json(res, j);
}

void state(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  LODE_OPEN(false);
  (void)reader;
  send_state(req, res, o, name, param(p, "judgments") == "true");
}

void open_batch(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  LODE_OPEN(false);
  auto st = o.book->state(reader, name);
  if (!st) return send_failure(req, res, from_status(st.status(), "name"));
  if (!st->open_batch)
    return send_problem(req, res, Problem{404, "no-open-batch", "No batch is open",
                                          "every proposed document is judged; POST /api/v1/sift/next proposes more", "name"});
  send_batch(req, res, o, name, *st->open_batch);
}

void start(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  LODE_OPEN(true);
  SiftStart s;
  s.name = name;
  s.query = param(p, "q");
  if (s.query.size() > ctx.options.limits.max_query_bytes)
    return send_problem(req, res, over_limit("q", "q is longer than " + std::to_string(ctx.options.limits.max_query_bytes) + " bytes"));
  std::string seeds = param(p, "seeds");  // comma-separated document ids
  for (std::size_t at = 0; at < seeds.size();) {
    std::size_t comma = seeds.find(',', at);
    if (comma == std::string::npos) comma = seeds.size();
    if (comma > at) s.seeds.push_back(seeds.substr(at, comma - at));
    at = comma + 1;
  }
  s.reviewer = param(p, "reviewer");
  if (s.reviewer.empty()) s.reviewer = "page";
  Status st = o.book->start(reader, s);
  if (!st.ok()) return send_failure(req, res, from_status(st, "name"));
  res.status = 201;
  send_state(req, res, o, name, false);
}

void next(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  LODE_OPEN(true);
  auto b = o.book->next(reader, name);
  if (!b) return send_failure(req, res, from_status(b.status(), "name"));
  send_batch(req, res, o, name, *b);
}

void mark(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  LODE_OPEN(true);
  std::string doc = param(p, "doc"), rel = param(p, "relevant"), reviewer = param(p, "reviewer");
  if (doc.empty()) return send_problem(req, res, bad_parameter("doc", "doc (a document id) is required"));
  if (rel != "true" && rel != "false")
    return send_problem(req, res, bad_parameter("relevant", "relevant must be true or false"));
  Status st = o.book->mark(reader, name, {{doc, rel == "true"}}, reviewer.empty() ? "page" : reviewer);
  if (!st.ok()) return send_failure(req, res, from_status(st, "doc"));
  send_state(req, res, o, name, false);
}

void check(const Context& ctx, const httplib::Request& req, httplib::Response& res, const Params& p) {
  LODE_OPEN(true);
  auto size = parse_count(p, "size", 50, 1000);
  LODE_SEND_IF_PROBLEM(size);
  auto b = o.book->check_sample(reader, name, std::get<std::size_t>(size));
  if (!b) return send_failure(req, res, from_status(b.status(), "size"));
  send_batch(req, res, o, name, *b);
}

}  // namespace

void add_sift_routes(httplib::Server& http, const Context& ctx) {
  http.Get("/api/v1/sifts", route({"index"}, bound(ctx, list)));
  http.Get("/api/v1/sift", route({"index", "name", "judgments"}, bound(ctx, state)));
  http.Get("/api/v1/sift/batch", route({"index", "name"}, bound(ctx, open_batch)));
  http.Post("/api/v1/sift/start", route({"index", "name", "q", "seeds", "reviewer"}, bound(ctx, start)));
  http.Post("/api/v1/sift/next", route({"index", "name"}, bound(ctx, next)));
  http.Post("/api/v1/sift/mark", route({"index", "name", "doc", "relevant", "reviewer"}, bound(ctx, mark)));
  http.Post("/api/v1/sift/check", route({"index", "name", "size"}, bound(ctx, check)));
}

}  // namespace lode::server
