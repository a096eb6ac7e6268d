#include "lode/server.h"

#include <sqlite3.h>
#include <sys/socket.h>

#include <algorithm>
#include <atomic>
#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <mutex>
#include <regex>
#include <thread>

#include "server/access.h"
#include "server/access_log.h"
#include "server/buffer_stream.h"
#include "server/connection_loop.h"
#include "server/host_check.h"
#include "server/problem.h"
#include "server/request_frame.h"
#include "server/routes.h"
#include "server/static_files.h"

namespace lode {

// cpp-httplib serves as the HTTP parser, router and response writer; the
// connection loop (server/connection_loop.h) owns the sockets instead of its
// thread-per-connection listen(), which lets a keep-alive client pin a worker.
class Listener : public httplib::Server {
 public:
  using httplib::Server::process_request;
  // The listening socket, taken from the library once bound.
  int take_socket() { return svr_sock_.exchange(INVALID_SOCKET); }
  // cpp-httplib listens with a backlog of 5, so a burst of connections (a
  // page load, a load test) waits out SYN retries of a second; Linux lets a
  // second listen() on the bound socket raise it.
  void widen_backlog(int n) { ::listen(svr_sock_, n); }
};

struct HttpServer::Impl {
  server::Context ctx;
  Listener http;
  std::unique_ptr<server::AccessLog> log;
  std::unique_ptr<server::ConnectionLoop> loop;  // made by bind()
  std::mutex mu;                                  // guards stopping against the loop's creation
  bool stopping = false;                          // guarded by mu
};

namespace {

void add_common_headers(httplib::Response& res) {
  for (const auto& [name, value] : server::kCommonHeaders) res.set_header(name, value);
}

// Turns httplib's own bare error statuses (no route, body too large, bad
// request line) into problem details; a known path asked with a method it
// does not take gets 405 with Allow.
void problem_for_status(const httplib::Request& req, httplib::Response& res, std::size_t max_body) {
  using server::Problem;
  if (!res.body.empty()) return;  // a route already wrote its problem
  switch (res.status) {
    case 404: {
      std::string allow = server::allowed_methods(req.path);
      if (allow.empty())
        return server::send_problem(req, res, {404, "not-found", "Not found", "no route at '" + req.path + "'", {}});
      res.set_header("Allow", allow);
      return server::send_problem(req, res, {405, "method-not-allowed", "Method not allowed",
                                             "'" + req.path + "' takes " + allow + ", not " + req.method, {}});
    }
    case 413:
      return server::send_problem(req, res, {413, "body-too-large", "The request body is too large",
                                             "request bodies are limited to " + std::to_string(max_body) +
                                                 " bytes on this server", {}});
    default:
      return server::send_problem(req, res, {res.status, "http-error", "HTTP error " + std::to_string(res.status),
                                             "the request could not be handled", {}});
  }
}

// The answers the connection loop gives itself, before any parsing.
std::string refusal_response(server::Refusal r, const ServeLimits& l) {
  using server::Refusal;
  const std::string retry = "Retry-After: 1\r\n";
  switch (r) {
    case Refusal::kHeadTooLarge:
      return server::problem_response({431, "head-too-large", "Request head too large",
                                       "the request line and headers are limited to " +
                                           std::to_string(l.max_head_bytes) + " bytes on this server", {}});
    case Refusal::kBodyTooLarge:
      return server::problem_response({413, "body-too-large", "The request body is too large",
                                       "request bodies are limited to " + std::to_string(l.max_body_bytes) +
                                           " bytes on this server", {}});
    case Refusal::kLengthRequired:
      return server::problem_response({411, "length-required", "Length required",
                                       "send a request body with Content-Length (chunked bodies are not taken)", {}});
    case Refusal::kBadFraming:
      return server::problem_response({400, "bad-request", "Bad request", "the Content-Length header is not a number", {}});
    case Refusal::kTooSlow:
      return server::problem_response({408, "request-too-slow", "Request timeout",
                                       "the whole request must arrive within " +
                                           std::to_string(l.head_deadline.count()) + " ms of its first byte", {}});
    case Refusal::kBusy:
      return server::problem_response({503, "busy", "The server is busy",
                                       "every worker is busy and " + std::to_string(l.max_queued) +
                                           " requests wait already; try again", {}},
                                      retry);
    case Refusal::kTooManyConnections:
      return server::problem_response({503, "too-many-connections", "Too many connections",
                                       "this server holds at most " + std::to_string(l.max_connections) +
                                           " connections; try again", {}},
                                      retry);
  }
  return {};
}

// "HTTP/1.1 200 OK..." -> 200, skipping interim 100 responses.
int response_status(std::string_view out) {
  while (out.size() >= 12 && out.substr(9, 3) == "100") {
    std::size_t end = out.find("\r\n\r\n");
    if (end == std::string_view::npos) return 0;
    out.remove_prefix(end + 4);
  }
  return out.size() >= 12 ? std::atoi(std::string(out.substr(9, 3)).c_str()) : 0;
}

// Runs one buffered request through cpp-httplib and logs it.
void handle_exchange(Listener& http, server::AccessLog& log, server::Exchange& ex) {
  const auto start = std::chrono::steady_clock::now();
  server::BufferStream stream(ex.request, ex.response, ex.remote_address, ex.remote_port);
  std::string method, path;
  bool closed = false;
  bool ok = http.process_request(stream, ex.last, closed, [&](httplib::Request& req) {
    method = req.method;
    path = req.path;
    // Many ranges would repeat the body (issue: 2,600 ranges gave 20 MB);
    // RFC 9110 lets a server ignore Range, so a multi-range request gets
    // the whole body once.
    if (req.ranges.size() > 1) req.ranges.clear();
  });
  ex.consumed = stream.consumed();
  ex.close = !ok || closed || ex.last;
  log.write({ex.remote_address, method, path, response_status(ex.response), ex.response.size(),
                   std::chrono::duration_cast<std::chrono::microseconds>(std::chrono::steady_clock::now() - start)});
}

void install(const server::Context& ctx, Listener& http) {
  const ServeOptions& o = ctx.options;
  http.set_payload_max_length(o.limits.max_body_bytes);
  // Shown in the Keep-Alive header; the connection loop enforces both.
  http.set_keep_alive_timeout(std::max<time_t>(1, static_cast<time_t>(o.limits.idle_timeout.count() / 1000)));
  http.set_keep_alive_max_count(o.limits.max_requests_per_connection);
  // No SO_REUSEPORT (cpp-httplib's default_socket_options sets it): a second
  // server on the same port must fail, not split the requests. SO_REUSEADDR
  // alone lets a restart bind past TIME_WAIT and, on Linux, never lets two
  // sockets listen on one port.
  http.set_socket_options([](socket_t sock) {
    int yes = 1;
    setsockopt(sock, SOL_SOCKET, SO_REUSEADDR, &yes, sizeof yes);
  });
  const std::string token = o.token;
  auto hosts = std::make_shared<server::HostCheck>(o.address, o.reached_as);
  http.set_pre_routing_handler([token, hosts](const httplib::Request& req, httplib::Response& res) {
    auto refuse = [&](auto&& write_refusal) {
      write_refusal();
      add_common_headers(res);
      return httplib::Server::HandlerResponse::Handled;
    };
    if (token.empty()) {
      if (hosts->allowed(req.get_header_value("Host"))) return httplib::Server::HandlerResponse::Unhandled;
      return refuse([&] {
        server::send_problem(req, res, {421, "host-not-allowed", "Host not allowed",
                                        "this server answers only the names it is reached by ('" +
                                            server::host_name(req.get_header_value("Host")) +
                                            "' is not one; start it with --reached-as NAME to add one)", {}});
      });
    }
    // The unlock form and its style sheet hold no archive data.
    if ((req.path == "/unlock" && req.method == "POST") || req.path == "/style.css")
      return httplib::Server::HandlerResponse::Unhandled;
    if (server::authorized(req, token)) return httplib::Server::HandlerResponse::Unhandled;
    return refuse([&] { server::refuse(req, res); });
  });
  if (!token.empty())
    http.Post("/unlock", [token](const httplib::Request& req, httplib::Response& res) {
      server::unlock(req, res, token);
    });
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

Status check_limits(const ServeOptions& o) {
  if (o.threads == 0) return Status::InvalidArgument("threads must be at least 1");
  const ServeLimits& l = o.limits;
  if (l.max_connections == 0) return Status::InvalidArgument("max_connections must be at least 1");
  if (l.max_head_bytes < 256) return Status::InvalidArgument("max_head_bytes must be at least 256");
  if (l.max_requests_per_connection == 0)
    return Status::InvalidArgument("max_requests_per_connection must be at least 1");
  if (!o.token.empty() && !server::valid_token(o.token))
    return Status::InvalidArgument("the access token may hold only visible ASCII characters other than \" , ; \\");
  return Status();
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
  LODE_RETURN_IF_ERROR(check_limits(options));
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
    impl->ctx.reserved.push_back(std::make_unique<server::ReaderPool>(ix.name, ix.path, 1));
  }
  impl->ctx.cache = std::make_unique<server::ResultCache>(options.result_cache_bytes);
  if (options.sqlite_heap_bytes > 0) sqlite3_soft_heap_limit64(static_cast<sqlite3_int64>(options.sqlite_heap_bytes));
  auto log = server::AccessLog::open(options.access_log);
  if (!log) return log.status();
  impl->log = std::move(log.value());
  install(impl->ctx, impl->http);
  return std::unique_ptr<HttpServer>(new HttpServer(std::move(impl)));
}

Result<int> HttpServer::bind() {
  const ServeOptions& o = impl_->ctx.options;
  errno = 0;
  int port = o.port == 0 ? impl_->http.bind_to_any_port(o.address) : o.port;
  if (o.port != 0 && !impl_->http.bind_to_port(o.address, o.port)) port = -1;
  if (port <= 0) {
    const std::string where = o.address + ":" + std::to_string(o.port);
    if (errno == EADDRINUSE) return Status::IOError(where + " is in use (another server holds the port)");
    return Status::IOError("cannot listen on " + where + " (not an address of this machine?)");
  }
  impl_->http.widen_backlog(128);
  const ServeLimits& l = o.limits;
  server::LoopLimits limits{o.threads,         l.max_connections,    l.max_queued,
                            l.max_head_bytes,  l.max_body_bytes,     l.max_requests_per_connection,
                            l.head_deadline,   l.idle_timeout,       l.time_budget};
  Listener* http = &impl_->http;
  server::AccessLog* log = impl_->log.get();
  server::LoopHooks hooks{
      [http, log](server::Exchange& ex) { handle_exchange(*http, *log, ex); },
      // Health never waits behind the queue: the loop answers it at once.
      [](std::string_view head) {
        return server::is_read_method(head) && server::request_path(head) == "/api/v1/health";
      },
      [log, l](server::Refusal r, const std::string& remote) {
        std::string bytes = refusal_response(r, l);
        log->write({remote, {}, {}, response_status(bytes), bytes.size(), {}});
        return bytes;
      }};
  auto loop = server::ConnectionLoop::create(impl_->http.take_socket(), limits, std::move(hooks));
  if (!loop) return loop.status();
  server::ConnectionLoop* raw = loop.value().get();
  impl_->ctx.load = [raw] { return raw->load(); };
  std::lock_guard lock(impl_->mu);
  impl_->loop = std::move(loop.value());
  if (impl_->stopping) impl_->loop->stop();
  return port;
}

Status HttpServer::serve() {
  server::ConnectionLoop* loop = nullptr;
  {
    std::lock_guard lock(impl_->mu);
    loop = impl_->loop.get();
  }
  if (!loop) return Status::InvalidArgument("serve() before a successful bind()");
  return loop->run();
}

void HttpServer::stop() {
  std::lock_guard lock(impl_->mu);
  impl_->stopping = true;
  if (impl_->loop) impl_->loop->stop();
}

}  // namespace lode
