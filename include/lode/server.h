// lode/server.h — the read-only HTTP server: JSON API, OpenAPI file, browser page.
//
// Routes (docs/api.md; docs/openapi.yaml is the contract and is served at
// /api/v1/openapi.yaml):
//   GET  /api/v1/search      ranked hits (the lode.search/1 shape of `lode search --json`)
//   POST /api/v1/search      the same, parameters as a JSON object in the body
//   GET  /api/v1/breakdown   one document's per-term breakdown for a query
//   GET  /api/v1/document    one document's stored text with the query's words marked
//   GET  /api/v1/stats       collection statistics (lode.stats/1)
//   GET  /api/v1/health      liveness and the indexes served
//   GET  /api/v1/whynot      where a document ranks for a query and why not higher
//   GET  /api/v1/moved       one query under two model settings, side by side
//   GET  /api/v1/sifts, /api/v1/sift, /api/v1/sift/batch   saved reviews (docs/screening.md)
//   POST /api/v1/sift/start|next|mark|check   judging; only with allow_judging
//   GET  /                   the browser page (web/, embedded at build time)
// Errors are RFC 9457 problem details (application/problem+json); a method a
// route does not take gets 405 with `Allow`.
//
// Connections (src/server/connection_loop.h): one thread owns every socket.
// It accepts, reads each request whole into the connection's buffer (head
// and body, each under a cap, within `head_deadline` of its first byte),
// and only then hands it to a worker, which computes the response into
// memory; the same thread writes it out. So a slow, idle or keep-alive
// client holds a buffer, never a worker; past `max_connections` a new
// connection gets 503, and past `max_queued` waiting requests a request gets
// 503 with Retry-After at once instead of waiting in line. GET
// /api/v1/health is answered on the connection thread itself, with a reader
// of its own, so it answers while every worker is busy.
//
// Host names (DNS rebinding): without a token, a request is answered only
// when its Host header is an address literal, "localhost", the configured
// address, or a name in `reached_as`; others get 421. A web page on a name
// the attacker rebinds to 127.0.0.1 sends its own name, so it cannot read
// the archive. With a token every Host is accepted (the token guards).
//
// Results: searches are cached (ResultCache) under the index, its commit
// generation and every parameter; a commit moves the generation, so a
// cached answer is never older than the snapshot a request would read.
//
// Access log: one line per request, UTC time, client address, method, path
// (never the query string: it holds the user's words), status, response
// bytes, milliseconds. docs/api.md gives the format.
//
// The server never writes an index's own tables: it opens IndexReaders only,
// one per worker thread at most (checked out per request) plus one for
// health, and every response comes from one read snapshot, so a commit by
// `lode index` in another process shows in the next request without a
// restart. The one write path is opt-in: with ServeOptions::allow_judging,
// the POST /api/v1/sift/* routes record sift judgments and batches in the
// review tables of the index file (docs/index-format.md), each in one short
// SQLite transaction. Static files come from memory; no request ever reads a
// file from disk.
//
// Privacy: the default address is loopback. Any other address exposes the
// archive's text to whoever can reach the port (the CLI warns).
//
// Thread safety: create() and bind() from one thread; serve() blocks its
// thread; stop() may be called from any thread at any time after bind().
// Destroy only after serve() has returned.
#pragma once

#include <chrono>
#include <cstddef>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "lode/status.h"

