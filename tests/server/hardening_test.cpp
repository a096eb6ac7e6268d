// The server as an attacker or a careless client meets it: forged Host
// headers (DNS rebinding), many ranges in one request, methods a route does
// not take, and a second server on a taken port. Each case holds a real
// server on loopback (or the real binary) and a real client.
#include "server_util.h"

using namespace lode;
using namespace lode::test;

TEST_CASE("Hardening: a Host header naming another site is refused (DNS rebinding)") {
  Fixture f;
  LiveServer server(f.index);
  auto c = server.client();
  const std::string port = std::to_string(server.port());
  // What a page on a rebound name sends: its own name, our port.
  for (const std::string& host : std::vector<std::string>{"evil.example:" + port, "evil.example", "localhost.evil.example:" + port,
                           "127.0.0.1.evil.example"}) {
    CAPTURE(host);
    auto r = get(c, "/api/v1/search", {{"q", "storm"}}, {{"Host", host}});
    auto j = expect_problem(r, 421, "host-not-allowed");
    CHECK(j["detail"].get<std::string>().find("--reached-as") != std::string::npos);
    CHECK(r->body.find("storm") == std::string::npos);
    CHECK(get(c, "/", {}, {{"Host", host}})->status == 421);
  }
  // The names a user reaches a loopback server by, and address literals (a
  // rebinding attack needs a DNS name: an address is its own origin).
  for (const std::string& host : std::vector<std::string>{"127.0.0.1:" + port, "localhost:" + port, "LocalHost", "[::1]:" + port, "127.0.0.1",
                           "192.168.7.20:" + port}) {
    CAPTURE(host);
    CHECK(get(c, "/api/v1/search", {{"q", "storm"}}, {{"Host", host}})->status == 200);
  }
}

TEST_CASE("Hardening: many ranges in one request cannot amplify the response") {
  Fixture f;
  LiveServer server(f.index);
  auto c = server.client();
  auto whole = get(c, "/style.css");
  REQUIRE(whole->status == 200);
  const std::size_t size = whole->body.size();
  REQUIRE(size > 100);
  // 1,000 overlapping ranges (a header under cpp-httplib's 8 KiB line
  // limit): served as one part each, they would repeat the file 1,000 times.
  std::string ranges = "bytes=0-";
  for (int i = 0; i < 1000; ++i) ranges += ",0-" + std::to_string(size - 1);
  REQUIRE(ranges.size() < 8000);
  auto r = get(c, "/style.css", {}, {{"Range", ranges}});
  CHECK(r->body.size() <= size);
  CHECK((r->status == 200 || r->status == 416));
  // One range still works as a range.
  auto one = get(c, "/style.css", {}, {{"Range", "bytes=0-9"}});
  CHECK(one->status == 206);
  CHECK(one->body == whole->body.substr(0, 10));
}

TEST_CASE("Hardening: a method a route does not take gets 405 with Allow") {
  Fixture f;
  LiveServer server(f.index);
  auto c = server.client();
  auto del = c.Delete("/api/v1/search");
  REQUIRE(del);
  expect_problem(del, 405, "method-not-allowed");
  CHECK(del->get_header_value("Allow") == "GET, HEAD, POST");
  auto put = c.Put("/api/v1/stats", "{}", "application/json");
  REQUIRE(put);
  expect_problem(put, 405, "method-not-allowed");
  CHECK(put->get_header_value("Allow") == "GET, HEAD");
  // A path no route serves stays 404, whatever the method.
  auto none = c.Delete("/api/v1/nothing-here");
  REQUIRE(none);
  expect_problem(none, 404, "not-found");
}

TEST_CASE("Hardening: snippets=false sends no snippet at all") {
  Fixture f;
  LiveServer server(f.index);
  auto c = server.client();
  auto with = body_json(get(c, "/api/v1/search", {{"q", "storm damage"}}));
  auto without = body_json(get(c, "/api/v1/search", {{"q", "storm damage"}, {"snippets", "false"}}));
  REQUIRE(!with["hits"].empty());
  REQUIRE(without["hits"].size() == with["hits"].size());
  for (auto& h : with["hits"]) CHECK(!h["snippet"]["text"].get<std::string>().empty());
  for (auto& h : without["hits"]) CHECK(!h.contains("snippet"));
}

