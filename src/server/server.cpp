#include "lode/server.h"

#include <sys/socket.h>

#include <atomic>
#include <regex>
#include <thread>

#include "server/access.h"
#include "server/problem.h"
#include "server/routes.h"
#include "server/static_files.h"

namespace lode {

// cpp-httplib listens with a backlog of 5, so a burst of connections (a page
// load, a load test) waits out SYN retries of a second; Linux lets a second
// listen() on the bound socket raise it.
class Listener : public httplib::Server {
 public:
  void widen_backlog(int n) { ::listen(svr_sock_, n); }
};

struct HttpServer::Impl {
  server::Context ctx;
  Listener http;
  // stop() may come before serve() starts listening; these close that race.
  std::atomic<bool> entered{false}, stopping{false}, returned{false};
};

namespace {

// Every response: no caching (results change with each commit), no sniffing,
// no referrer leaking the query to another site.
void add_common_headers(httplib::Response& res) {
  res.set_header("Cache-Control", "no-store");
  res.set_header("X-Content-Type-Options", "nosniff");
  res.set_header("Referrer-Policy", "no-referrer");
}

// Turns httplib's own bare error statuses (no route, body too large, bad
// request line) into problem details.
void problem_for_status(const httplib::Request& req, httplib::Response& res, std::size_t max_body) {
  using server::Problem;
  if (!res.body.empty()) return;  // a route already wrote its problem
  switch (res.status) {
    case 404:
      return server::send_problem(req, res, {404, "not-found", "Not found", "no route at '" + req.path + "'", {}});
    case 413:
      return server::send_problem(req, res, {413, "body-too-large", "The request body is too large",
                                             "request bodies are limited to " + std::to_string(max_body) +
                                                 " bytes on this server", {}});
    default:
      return server::send_problem(req, res, {res.status, "http-error", "HTTP error " + std::to_string(res.status),
                                             "the request could not be handled", {}});
  }
}

void install(const server::Context& ctx, Listener& http) {
  const ServeOptions& o = ctx.options;
  std::size_t threads = o.threads;
  http.new_task_queue = [threads] { return new httplib::ThreadPool(threads); };
  http.set_payload_max_length(o.limits.max_body_bytes);
  auto budget = std::chrono::duration_cast<std::chrono::microseconds>(o.limits.time_budget);
  http.set_read_timeout(budget);
  http.set_write_timeout(budget);
  // Small JSON replies: without this, Nagle's algorithm and delayed ACKs add
  // ~40 ms to every keep-alive request.
  http.set_tcp_nodelay(true);
  // An idle keep-alive connection holds a worker thread: let it go soon.
  http.set_keep_alive_timeout(2);
  if (!o.token.empty()) {
    const std::string token = o.token;
    http.set_pre_routing_handler([token](const httplib::Request& req, httplib::Response& res) {
      // The unlock form and its style sheet hold no archive data.
      if ((req.path == "/unlock" && req.method == "POST") || req.path == "/style.css")
        return httplib::Server::HandlerResponse::Unhandled;
      if (server::authorized(req, token)) return httplib::Server::HandlerResponse::Unhandled;
      server::refuse(req, res);
      add_common_headers(res);
      return httplib::Server::HandlerResponse::Handled;
    });
    http.Post("/unlock", [token](const httplib::Request& req, httplib::Response& res) {
      server::unlock(req, res, token);
    });
  }
  server::add_api_routes(http, ctx);
  http.Get("/.*", server::serve_static);
  std::size_t max_body = o.limits.max_body_bytes;
  http.set_error_handler(httplib::Server::HandlerWithResponse(
      [max_body](const httplib::Request& req, httplib::Response& res) {
        problem_for_status(req, res, max_body);
        return httplib::Server::HandlerResponse::Handled;
      }));
  http.set_exception_handler([](const httplib::Request& req, httplib::Response& res, std::exception_ptr ep) {
    std::string what = "unknown error";
    try {
      std::rethrow_exception(ep);
    } catch (const std::exception& e) {
      what = e.what();
    } catch (...) {
    }
    server::send_problem(req, res, {500, "internal-error", "Internal error", what, {}});
  });
  http.set_post_routing_handler([](const httplib::Request&, httplib::Response& res) { add_common_headers(res); });
}

}  // namespace

bool is_loopback_address(std::string_view address) {
  if (address == "localhost" || address == "::1" || address == "[::1]") return true;
  static const std::regex v4(R"(127\.\d{1,3}\.\d{1,3}\.\d{1,3})");
  return std::regex_match(address.begin(), address.end(), v4);
}

HttpServer::HttpServer(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
HttpServer::~HttpServer() = default;

Result<std::unique_ptr<HttpServer>> HttpServer::create(std::vector<ServedIndex> indexes, const ServeOptions& options) {
  if (indexes.empty()) return Status::InvalidArgument("no index to serve");
  if (options.threads == 0) return Status::InvalidArgument("threads must be at least 1");
  if (!options.token.empty() && !server::valid_token(options.token))
    return Status::InvalidArgument("the access token may hold only visible ASCII characters other than \" , ; \\");
  auto impl = std::make_unique<Impl>();
  impl->ctx.options = options;
  static const std::regex name_rule(R"([A-Za-z0-9_.-]+)");
  for (ServedIndex& ix : indexes) {
    if (!std::regex_match(ix.name, name_rule))
      return Status::InvalidArgument("index name '" + ix.name + "' may hold only letters, digits, '_', '.', '-'");
    for (auto& pool : impl->ctx.pools)
      if (pool->name() == ix.name) return Status::InvalidArgument("index name '" + ix.name + "' is given twice");
    auto check = IndexReader::open(ix.path);  // fail now, not on the first request
    if (!check) return check.status();
    impl->ctx.pools.push_back(std::make_unique<server::ReaderPool>(ix.name, ix.path, options.threads));
  }
  install(impl->ctx, impl->http);
  return std::unique_ptr<HttpServer>(new HttpServer(std::move(impl)));
}

Result<int> HttpServer::bind() {
  const ServeOptions& o = impl_->ctx.options;
  int port = o.port == 0 ? impl_->http.bind_to_any_port(o.address) : o.port;
  if (o.port != 0 && !impl_->http.bind_to_port(o.address, o.port)) port = -1;
  if (port <= 0)
    return Status::IOError("cannot listen on " + o.address + ":" + std::to_string(o.port) +
                           " (address in use, or not an address of this machine)");
  impl_->http.widen_backlog(128);
  return port;
}

Status HttpServer::serve() {
  impl_->entered = true;
  bool ok = impl_->stopping || impl_->http.listen_after_bind();
  impl_->returned = true;
  return ok ? Status() : Status::IOError("the server stopped with an error");
}

void HttpServer::stop() {
  impl_->stopping = true;
  if (!impl_->entered) return;  // serve() will see `stopping` and return at once
  while (!impl_->returned && !impl_->http.is_running()) std::this_thread::yield();
  impl_->http.stop();
}

}  // namespace lode