namespace lode {

// One index to serve; requests choose it with `index=NAME` (default: the first).
struct ServedIndex {
  std::string name;  // [A-Za-z0-9_.-]+, unique among the served indexes
  std::string path;  // the index file
};

// Per-request limits. Defaults suit a person at a browser and small scripts;
// a request over any of them gets a 400 or 413 problem naming the limit.
struct ServeLimits {
  std::size_t max_query_bytes = 1024;   // query text; the library allows more, a URL should not
  std::size_t max_query_terms = 32;     // analyzed words: each one is a postings walk
  std::size_t max_page = 100;           // hits per request (`top`)
  std::size_t max_window = 10000;       // offset + top: the top-k heap holds this many
  std::size_t max_body_bytes = 16 * 1024;        // POST bodies; larger ones get 413
  std::size_t max_document_bytes = 1024 * 1024;  // body text returned by /document; cut beyond
  // Longest a request may wait for a free reader, and for a response to be
  // written out. A running query is not interrupted (the ranking library has
  // no cancellation point yet); the other limits bound its work instead.
  std::chrono::milliseconds time_budget{10000};
  // A request's head and body must arrive within this of its first byte;
  // then the server answers 408 and closes. Ten seconds is common practice
  // for a header timeout and far more than a script or browser needs.
  std::chrono::milliseconds head_deadline{10000};
  // A keep-alive connection with no request in flight is closed after this
  // (browsers reuse a connection within seconds of the last response).
  std::chrono::milliseconds idle_timeout{5000};
  // Request line and headers together; larger ones get 431 and a close.
  std::size_t max_head_bytes = 16 * 1024;
  // Open connections at most; a connection beyond gets 503 and a close.
  // Each idle connection costs a socket and a few KiB.
  std::size_t max_connections = 512;
  // Whole requests waiting for a worker at most; beyond, 503 with
  // Retry-After at once. A few per worker keeps the workers fed while a
  // waiting request's delay stays a few query times.
  std::size_t max_queued = 64;
  // Requests served on one keep-alive connection before it is closed.
  std::size_t max_requests_per_connection = 1000;
};

struct ServeOptions {
  std::string address = "127.0.0.1";  // loopback: see Privacy above
  int port = 7340;                     // 0 = any free port (bind() returns it)
  std::size_t threads = 8;             // worker threads = readers per index at most
  // When not empty, every route requires `Authorization: Bearer TOKEN` or the
  // cookie set by POST /unlock (the browser's way in); compared in constant time.
  std::string token;
  // Host names (without port) clients reach this server by besides
  // "localhost", address literals and `address`, e.g. the name of a reverse
  // proxy. Ignored when a token is set. Compared without case.
  std::vector<std::string> reached_as;
  // Memory for cached search responses (key and body bytes). 32 MiB holds
  // thousands of pages of ten hits with breakdowns; 0 turns caching off.
  std::size_t result_cache_bytes = 32 * 1024 * 1024;
  // SQLite's memory for all readers of the process together, a soft limit
  // (sqlite3_soft_heap_limit64, process-wide: set by create(), the last
  // server created wins): past it SQLite reuses cached pages instead of
  // growing. Each reader would otherwise cache up to 32 MiB, so memory grew
  // with --threads (205 MB of heap at 8 workers in bench/serve_load.sh).
  // 0 leaves SQLite's own setting.
  std::size_t sqlite_heap_bytes = 64 * 1024 * 1024;
  // Where the access log goes: "-" = standard error (the default: a service
  // manager's journal keeps it), "" = no log, else a file appended to.
  std::string access_log = "-";
  // Let POST /api/v1/sift/* write reviews into the index file. Off: the
  // server writes nothing and those routes answer 403.
  bool allow_judging = false;
  ServeLimits limits;
};

// True for 127.0.0.0/8, ::1 and "localhost".
bool is_loopback_address(std::string_view address);

class HttpServer {
 public:
  // Opens every index once to check it (errors: those of IndexReader::open,
  // naming the path; InvalidArgument for an empty list, a bad or repeated
  // name, threads == 0, a zero connection or head limit; IOError naming the
  // access log file when it cannot be opened for appending).
  static Result<std::unique_ptr<HttpServer>> create(std::vector<ServedIndex> indexes,
                                                    const ServeOptions& options);
  ~HttpServer();
  HttpServer(const HttpServer&) = delete;
  HttpServer& operator=(const HttpServer&) = delete;

  // Binds the listening socket and returns the port (the chosen one when the
  // option was 0). The port is never shared: IOError "address:port is in
  // use" when another socket holds it, IOError naming address and port for
  // any other failure.
  Result<int> bind();
  // Answers requests until stop(). REQUIRES: bind() succeeded.
  Status serve();
  // Makes serve() return after in-flight requests finish (their responses
  // are sent when the client reads them at once). Idempotent.
  void stop();

 private:
  struct Impl;
  explicit HttpServer(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

}  // namespace lode