TEST_CASE("Hardening: a second lode serve on a taken port exits 1 naming the port") {
  Fixture f;
  ServeProcess first("--index " + f.index + " serve --port 0", f.dir.str("one.out"), f.dir.str("one.err"));
  const std::string port = std::to_string(first.port());
  // `timeout` is a hang guard: a second server that starts would run forever.
  int rc = -1;
  std::string second = run("timeout 20 " + kLode + " --index " + f.index + " serve --port " + port + " 2>&1", &rc);
  CHECK_MESSAGE(rc == 1, second);
  CHECK(second.find(":" + port) != std::string::npos);
  CHECK(second.find("in use") != std::string::npos);
  // The first server still answers every request (none went to a second one).
  httplib::Client c("127.0.0.1", first.port());
  for (int i = 0; i < 20; ++i) {
    auto r = c.Get("/api/v1/health");
    REQUIRE(r);
    CHECK(r->status == 200);
  }
  CHECK(first.stop() == 0);
  CHECK(first.err_text().find(" GET /api/v1/health 200 ") != std::string::npos);  // the access log, on stderr by default
}

TEST_CASE("Hardening: slow and idle connections beyond the worker count do not stop a request") {
  Fixture f;
  ServeOptions o;
  o.threads = 2;
  LiveServer server(f.index, o);
  // Ten connections send a request head one line at a time, ten stay idle:
  // ten times the workers.
  std::vector<std::unique_ptr<RawConnection>> slow, idle;
  open_stalled(server.port(), 10, slow, idle);
  std::atomic<bool> trickling{true};
  std::thread trickle([&] {
    for (int line = 0; trickling && line < 200; ++line) {
      for (auto& s : slow) (void)s->send("X-Trickle-" + std::to_string(line) + ": 1\r\n");
      std::this_thread::sleep_for(std::chrono::milliseconds(200));
    }
  });
  // A normal client is answered while they hang on. The bound is a hang
  // guard, generous on purpose (the old server made it wait for ever).
  httplib::Client c("127.0.0.1", server.port());
  c.set_connection_timeout(3, 0);
  c.set_read_timeout(3, 0);
  auto health = c.Get("/api/v1/health");
  CHECK((health && health->status == 200));
  auto r = c.Get("/api/v1/search?q=storm");
  CHECK((r && r->status == 200));
  trickling = false;
  trickle.join();
}

TEST_CASE("Hardening: a file name that is not UTF-8 comes back escaped, and the escaped id opens the document") {
  TempDir dir;
  const std::string latin1 = "caf\xE9 journal.txt";  // a name saved by an old Latin-1 system
  write_file(dir.path() / "tree" / latin1, "the barnacle count on the north pier, in the cafe's own hand\n");
  write_file(dir.path() / "tree" / "other.txt", "the south pier had no barnacle count this year\n");
  const std::string index = dir.str("names.sqlite");
  int rc = -1;
  std::string out = run(kLode + " --index " + index + " index -q " + dir.str("tree") + " 2>&1", &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  LiveServer server(index);
  auto c = server.client();
  auto found = get(c, "/api/v1/search", {{"q", "north barnacle"}});
  REQUIRE(found->status == 200);
  const auto hits = body_json(found)["hits"];
  REQUIRE(!hits.empty());
  const std::string doc = hits[0]["doc"].get<std::string>();
  // The byte E9 as U+F7E9 (lode/names.h), nothing replaced by U+FFFD.
  CHECK(doc == "caf\xEF\x9F\xA9 journal.txt");
  CHECK(found->body.find("\xEF\xBF\xBD") == std::string::npos);
  auto d = get(c, "/api/v1/document", {{"doc", doc}});
  CHECK(d->status == 200);
  CHECK(body_json(d)["doc"].get<std::string>() == doc);
}
