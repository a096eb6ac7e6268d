// lode/server.h — the read-only HTTP server: JSON API, OpenAPI file, browser page.
//
// Routes (docs/api.md; docs/openapi.yaml is the contract and is served at
// /api/v1/openapi.yaml):
//   GET  /api/v1/search      ranked hits (the lode.search/1 shape of `lode search --json`)
//   POST /api/v1/search      the same, parameters as a JSON object in the body
//   GET  /api/v1/explain     one document's per-term breakdown for a query
//   GET  /api/v1/document    one document's stored text with the query's words marked
//   GET  /api/v1/stats       collection statistics (lode.stats/1)
//   GET  /api/v1/health      liveness and the indexes served
//   GET  /api/v1/whynot      where a document ranks for a query and why not higher
//   GET  /api/v1/moved       one query under two model settings, side by side
//   GET  /api/v1/sifts, /api/v1/sift, /api/v1/sift/batch   saved reviews (docs/screening.md)
//   POST /api/v1/sift/start|next|mark|check   judging; only with allow_judging
//   GET  /                   the browser page (web/, embedded at build time)
// Errors are RFC 9457 problem details (application/problem+json).
//
// The server never writes an index's own tables: it opens IndexReaders only, one per worker
// thread at most (checked out per request), and every request runs in one
// read transaction, so a commit by `lode index` in another process shows in
// the next request without a restart. The one write path is opt-in: with
// ServeOptions::allow_judging, the POST /api/v1/sift/* routes record sift
// judgments and batches in the review tables of the index file
// (docs/index-format.md), each in one short SQLite transaction. Static
// files come from memory; no request ever reads a file from disk.
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
  // Longest a request may wait for a free reader, and the socket read/write
  // timeout. A running query is not interrupted (the ranking library has no
  // cancellation point yet); the other limits bound its work instead.
  std::chrono::milliseconds time_budget{10000};
};

struct ServeOptions {
  std::string address = "127.0.0.1";  // loopback: see Privacy above
  int port = 7340;                     // 0 = any free port (bind() returns it)
  std::size_t threads = 8;             // worker threads = readers per index at most
  // When not empty, every route requires `Authorization: Bearer TOKEN` or the
  // cookie set by POST /unlock (the browser's way in); compared in constant time.
  std::string token;
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
  // name, threads == 0).
  static Result<std::unique_ptr<HttpServer>> create(std::vector<ServedIndex> indexes,
                                                    const ServeOptions& options);
  ~HttpServer();
  HttpServer(const HttpServer&) = delete;
  HttpServer& operator=(const HttpServer&) = delete;

  // Binds the listening socket and returns the port (the chosen one when the
  // option was 0). IOError naming address and port when it cannot bind.
  Result<int> bind();
  // Answers requests until stop(). REQUIRES: bind() succeeded.
  Status serve();
  // Makes serve() return after in-flight requests finish. Idempotent.
  void stop();

 private:
  struct Impl;
  explicit HttpServer(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

}  // namespace lode
