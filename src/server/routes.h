// The API routes: each parses its parameters, borrows a reader set, calls
// the library and builds JSON with lode/present.h. No ranking here.
#pragma once

#include <httplib.h>

#include <memory>
#include <vector>

#include "lode/server.h"
#include "server/reader_pool.h"

namespace lode::server {

struct Context {
  ServeOptions options;
  std::vector<std::unique_ptr<ReaderPool>> pools;  // in the order given; the first is the default
};

// Registers /api/v1/* on `http`. `ctx` must outlive it.
void add_api_routes(httplib::Server& http, const Context& ctx);
// /api/v1/whynot and /api/v1/moved (inspect_routes.cpp).
void add_inspect_routes(httplib::Server& http, const Context& ctx);
// /api/v1/sift* (sift_routes.cpp); writes only with ServeOptions::allow_judging.
void add_sift_routes(httplib::Server& http, const Context& ctx);

}  // namespace lode::server
