// Helpers for the server suite: a real HttpServer on 127.0.0.1 with a free
// port in a background thread, and the sample corpus indexed by the real CLI.
#pragma once

#include <httplib.h>

#include <nlohmann/json.hpp>
#include <thread>

#include "core/util.h"
#include "lode/server.h"

namespace lode::test {

inline const std::string kLode = LODE_BINARY;
inline const std::string kSampleCorpus = LODE_SOURCE_DIR "/sample_corpus/archive";

// Indexes the sample corpus into `index` with the lode binary.
inline void index_sample(const std::string& index) {
  int rc = -1;
  std::string out = run(kLode + " --index " + index + " index -q " + kSampleCorpus + " 2>&1", &rc);
  REQUIRE_MESSAGE(rc == 0, out);
}

// Serves `indexes` until destroyed.
class LiveServer {
 public:
  LiveServer(std::vector<ServedIndex> indexes, ServeOptions options = {}) {
    options.address = "127.0.0.1";
    options.port = 0;
    auto s = HttpServer::create(std::move(indexes), options);
    REQUIRE_MESSAGE(s.ok(), s.status().to_string());
    server_ = std::move(s.value());
    auto port = server_->bind();
    REQUIRE_MESSAGE(port.ok(), port.status().to_string());
    port_ = *port;
    thread_ = std::thread([this] { (void)server_->serve(); });
  }
  explicit LiveServer(const std::string& index, ServeOptions options = {})
      : LiveServer(std::vector<ServedIndex>{{"main", index}}, std::move(options)) {}
  ~LiveServer() {
    server_->stop();
    thread_.join();
  }
  int port() const { return port_; }
  std::string url() const { return "http://127.0.0.1:" + std::to_string(port_); }
  httplib::Client client() const {
    httplib::Client c("127.0.0.1", port_);
    c.set_read_timeout(60, 0);  // a hang guard, not a speed check
    return c;
  }

 private:
  std::unique_ptr<HttpServer> server_;
  std::thread thread_;
  int port_ = 0;
};

// GET `path` with `params`; REQUIREs that a response came back.
inline httplib::Result get(httplib::Client& c, const std::string& path, const httplib::Params& params = {},
                           const httplib::Headers& headers = {}) {
  auto r = c.Get(path, params, headers, httplib::Progress());
  REQUIRE_MESSAGE(r, ("no response from " + path + ": " + httplib::to_string(r.error())));
  return r;
}

inline nlohmann::json body_json(const httplib::Result& r) {
  auto j = nlohmann::json::parse(r->body, nullptr, false);
  REQUIRE_MESSAGE(!j.is_discarded(), ("not JSON: " + r->body.substr(0, 200)));
  return j;
}

// Checks `r` is an RFC 9457 problem with `status` and type slug; returns it.
inline nlohmann::json expect_problem(const httplib::Result& r, int status, const std::string& slug) {
  CHECK_MESSAGE(r->status == status, r->body);
  CHECK(r->get_header_value("Content-Type") == "application/problem+json");
  auto j = body_json(r);
  CHECK(j["status"] == status);
  CHECK(j["type"] == "urn:lode:problem:" + slug);
  CHECK(j["title"].is_string());
  CHECK(!j["detail"].get<std::string>().empty());
  return j;
}

}  // namespace lode::test
