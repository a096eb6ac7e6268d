// The API routes: each parses its parameters, borrows a reader set, calls
// the library and builds JSON with lode/present.h. No ranking here.
#pragma once

#include <httplib.h>

#include <functional>
#include <memory>
#include <string_view>
#include <vector>

#include "lode/server.h"
#include "server/connection_loop.h"
#include "server/reader_pool.h"
#include "server/result_cache.h"

namespace lode::server {

struct Context {
  ServeOptions options;
  std::vector<std::unique_ptr<ReaderPool>> pools;  // in the order given; the first is the default
  // One reader per index for /api/v1/health, which the connection thread
  // answers itself: it never waits for a worker's reader.
  std::vector<std::unique_ptr<ReaderPool>> reserved;
  std::unique_ptr<ResultCache> cache;
  std::function<LoopLoad()> load;  // the connection loop's state; empty before serve()
};

// The methods a route takes at `path` ("GET, HEAD", "GET, HEAD, POST"), or
// "" when no route serves it: a 405 needs this for its Allow header.
std::string allowed_methods(std::string_view path);

// Registers /api/v1/* on `http`. `ctx` must outlive it.
void add_api_routes(httplib::Server& http, const Context& ctx);
// /api/v1/whynot and /api/v1/moved (inspect_routes.cpp).
void add_inspect_routes(httplib::Server& http, const Context& ctx);
// /api/v1/sift* (sift_routes.cpp); writes only with ServeOptions::allow_judging.
void add_sift_routes(httplib::Server& http, const Context& ctx);

}  // namespace lode::server
